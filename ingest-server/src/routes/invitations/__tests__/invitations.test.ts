import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type SeededUser, type TestContext } from "../../../testing/harness";

let ctx: TestContext;
let admin: SeededUser;
let clinician: SeededUser;
let adminToken: string;
let clinicianToken: string;
beforeAll(async () => {
  ctx = await createTestContext();
  admin = await ctx.seedUser({ role: "admin" });
  clinician = await ctx.seedUser({ role: "clinician" });
  adminToken = await ctx.tokenFor(admin);
  clinicianToken = await ctx.tokenFor(clinician);
});
afterAll(() => ctx?.close());

const newPatient = { birthYear: 1971, sex: "female", condition: "incomplete_sci", enrolledOn: "2026-03-02" };
const invite = (token: string, body: object) => request(ctx.app).post("/api/invitations").set("Authorization", `Bearer ${token}`).send(body);
const tokenFromMail = async (email: string) => {
  const m = await ctx.mailbox.waitFor((x) => x.to.includes(email) && x.subject.includes("invited"));
  return { text: m.text, token: /accept-invitation\?token=([\w-]+)/.exec(m.text)![1]! };
};
const accept = (token: string, password: string) => request(ctx.app).post("/api/auth/invitations/accept").send({ token, password });

describe("POST /api/invitations", () => {
  it("admin invites a researcher; the e-mailed link sets the password once and signs in", async () => {
    const res = await invite(adminToken, { email: "Dana.Moor@example.test", displayName: "Dana Moor", role: "researcher" });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ email: "dana.moor@example.test", role: "researcher", emailSent: true, acceptedAt: null });
    const days = (Date.parse(res.body.expiresAt) - Date.now()) / 86_400_000;
    expect(days).toBeGreaterThan(6.99);
    expect(days).toBeLessThanOrEqual(7);
    const user = await ctx.db("users").where({ id: res.body.userId }).first();
    expect(user.status).toBe("invited");
    expect(user.password_hash).toBeNull();

    const { text, token } = await tokenFromMail("dana.moor@example.test");
    expect(text).toContain(`${ctx.config.publicUrl}/accept-invitation?token=`);
    const ok = await accept(token, "a-long-enough-secret");
    expect(ok.status).toBe(200);
    expect(ok.body.user).toMatchObject({ id: res.body.userId, role: "researcher" });
    expect((await request(ctx.app).get("/api/me").set("Authorization", `Bearer ${ok.body.accessToken}`)).body.email).toBe("dana.moor@example.test");

    const again = await accept(token, "another-long-secret");
    expect(again.status).toBe(410);
    expect(again.body.error.code).toBe("invitation_used");
    expect((await request(ctx.app).post("/api/auth/login").send({ email: "dana.moor@example.test", password: "a-long-enough-secret" })).status).toBe(200);
    const actions = (await ctx.db("audit_events").whereIn("action", ["invitation.create", "invitation.accept"]).select("action")).map((r) => r.action);
    expect(actions).toEqual(expect.arrayContaining(["invitation.create", "invitation.accept"]));
  });

  it("a clinician invites a new patient, who joins that clinician's caseload", async () => {
    const res = await invite(clinicianToken, { email: "ivo.brandt@example.test", displayName: "Ivo Brandt", role: "patient", patient: newPatient });
    expect(res.status).toBe(201);
    expect(res.body.patientId).toMatch(/^[0-9a-f-]{36}$/);
    expect(await ctx.db("caseload").where({ clinician_id: clinician.id, patient_id: res.body.patientId }).first()).toBeTruthy();
    // The enrolment is a caseload link of its own: author, reason and audit event.
    const [linkRow] = await ctx.db("caseload_links").where({ patient_id: res.body.patientId }).select("id", "clinician_id", "created_by", "reason");
    expect(linkRow).toMatchObject({ clinician_id: clinician.id, created_by: clinician.id, reason: "enrolled by this clinician's invitation" });
    expect(await ctx.db("audit_events").where({ action: "caseload_link.create", resource_id: linkRow.id }).first()).toBeTruthy();
    const patient = await ctx.db("patients").where({ id: res.body.patientId }).first();
    expect(patient).toMatchObject({ display_name: "Ivo Brandt", birth_year: 1971, condition: "incomplete_sci", research_consent: false });
    const { token } = await tokenFromMail("ivo.brandt@example.test");
    const ok = await accept(token, "walks-every-monday");
    expect(ok.body.user.patientId).toBe(res.body.patientId);
  });

  it("a clinician cannot invite any role but patient", async () => {
    for (const role of ["clinician", "researcher", "admin"]) {
      const res = await invite(clinicianToken, { email: `x-${role}@example.test`, displayName: "X", role });
      expect(res.status).toBe(403);
    }
    expect(await ctx.db("users").where("email", "like", "x-%@example.test").first()).toBeUndefined();
  });

  it("a clinician cannot attach an account to a patient outside their caseload (404, existence hidden)", async () => {
    const outside = await ctx.seedPatient();
    const res = await invite(clinicianToken, { email: "someone@example.test", displayName: "Someone", role: "patient", patientId: outside });
    expect(res.status).toBe(404);
  });

  it("patients and researchers may not invite; no token is 401", async () => {
    const patient = await ctx.seedUser({ role: "patient" });
    const researcher = await ctx.seedUser({ role: "researcher" });
    const body = { email: "nope@example.test", displayName: "Nope", role: "patient", patient: newPatient };
    expect((await invite(await ctx.tokenFor(patient), body)).status).toBe(403);
    expect((await invite(await ctx.tokenFor(researcher), body)).status).toBe(403);
    expect((await request(ctx.app).post("/api/invitations").send(body)).status).toBe(401);
  });

  it("refuses an address that already has an active account (409) and bad bodies (400)", async () => {
    const dup = await invite(adminToken, { email: clinician.email, displayName: "Dup", role: "clinician" });
    expect([dup.status, dup.body.error.code]).toEqual([409, "account_active"]);
    expect((await invite(adminToken, { email: "p@example.test", displayName: "P", role: "patient" })).status).toBe(400);
    expect((await invite(adminToken, { email: "c@example.test", displayName: "C", role: "clinician", patient: newPatient })).status).toBe(400);
    expect((await invite(adminToken, { email: "c@example.test", displayName: "C", role: "superuser" })).status).toBe(400);
  });

  it("re-inviting a pending account retires the earlier link", async () => {
    const first = await invite(adminToken, { email: "kai.nord@example.test", displayName: "Kai Nord", role: "clinician" });
    const t1 = (await tokenFromMail("kai.nord@example.test")).token;
    ctx.mailbox.clear();
    const second = await invite(adminToken, { email: "kai.nord@example.test", displayName: "Kai Nord", role: "clinician" });
    expect(second.status).toBe(201);
    expect(second.body.userId).toBe(first.body.userId);
    const t2 = (await tokenFromMail("kai.nord@example.test")).token;
    expect((await accept(t1, "first-link-password")).status).toBe(410);
    expect((await accept(t2, "second-link-password")).status).toBe(200);
  });

  it("an expired invitation cannot be accepted and leaves the account invited", async () => {
    const res = await invite(adminToken, { email: "late.comer@example.test", displayName: "Late Comer", role: "researcher" });
    const { token } = await tokenFromMail("late.comer@example.test");
    await ctx.db("invitations").where({ id: res.body.id }).update({ expires_at: new Date(Date.now() - 60_000) });
    const late = await accept(token, "too-late-password");
    expect(late.status).toBe(410);
    expect(late.body.error.code).toBe("invitation_expired");
    expect((await ctx.db("users").where({ id: res.body.userId }).first()).status).toBe("invited");
    expect((await accept("y".repeat(43), "whatever-password")).status).toBe(400);
  });

  it("lists pending invitations: all for an admin, own for a clinician", async () => {
    const all = await request(ctx.app).get("/api/invitations?state=all").set("Authorization", `Bearer ${adminToken}`);
    const mine = await request(ctx.app).get("/api/invitations?state=all").set("Authorization", `Bearer ${clinicianToken}`);
    expect(all.status).toBe(200);
    expect(mine.status).toBe(200);
    expect(mine.body.every((i: { invitedBy: string }) => i.invitedBy === clinician.id)).toBe(true);
    expect(all.body.length).toBeGreaterThan(mine.body.length);
  });
});
