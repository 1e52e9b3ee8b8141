import type { AddressInfo } from "node:net";
import { createApp } from "./app";
import { loadConfigOrExit } from "./config/env";
import { startModeRefusal } from "./config/start-mode";
import { createRuntime } from "./runtime";

/**
 * `npm start -w ingest-server`: the HTTP server on 127.0.0.1 only. Prints its URL on a line of its
 * own (scripts wait for it) and drains connections on SIGINT/SIGTERM. In production mode it does not
 * start while demo accounts exist (config/start-mode.ts).
 */
const config = loadConfigOrExit();

const runtime = createRuntime(config, { application: "pendula-server" });
const refusal = await startModeRefusal(config, runtime.deps.db);
if (refusal) {
  console.error(refusal);
  await runtime.close();
  process.exit(1);
}
const app = createApp(runtime.deps);
const server = app.listen(config.port, config.host, () => {
  const { port } = server.address() as AddressInfo;
  console.log(`http://127.0.0.1:${port}`);
});
server.on("error", (err) => {
  console.error(`cannot listen on 127.0.0.1:${config.port}:`, err.message);
  process.exit(1);
});

let stopping = false;
async function shutdown(signal: string): Promise<void> {
  if (stopping) return;
  stopping = true;
  console.error(`${signal}: closing`);
  const force = setTimeout(() => process.exit(1), 10_000);
  force.unref();
  server.closeIdleConnections();
  await new Promise<void>((resolve) => server.close(() => resolve()));
  await runtime.close();
  process.exit(0);
}
process.on("SIGINT", () => void shutdown("SIGINT"));
process.on("SIGTERM", () => void shutdown("SIGTERM"));
