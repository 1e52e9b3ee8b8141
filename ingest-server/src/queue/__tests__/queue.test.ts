import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { PgBossQueue, QUEUES } from "../queue";
import { createTestContext, type TestContext } from "../../testing/harness";

let ctx: TestContext;
let queue: PgBossQueue;
beforeAll(async () => {
  ctx = await createTestContext();
  queue = ctx.deps.queue as PgBossQueue;
});
afterAll(() => ctx?.close());

const until = async (check: () => boolean | Promise<boolean>, timeoutMs = 20_000) => {
  const end = Date.now() + timeoutMs;
  while (!(await check())) {
    if (Date.now() > end) throw new Error("condition not reached in time");
    await new Promise((r) => setTimeout(r, 50));
  }
};

describe("PgBossQueue", () => {
  it("delivers a job's data to a worker and completes it", async () => {
    const seen: object[] = [];
    await queue.work<{ n: number }>("test-deliver", async (job) => {
      seen.push(job.data);
    }, { pollingIntervalSeconds: 0.5 });
    const id = await queue.send("test-deliver", { n: 7 });
    expect(id).toBeTruthy();
    await until(() => seen.length === 1);
    expect(seen).toEqual([{ n: 7 }]);
    await until(async () => (await queue.getJob("test-deliver", id!))?.state === "completed");
  });

  it("retries a failing job and marks it failed after retryLimit, keeping the error", async () => {
    const attempts: number[] = [];
    await queue.work("test-fail", async (job) => {
      attempts.push(job.retryCount);
      throw new Error("sensor file unreadable");
    }, { pollingIntervalSeconds: 0.5 });
    const id = await queue.send("test-fail", {}, { retryLimit: 2, retryDelay: 0, retryBackoff: false });
    await until(async () => (await queue.getJob("test-fail", id!))?.state === "failed");
    expect(attempts).toEqual([0, 1, 2]);
    const job = await queue.getJob("test-fail", id!);
    expect(JSON.stringify(job?.output)).toContain("sensor file unreadable");
  });

  it("keeps one waiting job per singletonKey on the stately session queue, and key-less jobs apart", async () => {
    const a = await queue.send(QUEUES.processSession, { v: 1 }, { singletonKey: "session-1" });
    const b = await queue.send(QUEUES.processSession, { v: 2 }, { singletonKey: "session-1" });
    const c = await queue.send(QUEUES.processSession, { v: 3 }, { singletonKey: "session-2" });
    expect(a).toBeTruthy();
    expect(b).toBeNull();
    expect(c).toBeTruthy();
    const k1 = await queue.send(QUEUES.processSession, { v: 4 });
    const k2 = await queue.send(QUEUES.processSession, { v: 5 });
    expect(k1).toBeTruthy();
    expect(k2).toBeTruthy();
  });

  it("lives in its own schema of the application database", async () => {
    const { rows } = await ctx.db.raw("SELECT 1 FROM information_schema.schemata WHERE schema_name = ?", [ctx.config.queueSchema]);
    expect(rows).toHaveLength(1);
  });

  it("wakes an idle worker when a job is sent, instead of waiting for its next poll", async () => {
    const seen: number[] = [];
    // A 60 s poll: the worker's first fetch finds nothing, and only the notification can wake it.
    await queue.work<{ n: number }>("test-wake", async (job) => {
      seen.push(job.data.n);
    }, { pollingIntervalSeconds: 60 });
    await new Promise((r) => setTimeout(r, 500));
    await queue.send("test-wake", { n: 1 });
    // Generous bound, about liveness: far below the 60 s poll, far above a notification's delay.
    await until(() => seen.length === 1, 15_000);
    expect(seen).toEqual([1]);
  });
});
