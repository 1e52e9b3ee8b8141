import { execFile } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { promisify } from "node:util";
import { afterAll, describe, expect, it } from "vitest";
// @ts-expect-error scripts/build.mjs is plain JavaScript without declarations
import { entryOptions } from "../../../../scripts/build.mjs";
import { parseUpload } from "../parse-upload";
import { synthFor } from "../../testing/session-fixtures";

// The product runs an esbuild bundle (scripts/build.mjs), not the TypeScript sources: its parse
// threads must start from the bundled parse-worker.js beside the server bundle, with no tsx.
const ROOT = fileURLToPath(new URL("../../../../", import.meta.url));
const dir = mkdtempSync(path.join(tmpdir(), "pendula-built-pool-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("parse pool in the bundled build", () => {
  it("starts parse-worker.js beside the bundle and parses as the sources do", async () => {
    const esbuild = await import("esbuild");
    await esbuild.build(entryOptions("ingest-server/src/uploads/parse-worker.ts", path.join(dir, "parse-worker.js")));
    const probe = `import { ParsePool } from ${JSON.stringify(path.join(ROOT, "ingest-server/src/uploads/parse-pool.ts"))};
      const pool = new ParsePool(1);
      const out = await pool.run(JSON.parse(process.argv[2]));
      await pool.close();
      console.log(JSON.stringify(out));`;
    const options = entryOptions("probe.ts", path.join(dir, "probe.js"));
    delete options.entryPoints;
    await esbuild.build({ ...options, stdin: { contents: probe, resolveDir: ROOT, loader: "ts", sourcefile: "probe.ts" } });

    const file = synthFor({ left_shank: "BUILT-1" }, { seed: 12, placements: ["left_shank"] }).files[0]!;
    const onDisk = path.join(dir, "walk.csv");
    writeFileSync(onDisk, file.text);
    const job = { files: [{ originalName: file.fileName, path: onDisk }], maxChars: 8 * 1024 * 1024 };
    // Plain node, no loader: only compiled JavaScript can run.
    const { stdout } = await promisify(execFile)(process.execPath, [path.join(dir, "probe.js"), JSON.stringify(job)], { cwd: ROOT, env: { PATH: process.env.PATH ?? "" } });
    const summary = JSON.parse(stdout);
    const direct = parseUpload([{ originalName: file.fileName, buffer: Buffer.from(file.text) }], { maxChars: job.maxChars });
    expect(summary.contentSha256).toBe(direct.contentSha256);
    expect(summary.recordings[0].deviceSerial).toBe("BUILT-1");
  });
});
