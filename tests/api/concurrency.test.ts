import type { Server } from "node:http";
import type { AddressInfo } from "node:net";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { handleProcessSessionJob } from "../../ingest-server/src/processing/session-job";
import { QUEUES } from "../../ingest-server/src/queue/queue";
import type { ProcessSessionJob } from "../../ingest-server/src/sessions/process-session-job";
import { createTestContext, type SeededUser, type TestContext } from "../../ingest-server/src/testing/harness";
import { attachFiles, seedDevices, storedCounts } from "../../ingest-server/src/testing/session-fixtures";
import { synthesizeSession } from "../../signal/src/synth";
import { waitUntil } from "./support/processes";

/**
 * 50 uploads in flight at once from 10 patients: four distinct sessions each, and each patient's
 * first session sent twice at the same moment. The unique (patient_id, content_sha256) constraint
 * decides the race; the loser deletes its own objects and answers with the winner.
 */
const PATIENTS = 10;
const SESSIONS_EACH = 4;
const PLACEMENTS = ["left_shank", "right_shank"] as const;

let ctx: TestContext;
let server: Server;
let base: string;

beforeAll(async () => {
  // Five uploads per patient are in flight here at once, above the default cap of two per account
  // (that cap and its 429 are tested in ingest-server/src/uploads/__tests__): this test is about
  // the duplicate race, so it lifts the cap rather than measure it.
  ctx = await createTestContext({ env: { UPLOAD_IN_FLIGHT_PER_USER: String(SESSIONS_EACH + 1) } });
  server = ctx.app.listen(0, "127.0.0.1");
  await new Promise<void>((r) => server.once("listening", () => r()));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});

afterAll(async () => {
  await new Promise<void>((r) => server?.close(() => r()));
  await ctx?.close();
});

describe("50 concurrent uploads from 10 patients", () => {
  it("stores every session exactly once (the simultaneous duplicate included), leaves no orphans and processes all", async () => {
    const plan: Array<{ patient: SeededUser; token: string; key: string; files: Array<{ fileName: string; text: string }> }> = [];
    for (let p = 0; p < PATIENTS; p++) {
      const patient = await ctx.seedUser({ role: "patient" });
      const serials = await seedDevices(ctx, patient.patientId!, `CC${p}`, { placements: PLACEMENTS });
      const token = await ctx.tokenFor(patient);
      for (let s = 0; s < SESSIONS_EACH; s++) {
        const files = synthesizeSession({
          seed: 1000 + p * 10 + s,
          durationS: 30,
          sampleRateHz: 100,
          placements: [...PLACEMENTS],
          deviceSerials: serials,
          startUtc: `2026-05-${String(4 + s * 7).padStart(2, "0")}T09:00:00.000Z`,
        }).files.map((f) => ({ fileName: f.fileName, text: f.text }));
        plan.push({ patient, token, key: `${p}/${s}`, files });
        if (s === 0) plan.push({ patient, token, key: `${p}/${s}`, files });
      }
    }
    expect(plan.length).toBe(50);
    const before = await storedCounts(ctx);

    const results = await Promise.all(
      plan.map(async (u) => {
        const res = await attachFiles(request(base).post("/api/sessions").set("Authorization", `Bearer ${u.token}`), u.files);
        return { key: u.key, status: res.status, id: res.body?.id as string, duplicate: res.body?.duplicate === true, text: res.text };
      }),
    );
    const unexpected = results.filter((r) => r.status !== 202 && r.status !== 200);
    expect(unexpected, JSON.stringify(unexpected.slice(0, 3))).toEqual([]);

    const uniqueKeys = PATIENTS * SESSIONS_EACH;
    expect(results.filter((r) => r.status === 202).length).toBe(uniqueKeys);
    expect(results.filter((r) => r.status === 200 && r.duplicate).length).toBe(PATIENTS);
    // Both answers of a simultaneous pair name the same session.
    const idsByKey = new Map<string, Set<string>>();
    for (const r of results) idsByKey.set(r.key, (idsByKey.get(r.key) ?? new Set()).add(r.id));
    for (const [key, ids] of idsByKey) expect(ids.size, key).toBe(1);
    const ids = [...idsByKey.values()].map((s) => [...s][0]!);
    expect(new Set(ids).size).toBe(uniqueKeys);

    // Rows and objects: one session and its files per unique upload, nothing from the losers.
    const after = await storedCounts(ctx);
    expect(after).toEqual({
      sessions: before.sessions + uniqueKeys,
      files: before.files + uniqueKeys * PLACEMENTS.length,
      // Each session's files and, beside them, its parsed recordings (uploads/parsed-recordings.ts).
      objects: before.objects + uniqueKeys * (PLACEMENTS.length + 1),
    });
    const perPatient = await ctx.db("walk_sessions").whereIn("id", ids).groupBy("patient_id").select("patient_id").count<{ patient_id: string; n: string }[]>({ n: "*" });
    expect(perPatient.map((r) => Number(r.n))).toEqual(Array(PATIENTS).fill(SESSIONS_EACH));

    // Processing through the real queue: one job per session, each processed once.
    await ctx.deps.queue.work<ProcessSessionJob>(QUEUES.processSession, (job) => handleProcessSessionJob(ctx.deps, job), { pollingIntervalSeconds: 0.5 });
    const rows = await waitUntil(
      "every session to be processed",
      async () => {
        const r = await ctx.db("walk_sessions").whereIn("id", ids).select("id", "status", "attempts", "error");
        return r.every((s) => s.status === "done" || s.status === "failed") ? r : undefined;
      },
      150_000,
      500,
    );
    expect(rows.filter((r) => r.status !== "done"), JSON.stringify(rows.filter((r) => r.status !== "done").slice(0, 2))).toEqual([]);
    expect(rows.every((r) => r.attempts === 1)).toBe(true);
    const metricDupes = await ctx
      .db("session_metrics")
      .whereIn("session_id", ids)
      .groupBy("session_id", "metric_key")
      .havingRaw("count(*) > 1")
      .select("session_id");
    expect(metricDupes).toEqual([]);
    const withMetrics = await ctx.db("session_metrics").whereIn("session_id", ids).countDistinct<{ n: string }[]>({ n: "session_id" });
    expect(Number(withMetrics[0]?.n)).toBe(uniqueKeys);
  });
});
