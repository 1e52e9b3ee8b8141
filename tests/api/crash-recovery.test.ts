import { randomBytes } from "node:crypto";
import http from "node:http";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type SeededUser, type TestContext } from "../../ingest-server/src/testing/harness";
import { FOUR_PLACEMENTS, seedDevices, storedCounts, synthFor, upload } from "../../ingest-server/src/testing/session-fixtures";
import { synthesizeSession } from "../../signal/src/synth";
import { childEnv, freePort, startTsx, waitUntil, type Child } from "./support/processes";

/**
 * Real processes, real kills. A worker is SIGKILLed while it processes a session; pg-boss expires
 * the orphaned job (QUEUE_EXPIRE_S, short here; 15 minutes in production) and a second worker
 * retries it; processSession's single transaction leaves exactly one set of results. A server is
 * killed while a request body is half sent; nothing is stored, and the retried upload is complete.
 */
const EXPIRE_S = 20;

let ctx: TestContext;
let patient: SeededUser;
let token: string;
let serials: Record<string, string>;
const children: Child[] = [];

beforeAll(async () => {
  ctx = await createTestContext({ env: { QUEUE_EXPIRE_S: String(EXPIRE_S), QUEUE_MAINTENANCE_S: "1", UPLOAD_RATE_LIMIT: "1000" } });
  patient = await ctx.seedUser({ role: "patient" });
  serials = await seedDevices(ctx, patient.patientId!, "CR");
  token = await ctx.tokenFor(patient);
});

afterAll(async () => {
  for (const c of children) await c.kill();
  await ctx?.close();
});

const session = (id: string) => ctx.db("walk_sessions").where({ id }).first();

describe("a worker killed in the middle of a job", () => {
  it("is replaced by a second worker; the session ends done once with one set of metrics, strides and traces", async () => {
    // Ten minutes at 200 Hz on four sensors (~23 MB): several seconds of processing, long enough to
    // be caught in the middle.
    const big = synthesizeSession({ seed: 71, durationS: 600, sampleRateHz: 200, placements: [...FOUR_PLACEMENTS], deviceSerials: serials });
    const res = await upload(ctx, token, big.files);
    expect(res.status).toBe(202);
    const id = res.body.id as string;

    const first = startTsx("ingest-server/src/worker.ts", childEnv(ctx));
    children.push(first);
    await waitUntil("the first worker to start the job", async () => ((await session(id)).status === "processing" ? true : undefined), 90_000, 50);
    await first.kill("SIGKILL");
    expect(first.proc.signalCode ?? "exited").not.toBe("exited");
    // Killed mid-job: nothing was committed and pg-boss still holds the job as active.
    const orphan = await session(id);
    expect(orphan.status).toBe("processing");
    expect(orphan.attempts).toBe(1);
    const metricsBefore = await ctx.db("session_metrics").where({ session_id: id }).count<{ n: string }[]>({ n: "*" });
    expect(Number(metricsBefore[0]?.n)).toBe(0);
    const jobsOf = () => ctx.db(`${ctx.config.queueSchema}.job`).where({ name: "process-session", singleton_key: id }).select("state", "retry_count");
    expect((await jobsOf()).map((j) => j.state)).toEqual(["active"]);

    const second = startTsx("ingest-server/src/worker.ts", childEnv(ctx));
    children.push(second);
    const done = await waitUntil("the second worker to finish the session", async () => {
      const s = await session(id);
      return s.status === "done" ? s : undefined;
    }, 150_000, 250);
    expect(done.attempts).toBe(2);
    expect(done.error).toBeNull();

    // Exactly one session for this content, one row per metric key, one stride per ordinal, one trace per placement.
    const sessions = await ctx.db("walk_sessions").where({ patient_id: patient.patientId, content_sha256: done.content_sha256 }).count<{ n: string }[]>({ n: "*" });
    expect(Number(sessions[0]!.n)).toBe(1);
    const metrics = await ctx.db("session_metrics").where({ session_id: id }).select("metric_key");
    expect(metrics.length).toBeGreaterThan(3);
    expect(new Set(metrics.map((m) => m.metric_key)).size).toBe(metrics.length);
    const strides = await ctx.db("strides").where({ session_id: id }).select("ordinal");
    expect(strides.length).toBeGreaterThan(100);
    expect(new Set(strides.map((s) => s.ordinal)).size).toBe(strides.length);
    const traces = await ctx.db("session_traces").where({ session_id: id }).select("placement");
    expect(traces.map((t) => t.placement).sort()).toEqual([...FOUR_PLACEMENTS].sort());

    // The job completed once, and nothing runs it again afterwards.
    await waitUntil("the job to be completed", async () => {
      const jobs = await jobsOf();
      return jobs.length === 1 && jobs[0]!.state === "completed" ? jobs : undefined;
    }, 30_000, 250);
    await new Promise((r) => setTimeout(r, 3000));
    const later = await session(id);
    expect(later.status).toBe("done");
    expect(later.attempts).toBe(2);
    expect(new Date(later.processed_at).getTime()).toBe(new Date(done.processed_at).getTime());
    const detail = await request(ctx.app).get(`/api/sessions/${id}`).set("Authorization", `Bearer ${token}`);
    expect(detail.body.status).toBe("done");
    // The generator walks at its default stride time; cadence is the analysis' own check (signal tests hold the tolerance).
    expect(detail.body.analysis.metrics.cadenceStepsPerMin).toBeGreaterThan(60);
    await second.kill("SIGTERM");
  });
});

