import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_PASSWORD, DEMO_STAFF } from "../../../../db/seeds/demo-scenario";
import { createTestContext, type TestContext } from "../../testing/harness";
import { demoCodeCommand } from "../demo-code";
import { enrolDemoStaff } from "../demo-second-factor";

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext();
});
afterAll(() => ctx?.close());

describe("demo staff second factor", () => {
  it("is refused outside demo mode and writes nothing then", async () => {
    const admin = DEMO_STAFF.find((s) => s.role === "admin")!;
    const u = await ctx.seedUser({ role: "admin", email: admin.email, password: DEMO_PASSWORD });
    await expect(enrolDemoStaff(ctx.db, { ...ctx.config, mode: "production" })).rejects.toThrow(/demo mode/);
    expect(await ctx.db("user_totp").where({ user_id: u.id })).toHaveLength(0);
  });

  it("in demo mode, the code `npm run demo:code` prints signs the demo staff in (password, then code)", async () => {
    const clinician = DEMO_STAFF.find((s) => s.role === "clinician")!;
    await ctx.seedUser({ role: "clinician", email: clinician.email, password: DEMO_PASSWORD });
    expect(await enrolDemoStaff(ctx.db, ctx.config)).toBeGreaterThanOrEqual(2);
    const pw = await request(ctx.app).post("/api/auth/login").send({ email: clinician.email, password: DEMO_PASSWORD });
    expect(pw.body.secondFactorRequired).toBe(true);
    const printed = await demoCodeCommand([clinician.email.toUpperCase()]);
    expect(printed.code).toBe(0);
    const code = /^(\d{6})\n/.exec(printed.out)?.[1];
    expect(code).toMatch(/^\d{6}$/);
    const ok = await request(ctx.app).post("/api/auth/login/second-factor").send({ challenge: pw.body.challenge, method: "totp", code });
    expect(ok.status).toBe(200);
    expect(ok.body.secondFactor).toBe("verified");
  });

  it("prints usage and exits 2 for an address that is not a demo staff account", async () => {
    for (const args of [[], ["patient@demo.pendula.test"], ["someone@example.test"]]) {
      const r = await demoCodeCommand(args);
      expect(r.code).toBe(2);
      expect(r.out).toContain("usage: npm run demo:code");
    }
  });
});
