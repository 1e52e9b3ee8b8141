import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type TestContext } from "../../testing/harness";

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext();
});
afterAll(() => ctx?.close());

// Regression: the first sends after boot raced pg-boss's start, and all but the first failed with
// `schema "pgboss" does not exist` (uploads were stored but waited for the 20-minute sweep).
describe("PgBossQueue before its first start", () => {
  it("lets many concurrent first sends wait for one start and one queue creation", async () => {
    const ids = await Promise.all(Array.from({ length: 20 }, (_, n) => ctx.deps.queue.send("test-first-send", { n })));
    expect(ids.every((id) => typeof id === "string" && id.length > 0)).toBe(true);
    expect(new Set(ids).size).toBe(20);
    const [row] = await ctx.db(`${ctx.config.queueSchema}.job`).where({ name: "test-first-send" }).count<{ n: string }[]>({ n: "*" });
    expect(Number(row?.n)).toBe(20);
  });
});
