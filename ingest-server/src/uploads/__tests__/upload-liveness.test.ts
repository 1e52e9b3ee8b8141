import http from "node:http";
import type { Server } from "node:http";
import type { AddressInfo } from "node:net";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type SeededUser, type TestContext } from "../../testing/harness";
import { largeSensorCsv } from "../../testing/large-sensor-file";
import { multipartBody, writeAllThenRead } from "../../testing/raw-upload-client";
import { FOUR_PLACEMENTS, insertDoneSession, seedDevices } from "../../testing/session-fixtures";
import { uploadParsePool } from "../parse-pool";

// Ten uploads at the size limit at once must not stall the API for everyone else: the bodies go
// to disk and are parsed in the parse threads, so another user's reads keep answering. The bound
// (see LIVENESS_BOUND_MS) is about liveness, not speed — before this design a read waited behind
// every parse in turn (npm run bench:upload: up to 163 s with ten 200 MiB uploads). Sizes are scaled down from the
// product's 8 × 50 MiB (3 MiB files here) to keep the test's disk and CPU use reasonable on a
// shared machine; the bench runs the full size.
const MAX_FILE = 3 * 1024 * 1024;
const UPLOADERS = 5;
// Reads made while uploads are parsed answer within 1 s. This process also hosts the
// object-storage fake (which receives every stored file) and the eleven clients on the server's
// event loop, which a deployed server does not share; on a machine already overloaded by other
// work even idle reads slow down, so the bound grows to ten idle reads when those are slower
// (below). `npm run bench:upload` reports the latencies at the product's full sizes.
const LIVENESS_BOUND_MS = 1000;

let ctx: TestContext;
let server: Server;
let port = 0;

beforeAll(async () => {
  ctx = await createTestContext({ env: { UPLOAD_MAX_FILE_BYTES: String(MAX_FILE) } });
  server = ctx.app.listen(0, "127.0.0.1");
  await new Promise((r) => server.once("listening", r));
  port = (server.address() as AddressInfo).port;
});

afterAll(async () => {
  await new Promise((r) => server?.close(r));
  await ctx?.close();
});

function timedGet(token: string, path: string): Promise<{ status: number; ms: number }> {
  const started = performance.now();
  return new Promise((resolve, reject) => {
    http
      .get({ host: "127.0.0.1", port, path, headers: { Authorization: `Bearer ${token}` }, agent: false }, (res) => {
        res.resume();
        res.on("end", () => resolve({ status: res.statusCode ?? 0, ms: performance.now() - started }));
      })
      .on("error", reject);
  });
}

describe("ten uploads at the size limit at once", () => {
  it("are all answered while another user's trend and session reads keep answering (bound: see LIVENESS_BOUND_MS)", async () => {
    const clinician = await ctx.seedUser({ role: "clinician" });
    const senders: Array<{ user: SeededUser; token: string; files: Array<{ fileName: string; bytes: Buffer }>; extra: Array<{ fileName: string; bytes: Buffer }> }> = [];
    for (let i = 0; i < UPLOADERS; i++) {
      const user = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id] });
      const serials = await seedDevices(ctx, user.patientId!, `LIVE${i}`);
      const files = FOUR_PLACEMENTS.map((p) => ({ fileName: `walk-${p}.csv`, bytes: largeSensorCsv(serials[p]!, p, MAX_FILE) }));
      // Four more files for devices the clinic never registered: the upload is the largest allowed
      // (8 files at the limit), is parsed in full, then refused at the device registry.
      const extra = FOUR_PLACEMENTS.map((p) => ({ fileName: `spare-${p}.csv`, bytes: largeSensorCsv(`UNLISTED-${i}-${p}`, p, MAX_FILE) }));
      senders.push({ user, token: await ctx.tokenFor(user), files, extra });
    }
    const reader = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id] });
    const readerToken = await ctx.tokenFor(reader);
    const sessionId = await insertDoneSession(ctx, reader.patientId!, "2026-11-02T09:00:00.000Z", { cadenceStepsPerMin: 96 });
    await insertDoneSession(ctx, reader.patientId!, "2026-11-09T09:00:00.000Z", { cadenceStepsPerMin: 98 });
    const reads = [`/api/patients/${reader.patientId}/trends`, `/api/sessions/${sessionId}`];
    // Warm both answers, as a user who opened the page before the burst, and time them idle: on a
    // shared, overloaded machine even an idle read can take a good part of a second (seen: 232 ms
    // idle and 1.57 s during the burst at load average 32 on 2 cores, with nothing blocking the
    // event loop), so the bound is LIVENESS_BOUND_MS or ten idle reads, whichever is longer. A stalled event
    // loop fails either way: the design this replaced held such reads for minutes.
    let idleMs = 0;
    for (let k = 0; k < 6; k++) {
      const r = await timedGet(readerToken, reads[k % reads.length]!);
      expect(r.status).toBe(200);
      if (k >= reads.length) idleMs = Math.max(idleMs, r.ms);
    }
    const boundMs = Math.max(LIVENESS_BOUND_MS, 10 * idleMs);

    const send = (token: string, files: Array<{ fileName: string; bytes: Buffer }>) => {
      const boundary = `----live${Math.random().toString(16).slice(2)}`;
      return writeAllThenRead({
        port,
        path: "/api/sessions",
        headers: { "Content-Type": `multipart/form-data; boundary=${boundary}`, Authorization: `Bearer ${token}` },
        body: multipartBody(boundary, files),
        timeoutMs: 110_000,
      });
    };
    let uploading = true;
    const samples: Array<{ path: string; status: number; ms: number; parsing: boolean }> = [];
    const readLoop = (async () => {
      for (let k = 0; uploading; k++) {
        const path = reads[k % reads.length]!;
        const parsing = uploadParsePool().running > 0;
        const r = await timedGet(readerToken, path);
        samples.push({ path, ...r, parsing });
        await new Promise((res) => setTimeout(res, 50));
      }
    })();
    const answers = await Promise.all(
      senders.flatMap((s) => [send(s.token, s.files), send(s.token, [...s.files, ...s.extra])]),
    ).finally(() => {
      uploading = false;
    });
    await readLoop;

    // Each account's two uploads: the four registered files are stored, the eight-file one is refused.
    expect(answers.map((a) => a.socketError)).toEqual(Array(10).fill(undefined));
    const statuses = answers.map((a) => a.status);
    expect(statuses.filter((s) => s === 202)).toHaveLength(UPLOADERS);
    expect(statuses.filter((s) => s === 422)).toHaveLength(UPLOADERS);
    for (const a of answers.filter((x) => x.status === 422)) expect(JSON.parse(a.body).error.code).toBe("unknown_device");

    expect(samples.every((s) => s.status === 200)).toBe(true);
    // The reads must have overlapped the parsing, or the bound below would prove nothing.
    // Other reads (before, between and after parses) are not bounded here: on a shared machine
    // they carry the scheduler's noise (one took 2.4 s at load average 30 with no parse running).
    expect(samples.filter((s) => s.parsing).length).toBeGreaterThanOrEqual(3);
    // The claim is about reads made while uploads are being parsed; those started while a parse
    // thread was busy must all answer within the bound. (With parsing back on the event loop, no
    // read could even start during a parse, and the count above would fail.)
    const duringParse = samples.filter((s) => s.parsing);
    const slowest = Math.max(...duringParse.map((s) => s.ms));
    expect(slowest, JSON.stringify({ idleMs, boundMs, slow: duringParse.filter((s) => s.ms > boundMs) })).toBeLessThan(boundMs);
  }, 240_000);
});
