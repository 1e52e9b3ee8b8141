import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type TestContext } from "../../testing/harness";
import { countDemoAccounts, DEMO_MODE_BANNER, startModeRefusal } from "../start-mode";

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext();
});
afterAll(() => ctx?.close());

describe("startModeRefusal(config, db)", () => {
  it("lets production start on a database without demo accounts, silently", async () => {
    await ctx.seedUser({ role: "clinician", email: "physio@clinic.example" });
    const lines: string[] = [];
    expect(await startModeRefusal({ mode: "production" }, ctx.db, (l) => lines.push(l))).toBeNull();
    expect(lines).toEqual([]);
  });

  it("announces demo mode on one line", async () => {
    const lines: string[] = [];
    expect(await startModeRefusal({ mode: "demo" }, ctx.db, (l) => lines.push(l))).toBeNull();
    expect(lines).toEqual([`[pendula] ${DEMO_MODE_BANNER}`]);
    expect(lines[0]).toContain("/api/dev/mailbox");
  });

  it("refuses production while an account flagged by the demo seed exists", async () => {
    const u = await ctx.seedUser({ role: "admin", email: "someone@clinic.example" });
    await ctx.db("users").where({ id: u.id }).update({ is_demo: true });
    expect(await countDemoAccounts(ctx.db)).toBe(1);
    const refusal = await startModeRefusal({ mode: "production" }, ctx.db);
    expect(refusal).toContain("refusing a production start: 1 demo account(s)");
    await ctx.db("users").where({ id: u.id }).update({ is_demo: false });
  });

  it("also counts the demo e-mail domain, in any letter case, for databases seeded before the flag", async () => {
    const u = await ctx.seedUser({ role: "researcher" });
    await ctx.db("users").where({ id: u.id }).update({ email: "Researcher@Demo.Pendula.Test" });
    expect(await countDemoAccounts(ctx.db)).toBe(1);
    expect(await startModeRefusal({ mode: "production" }, ctx.db)).toMatch(/^\[pendula\] refusing a production start/);
  });
});
