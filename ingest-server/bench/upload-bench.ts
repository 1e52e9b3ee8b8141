/**
 * Upload memory and liveness bench: N uploads of F sensor files near UPLOAD_MAX_FILE_BYTES each, all
 * at once, from N patients (one upload each, so the per-user cap of 2 in flight does not queue them).
 * Prints the process's peak RSS while they run (sampled every 10 ms; worker threads share the
 * process, so their memory is included) and the latency of another user's reads meanwhile.
 *
 *   npm run bench:upload                # 10 uploads × 4 files × 50 MiB (defaults)
 *   npm run bench:upload -- --uploads 4 --file-mib 20
 *
 * The server, the object-storage fake and this client share one process: the client streams every
 * body from one shared buffer of sample rows (about one file's size), so its own share is constant.
 */
import http from "node:http";
import type { AddressInfo } from "node:net";
import { parseArgs } from "node:util";
import { createTestContext } from "../src/testing/harness";
import { sampleRows, sensorCsvHeader } from "../src/testing/large-sensor-file";
import { FOUR_PLACEMENTS, seedDevices } from "../src/testing/session-fixtures";

const { values } = parseArgs({
  options: {
    uploads: { type: "string", default: "10" },
    files: { type: "string", default: "4" },
    "file-mib": { type: "string", default: "50" },
  },
});
const uploads = Number(values.uploads);
const filesPerUpload = Math.min(Number(values.files), FOUR_PLACEMENTS.length);
const fileBytes = Number(values["file-mib"]) * 1024 * 1024;

const mb = (bytes: number) => (bytes / 1024 / 1024).toFixed(0);

/** POST /api/sessions as multipart, streaming each file's rows from the shared buffer. */
function postUpload(port: number, token: string, files: Array<{ name: string; head: string }>, rows: Buffer): Promise<{ status: number; ms: number; body: string }> {
  const boundary = `----bench${Math.random().toString(16).slice(2)}`;
  const parts = files.map((f) => ({
    open: Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="files"; filename="${f.name}"\r\nContent-Type: text/csv\r\n\r\n${f.head}`),
    close: Buffer.from("\r\n"),
  }));
  const end = Buffer.from(`--${boundary}--\r\n`);
  const length = parts.reduce((n, p) => n + p.open.length + rows.length + p.close.length, 0) + end.length;
  const started = performance.now();
  return new Promise((resolve) => {
    const req = http.request(
      { host: "127.0.0.1", port, method: "POST", path: "/api/sessions", headers: { Authorization: `Bearer ${token}`, "Content-Type": `multipart/form-data; boundary=${boundary}`, "Content-Length": length } },
      (res) => {
        let body = "";
        res.setEncoding("utf8");
        res.on("data", (c: string) => (body += c));
        res.on("end", () => resolve({ status: res.statusCode ?? 0, ms: performance.now() - started, body }));
      },
    );
    // A dropped connection is a result to report, not a crash of the bench.
    req.on("error", (err) => resolve({ status: 0, ms: performance.now() - started, body: String(err) }));
    void (async () => {
      const write = (b: Buffer) => (req.destroyed || req.write(b) ? Promise.resolve() : new Promise<void>((r) => req.once("drain", () => r())));
      for (const p of parts) {
        await write(p.open);
        await write(rows);
        await write(p.close);
      }
      req.end(end);
    })();
  });
}

function get(port: number, token: string, path: string): Promise<number> {
  const started = performance.now();
  return new Promise((resolve, reject) => {
    http
      .get({ host: "127.0.0.1", port, path, headers: { Authorization: `Bearer ${token}` } }, (res) => {
        res.resume();
        res.on("end", () => resolve(performance.now() - started));
      })
      .on("error", reject);
  });
}

async function main() {
  const ctx = await createTestContext({ env: { UPLOAD_RATE_LIMIT: "1000", UPLOAD_MAX_FILE_BYTES: String(fileBytes + 4096) } });
  const server = ctx.app.listen(0, "127.0.0.1");
  await new Promise((r) => server.once("listening", r));
  const { port } = server.address() as AddressInfo;
  try {
    const clinician = await ctx.seedUser({ role: "clinician" });
    const senders: Array<{ token: string; files: Array<{ name: string; head: string }> }> = [];
    for (let i = 0; i < uploads; i++) {
      const user = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id] });
      const serials = await seedDevices(ctx, user.patientId!, `BENCH-${String(i).padStart(2, "0")}`);
      const files = FOUR_PLACEMENTS.slice(0, filesPerUpload).map((p) => ({ name: `walk-${p}.csv`, head: sensorCsvHeader(serials[p]!, p) }));
      senders.push({ token: await ctx.tokenFor(user), files });
    }
    const reader = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id] });
    const readerToken = await ctx.tokenFor(reader);
    const rows = sampleRows(fileBytes - 400);

    global.gc?.();
    const baseline = process.memoryUsage().rss;
    let peak = baseline;
    const sampler = setInterval(() => {
      peak = Math.max(peak, process.memoryUsage().rss);
    }, 10);
    const readMs: number[] = [];
    let reading = true;
    const readLoop = (async () => {
      while (reading) {
        readMs.push(await get(port, readerToken, `/api/patients/${reader.patientId}/trends`).catch(() => Number.POSITIVE_INFINITY));
        await new Promise((r) => setTimeout(r, 100));
      }
    })();
    const started = performance.now();
    const results = await Promise.all(senders.map((s) => postUpload(port, s.token, s.files, rows)));
    const wallS = (performance.now() - started) / 1000;
    reading = false;
    await readLoop;
    clearInterval(sampler);

    const statuses = results.map((r) => r.status).join(" ");
    const sorted = [...readMs].sort((a, b) => a - b);
    const totalMiB = (uploads * filesPerUpload * (rows.length + 200)) / 1024 / 1024;
    console.log(`uploads: ${uploads} × ${filesPerUpload} files × ${mb(rows.length)} MiB = ${totalMiB.toFixed(0)} MiB, all at once`);
    console.log(`statuses: ${statuses}`);
    for (const r of results.filter((x) => x.status >= 300)) console.log(`  refused: ${r.status} ${r.body.slice(0, 200)}`);
    console.log(`wall: ${wallS.toFixed(1)} s; slowest upload ${(Math.max(...results.map((r) => r.ms)) / 1000).toFixed(1)} s`);
    console.log(`RSS: baseline ${mb(baseline)} MB (includes the shared ${mb(rows.length)} MB row buffer), peak ${mb(peak)} MB, growth ${mb(peak - baseline)} MB`);
    console.log(
      `another user's trend reads meanwhile: n = ${sorted.length}, median ${sorted[Math.floor(sorted.length / 2)]?.toFixed(0)} ms, max ${sorted[sorted.length - 1]?.toFixed(0)} ms`,
    );
  } finally {
    server.close();
    await ctx.close();
  }
}

main().then(
  () => process.exit(0),
  (err) => {
    console.error(err);
    process.exit(1);
  },
);
