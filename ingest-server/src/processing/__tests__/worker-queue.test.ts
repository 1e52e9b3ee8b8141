import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { QUEUES } from "../../queue/queue";
import { createTestContext, type TestContext } from "../../testing/harness";
import { seedDevices, synthFor, upload } from "../../testing/session-fixtures";
import { handleProcessSessionJob, requeueStaleSessions } from "../session-job";
import type { ProcessSessionJob } from "../../sessions/process-session-job";

let ctx: TestContext;

beforeAll(async () => {
  ctx = await createTestContext();
});

afterAll(async () => {
  await ctx?.close();
});

async function waitFor<T>(fn: () => Promise<T | undefined>, timeoutMs = 45_000): Promise<T> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const v = await fn();
    if (v !== undefined) return v;
    if (Date.now() > until) throw new Error("timed out waiting");
    await new Promise((r) => setTimeout(r, 250));
  }
}

describe("the process-session queue", () => {
  it("an upload is picked up by a queue worker and ends done; a stale queued session is re-enqueued", async () => {
    const clinician = await ctx.seedUser({ role: "clinician" });
    const patient = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id] });
    const serials = await seedDevices(ctx, patient.patientId!, "Q");
    await ctx.deps.queue.work<ProcessSessionJob>(QUEUES.processSession, (job) => handleProcessSessionJob(ctx.deps, job), { pollingIntervalSeconds: 0.5 });

    const token = await ctx.tokenFor(patient);
    const res = await upload(ctx, token, synthFor(serials, { seed: 61 }).files);
    expect(res.status).toBe(202);
    const done = await waitFor(async () => {
      const row = await ctx.db("walk_sessions").where({ id: res.body.id }).first();
      return row.status === "done" ? row : undefined;
    });
    expect(done.attempts).toBe(1);
    const detail = await request(ctx.app).get(`/api/sessions/${res.body.id}`).set("Authorization", `Bearer ${token}`);
    expect(detail.body.status).toBe("done");
    expect(detail.body.analysis.metrics.cadenceStepsPerMin).toBeGreaterThan(0);

    // A session left queued with no job that will finish it (server died between commit and
    // enqueue, or a job expired) is found by the sweep. The upload's own job runs first: the
    // worker wakes on the send at once, and the sweep must not race it.
    const res2 = await upload(ctx, token, synthFor(serials, { seed: 62, startUtc: "2026-11-24T09:00:00.000Z" }).files);
    await waitFor(async () => {
      const row = await ctx.db("walk_sessions").where({ id: res2.body.id }).first();
      return row.status === "done" ? row : undefined;
    });
    await ctx.db("walk_sessions").where({ id: res2.body.id }).update({ status: "queued", updated_at: ctx.db.raw("now() - interval '1 hour'") });
    expect(await requeueStaleSessions(ctx.deps, 600)).toBeGreaterThanOrEqual(1);
    await waitFor(async () => {
      const row = await ctx.db("walk_sessions").where({ id: res2.body.id }).first();
      return row.status === "done" ? row : undefined;
    });
  });
});