function multipart(files: Array<{ fileName: string; text: string }>): { body: Buffer; contentType: string } {
  const boundary = `----pendula${randomBytes(8).toString("hex")}`;
  const parts: Buffer[] = [];
  for (const f of files) {
    parts.push(
      Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="files"; filename="${f.fileName}"\r\nContent-Type: text/csv\r\n\r\n`),
      Buffer.from(f.text),
      Buffer.from("\r\n"),
    );
  }
  parts.push(Buffer.from(`--${boundary}--\r\n`));
  return { body: Buffer.concat(parts), contentType: `multipart/form-data; boundary=${boundary}` };
}

/** Sends the head and the first `fraction` of the body, then calls `interrupt` and waits for the request to end. */
function halfUpload(port: number, body: Buffer, contentType: string, fraction: number, interrupt: (req: http.ClientRequest) => Promise<void>): Promise<string> {
  return new Promise((resolve) => {
    const req = http.request({
      host: "127.0.0.1",
      port,
      method: "POST",
      path: "/api/sessions",
      headers: { "Content-Type": contentType, "Content-Length": String(body.length), Authorization: `Bearer ${token}` },
    });
    req.on("response", (res) => resolve(`answered ${res.statusCode}`));
    req.on("error", (err) => resolve(`aborted: ${(err as NodeJS.ErrnoException).code ?? err.message}`));
    req.write(body.subarray(0, Math.floor(body.length * fraction)), () => {
      setTimeout(() => void interrupt(req), 300);
    });
  });
}

describe("a server restarted in the middle of an upload", () => {
  it("stores nothing of the half-sent request; the client's retry stores one complete session", async () => {
    const files = synthFor(serials, { seed: 72, startUtc: "2026-11-30T09:00:00.000Z" }).files;
    const { body, contentType } = multipart(files);
    const before = await storedCounts(ctx);
    const port = await freePort();
    const env = childEnv(ctx, { PORT: String(port) });

    const server1 = startTsx("ingest-server/src/server.ts", env);
    children.push(server1);
    await server1.waitForLine(new RegExp(`^http://127\\.0\\.0\\.1:${port}$`));
    const outcome = await halfUpload(port, body, contentType, 0.5, () => server1.kill("SIGKILL"));
    expect(outcome).toMatch(/^aborted/);
    expect(await storedCounts(ctx)).toEqual(before);

    const server2 = startTsx("ingest-server/src/server.ts", env);
    children.push(server2);
    await server2.waitForLine(new RegExp(`^http://127\\.0\\.0\\.1:${port}$`));
    // The client giving up half-way (the other side of the same failure) stores nothing either.
    const gaveUp = await halfUpload(port, body, contentType, 0.6, async (req) => {
      req.destroy();
    });
    expect(gaveUp).toMatch(/^aborted/);
    await new Promise((r) => setTimeout(r, 500));
    expect(await storedCounts(ctx)).toEqual(before);

    const retry = await request(`http://127.0.0.1:${port}`).post("/api/sessions").set("Authorization", `Bearer ${token}`).set("Content-Type", contentType).send(body);
    expect(retry.status).toBe(202);
    const id = retry.body.id as string;
    // Four files and their parsed recordings (uploads/parsed-recordings.ts).
    expect(await storedCounts(ctx)).toEqual({ sessions: before.sessions + 1, files: before.files + 4, objects: before.objects + 5 });
    const rows = await ctx.db("raw_files").where({ session_id: id }).select("original_name", "size_bytes", "placement");
    expect(rows.map((r) => r.original_name).sort()).toEqual(files.map((f) => f.fileName).sort());
    for (const f of files) expect(Number(rows.find((r) => r.original_name === f.fileName)!.size_bytes)).toBe(Buffer.byteLength(f.text));
    expect(rows.map((r) => r.placement).sort()).toEqual([...FOUR_PLACEMENTS].sort());
    // Stored bytes are the sent bytes.
    const stored = await ctx.db("raw_files").where({ session_id: id }).select("storage_key", "original_name");
    for (const s of stored) {
      const bytes = await ctx.deps.storage.get(s.storage_key as string);
      expect(bytes.toString("utf8")).toBe(files.find((f) => f.fileName === s.original_name)!.text);
    }
    // Retrying once more (the client did not see the answer) is the same session, not a second one.
    const again = await request(`http://127.0.0.1:${port}`).post("/api/sessions").set("Authorization", `Bearer ${token}`).set("Content-Type", contentType).send(body);
    expect(again.status).toBe(200);
    expect(again.body).toMatchObject({ id, duplicate: true });
    await server2.kill("SIGTERM");
  });
});
