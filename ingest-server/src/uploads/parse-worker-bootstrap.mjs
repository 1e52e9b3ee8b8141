// Thread entry when the server runs from TypeScript sources (tsx, vitest): worker threads do not
// inherit a loader, so register tsx's here before loading the TypeScript entry. A bundled build
// starts its own compiled parse-worker.js instead (see parse-pool.ts).
import { register } from "tsx/esm/api";

register();
await import("./parse-worker.ts");
