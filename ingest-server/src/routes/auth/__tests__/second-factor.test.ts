import request from "supertest";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { ENROLMENT_SCOPE } from "../../../auth/scopes";
import { totpCode, TOTP_PERIOD_S } from "../../../auth/totp";
import { createTestContext, type SeededUser, type TestContext } from "../../../testing/harness";
import { ACCOUNT_MAX_CODE_FAILURES, CHALLENGE_MAX_FAILURES } from "../auth.service";

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext({ env: { LOGIN_RATE_LIMIT: "50", LOGIN_RATE_WINDOW_S: "600" } });
});
afterAll(() => ctx?.close());

const bearer = (token: string) => ({ Authorization: `Bearer ${token}` });
const cookieOf = (res: request.Response): string | undefined =>
  ([] as string[]).concat(res.headers["set-cookie"] ?? []).find((c) => c.startsWith("pendula_refresh="))?.split(";")[0];
const login = (u: Pick<SeededUser, "email" | "password">) => request(ctx.app).post("/api/auth/login").send({ email: u.email, password: u.password });
const second = (challenge: string, method: "totp" | "recovery_code", code: string) =>
  request(ctx.app).post("/api/auth/login/second-factor").send({ challenge, method, code });
/** A code `steps` periods away from now. */
const codeAt = (secret: string, steps = 0) => totpCode(secret, Date.now() + steps * TOTP_PERIOD_S * 1000);
const audits = (userId: string, action: string) => ctx.db("audit_events").where({ resource_id: userId, action }).orderBy("id");

/** Enrols through the API: start, then confirm with the current code. */
async function enrol(token: string, cookie?: string) {
  const start = await request(ctx.app).post("/api/auth/second-factor/enrolment").set(bearer(token));
  expect(start.status).toBe(200);
  const confirm = request(ctx.app).post("/api/auth/second-factor/enrolment/confirm").set(bearer(token));
  if (cookie) confirm.set("Cookie", cookie);
  const res = await confirm.send({ code: await codeAt(start.body.secret as string) });
  expect(res.status).toBe(200);
  return { secret: start.body.secret as string, uri: start.body.otpauthUri as string, res };
}

describe("staff without a second factor", () => {
  it("signs in limited to enrolment: /api/me and the enrolment answer, every other route 403 second_factor_enrolment_required", async () => {
    const c = await ctx.seedUser({ role: "clinician" });
    const res = await login(c);
    expect(res.status).toBe(200);
    expect(res.body.secondFactor).toBe("enrolment_required");
    const token = res.body.accessToken as string;
    const me = await request(ctx.app).get("/api/me").set(bearer(token));
    expect(me.status).toBe(200);
    expect(me.body.scopes).toEqual([ENROLMENT_SCOPE]);
    expect((await request(ctx.app).get("/api/auth/second-factor").set(bearer(token))).body).toMatchObject({ enrolled: false, required: true });
    for (const path of ["/api/patients", "/api/patients?limit=5", "/api/users", "/api/devices", "/api/audit"]) {
      const r = await request(ctx.app).get(path).set(bearer(token));
      expect(r.status, path).toBe(403);
      expect(r.body.error.code, path).toBe("second_factor_enrolment_required");
    }
    // The same for a researcher and an admin.
    for (const role of ["researcher", "admin"] as const) {
      const u = await ctx.seedUser({ role });
      const r = await login(u);
      expect(r.body.secondFactor).toBe("enrolment_required");
      expect((await request(ctx.app).get("/api/users").set(bearer(r.body.accessToken))).status).toBe(403);
    }
  });

  it("a refresh of the limited session stays limited until enrolment", async () => {
    const c = await ctx.seedUser({ role: "admin" });
    const res = await login(c);
    const r = await request(ctx.app).post("/api/auth/refresh").set("Cookie", cookieOf(res)!);
    expect(r.status).toBe(200);
    expect(r.body.secondFactor).toBe("enrolment_required");
    expect((await request(ctx.app).get("/api/users").set(bearer(r.body.accessToken))).status).toBe(403);
  });
});

describe("enrolment", () => {
  it("is active only after a first valid code; then gives 10 recovery codes once, a verified session, and stores the secret sealed and the codes hashed", async () => {
    const c = await ctx.seedUser({ role: "clinician" });
    const first = await login(c);
    const token = first.body.accessToken as string;
    const oldCookie = cookieOf(first)!;
    const start = await request(ctx.app).post("/api/auth/second-factor/enrolment").set(bearer(token));
    expect(start.status).toBe(200);
    const secret = start.body.secret as string;
    expect(secret).toMatch(/^[A-Z2-7]{32}$/);
    expect(start.body.otpauthUri).toContain(`secret=${secret}`);
    expect(start.body).toMatchObject({ issuer: "Pendula", accountLabel: c.email, digits: 6, periodS: 30 });

    // A wrong code, a malformed one: nothing becomes active.
    const wrong = await request(ctx.app)
      .post("/api/auth/second-factor/enrolment/confirm")
      .set(bearer(token))
      .send({ code: (await codeAt(secret, 5)) });
    expect(wrong.status).toBe(422);
    expect(wrong.body.error.code).toBe("invalid_code");
    expect((await request(ctx.app).post("/api/auth/second-factor/enrolment/confirm").set(bearer(token)).send({ code: "12ab56" })).status).toBe(400);
    expect((await request(ctx.app).get("/api/auth/second-factor").set(bearer(token))).body.enrolled).toBe(false);
    expect((await login(c)).body.secondFactor).toBe("enrolment_required");

    const ok = await request(ctx.app)
      .post("/api/auth/second-factor/enrolment/confirm")
      .set(bearer(token))
      .set("Cookie", oldCookie)
      .send({ code: await codeAt(secret) });
    expect(ok.status).toBe(200);
    const codes = ok.body.recoveryCodes as string[];
    expect(codes).toHaveLength(10);
    expect(ok.body.session.secondFactor).toBe("verified");
    const full = ok.body.session.accessToken as string;
    expect((await request(ctx.app).get("/api/patients").set(bearer(full))).status).toBe(200);
    expect(cookieOf(ok)).toBeDefined();

    const row = await ctx.db("user_totp").where({ user_id: c.id }).first();
    expect(row.confirmed_at).not.toBeNull();
    expect(row.secret_sealed).not.toContain(secret);
    const stored = (await ctx.db("recovery_codes").where({ user_id: c.id }).select("code_sha256")).map((r) => r.code_sha256 as string);
    expect(stored).toHaveLength(10);
    for (const code of codes) expect(stored.some((s) => s.includes(code.replace(/-/g, "")) || s === code)).toBe(false);
    // The secret is never returned again: status has no secret, a new enrolment is refused.
    const status = await request(ctx.app).get("/api/auth/second-factor").set(bearer(full));
    expect(status.body).toEqual({ enrolled: true, required: true, enrolledAt: expect.any(String), recoveryCodesLeft: 10 });
    const again = await request(ctx.app).post("/api/auth/second-factor/enrolment").set(bearer(full));
    expect(again.status).toBe(409);
    expect(JSON.stringify(again.body)).not.toContain(secret);
    // The limited session's cookie (sent with the confirmation) and its token are over.
    expect((await request(ctx.app).post("/api/auth/refresh").set("Cookie", oldCookie)).status).toBe(401);
    expect((await audits(c.id, "second_factor.enrolled"))).toHaveLength(1);
  });

  it("a limited session opened elsewhere before enrolment cannot refresh into a full one", async () => {
    const c = await ctx.seedUser({ role: "clinician" });
    const elsewhere = cookieOf(await login(c))!;
    const here = await login(c);
    await enrol(here.body.accessToken, cookieOf(here));
    const r = await request(ctx.app).post("/api/auth/refresh").set("Cookie", elsewhere);
    expect(r.status).toBe(401);
  });
});

describe("two-step sign-in", () => {
  it("password → challenge without a cookie → code → session; wrong and replayed codes are refused and audited", async () => {
    const c = await ctx.seedUser({ role: "clinician", secondFactor: true });
    const pw = await login(c);
    expect(pw.status).toBe(200);
    expect(pw.body).toEqual({ secondFactorRequired: true, challenge: expect.any(String), expiresIn: 300, methods: ["totp", "recovery_code"] });
    expect(pw.body).not.toHaveProperty("accessToken");
    expect(cookieOf(pw)).toBeUndefined();

    const wrong = await second(pw.body.challenge, "totp", await codeAt(c.totpSecret!, 3));
    expect(wrong.status).toBe(401);
    expect(wrong.body.error).toMatchObject({ code: "invalid_code", details: { attemptsLeft: CHALLENGE_MAX_FAILURES - 1 } });

    const code = await codeAt(c.totpSecret!);
    const ok = await second(pw.body.challenge, "totp", code);
    expect(ok.status).toBe(200);
    expect(ok.body.secondFactor).toBe("verified");
    expect(cookieOf(ok)).toBeDefined();
    expect((await request(ctx.app).get("/api/patients").set(bearer(ok.body.accessToken))).status).toBe(200);
    // The challenge works once.
    expect((await second(pw.body.challenge, "totp", await codeAt(c.totpSecret!, 1))).body.error.code).toBe("challenge_expired");

    // The same code through a new challenge is a replay.
    const pw2 = await login(c);
    const replay = await second(pw2.body.challenge, "totp", code);
    expect(replay.status).toBe(401);
    expect(replay.body.error.code).toBe("code_reused");
    // So is the previous step's code, which is older than the one used.
    expect((await second(pw2.body.challenge, "totp", await codeAt(c.totpSecret!, -1))).status).toBe(401);
    // The next step's code is new and inside the ±1 window.
    expect((await second(pw2.body.challenge, "totp", await codeAt(c.totpSecret!, 1))).status).toBe(200);

    const failed = (await audits(c.id, "auth.second_factor_failed")).map((e) => e.details.reason);
    expect(failed).toEqual(["wrong_code", "code_reused", "code_reused"]);
    const logins = (await audits(c.id, "auth.login")).map((e) => e.details.secondFactor);
    expect(logins).toEqual(["totp", "totp"]);
    expect(await audits(c.id, "auth.login_password_ok")).toHaveLength(2);
  });

  it("accepts the previous step's code (a phone a few seconds behind) and refuses one two steps old", async () => {
    const a = await ctx.seedUser({ role: "researcher", secondFactor: true });
    expect((await second((await login(a)).body.challenge, "totp", await codeAt(a.totpSecret!, -2))).status).toBe(401);
    expect((await second((await login(a)).body.challenge, "totp", await codeAt(a.totpSecret!, -1))).status).toBe(200);
  });

  it("a recovery code works once, in any case and spacing, and the count goes down", async () => {
    const c = await ctx.seedUser({ role: "clinician" });
    const { res } = await enrol((await login(c)).body.accessToken);
    const [code] = res.body.recoveryCodes as [string];
    const ok = await second((await login(c)).body.challenge, "recovery_code", code.toLowerCase().replace(/-/g, " "));
    expect(ok.status).toBe(200);
    expect((await request(ctx.app).get("/api/auth/second-factor").set(bearer(ok.body.accessToken))).body.recoveryCodesLeft).toBe(9);
    const again = await second((await login(c)).body.challenge, "recovery_code", code);
    expect(again.status).toBe(401);
    expect(again.body.error.code).toBe("invalid_code");
    expect((await audits(c.id, "auth.login")).at(-1).details).toEqual({ secondFactor: "recovery_code", recoveryCodesLeft: 9 });
  });

  it("a challenge dies after 5 wrong codes and after 5 minutes; the account refuses codes after 10 wrong ones in the window", async () => {
    const c = await ctx.seedUser({ role: "admin", secondFactor: true });
    const wrong = await codeAt(c.totpSecret!, 4);
    const ch = (await login(c)).body.challenge as string;
    for (let i = 0; i < CHALLENGE_MAX_FAILURES; i++) expect((await second(ch, "totp", wrong)).status).toBe(401);
    const dead = await second(ch, "totp", await codeAt(c.totpSecret!));
    expect(dead.status).toBe(401);
    expect(dead.body.error.code).toBe("challenge_expired");

    const old = (await login(c)).body.challenge as string;
    vi.useFakeTimers({ toFake: ["Date"], now: Date.now() + 301_000 });
    try {
      expect((await second(old, "totp", await codeAt(c.totpSecret!))).body.error.code).toBe("challenge_expired");
    } finally {
      vi.useRealTimers();
    }

    const ch2 = (await login(c)).body.challenge as string;
    for (let i = CHALLENGE_MAX_FAILURES; i < ACCOUNT_MAX_CODE_FAILURES; i++) expect((await second(ch2, "totp", wrong)).status).toBe(401);
    const ch3 = (await login(c)).body.challenge as string;
    const throttled = await second(ch3, "totp", await codeAt(c.totpSecret!));
    expect(throttled.status).toBe(429);
    expect(throttled.body.error.code).toBe("rate_limited");
    expect((await audits(c.id, "auth.second_factor_failed")).at(-1).details.reason).toBe("account_throttled");
  });

  it("refuses malformed second steps with 400 and an unknown challenge with 401", async () => {
    expect((await request(ctx.app).post("/api/auth/login/second-factor").send({ challenge: "x".repeat(43), method: "sms", code: "123456" })).status).toBe(400);
    expect((await request(ctx.app).post("/api/auth/login/second-factor").send({ challenge: "x".repeat(43), method: "totp", code: "12345" })).status).toBe(400);
    expect((await request(ctx.app).post("/api/auth/login/second-factor").send({ challenge: "x".repeat(43), method: "totp", code: "123456" })).status).toBe(401);
  });
});

describe("patients, recovery codes, removal", () => {
  it("a patient signs in fully without one, may add one, and may remove it with a current code", async () => {
    const p = await ctx.seedUser({ role: "patient" });
    const first = await login(p);
    expect(first.body.secondFactor).toBe("not_enrolled");
    expect((await request(ctx.app).get(`/api/patients/${p.patientId}`).set(bearer(first.body.accessToken))).status).toBe(200);
    const { secret, res } = await enrol(first.body.accessToken);
    const token = res.body.session.accessToken as string;
    expect((await login(p)).body.secondFactorRequired).toBe(true);
    expect((await request(ctx.app).post("/api/auth/second-factor/remove").set(bearer(token)).send({ code: await codeAt(secret, 4) })).status).toBe(422);
    expect((await request(ctx.app).post("/api/auth/second-factor/remove").set(bearer(token)).send({ code: await codeAt(secret, 1) })).status).toBe(204);
    expect(await ctx.db("recovery_codes").where({ user_id: p.id })).toHaveLength(0);
    expect((await login(p)).body.secondFactor).toBe("not_enrolled");
  });

  it("staff cannot remove their own; new recovery codes need a current code and retire the old ones", async () => {
    const c = await ctx.seedUser({ role: "clinician" });
    const { secret, res } = await enrol((await login(c)).body.accessToken);
    const token = res.body.session.accessToken as string;
    const old = res.body.recoveryCodes as string[];
    const remove = await request(ctx.app).post("/api/auth/second-factor/remove").set(bearer(token)).send({ code: await codeAt(secret, 1) });
    expect(remove.status).toBe(403);
    expect(remove.body.error.code).toBe("second_factor_required");
    expect((await request(ctx.app).post("/api/auth/second-factor/recovery-codes").set(bearer(token)).send({ code: await codeAt(secret, 4) })).status).toBe(422);
    const fresh = await request(ctx.app).post("/api/auth/second-factor/recovery-codes").set(bearer(token)).send({ code: await codeAt(secret, 1) });
    expect(fresh.status).toBe(200);
    expect(fresh.body.recoveryCodes).toHaveLength(10);
    expect(fresh.body.recoveryCodes).not.toContain(old[0]);
    expect((await second((await login(c)).body.challenge, "recovery_code", old[0]!)).status).toBe(401);
    expect((await second((await login(c)).body.challenge, "recovery_code", fresh.body.recoveryCodes[0])).status).toBe(200);
    expect(await audits(c.id, "second_factor.recovery_codes_regenerated")).toHaveLength(1);
  });
});

describe("administrator reset", () => {
  it("needs users:write and a reason; refuses one's own and unknown users; removes the factor and ends the sessions, audited with the reason", async () => {
    const admin = await ctx.seedUser({ role: "admin", secondFactor: true });
    const adminToken = await ctx.login(admin.email, admin.password);
    const target = await ctx.seedUser({ role: "clinician", secondFactor: true });
    const targetSession = await second((await login(target)).body.challenge, "totp", await codeAt(target.totpSecret!));
    expect(targetSession.status).toBe(200);
    const url = `/api/auth/second-factor/users/${target.id}/reset`;

    const clinicianToken = await ctx.tokenFor(await ctx.seedUser({ role: "clinician" }));
    expect((await request(ctx.app).post(url).set(bearer(clinicianToken)).send({ reason: "lost phone" })).status).toBe(403);
    expect((await request(ctx.app).post(url).set(bearer(adminToken)).send({ reason: "x" })).status).toBe(400);
    expect((await request(ctx.app).post(url).set(bearer(adminToken)).send({})).status).toBe(400);
    expect((await request(ctx.app).post(`/api/auth/second-factor/users/${admin.id}/reset`).set(bearer(adminToken)).send({ reason: "my phone broke" })).status).toBe(409);
    expect((await request(ctx.app).post("/api/auth/second-factor/users/00000000-0000-4000-8000-000000000000/reset").set(bearer(adminToken)).send({ reason: "lost phone" })).status).toBe(404);
    // Nothing changed by the refused calls.
    expect(await ctx.db("user_totp").where({ user_id: target.id })).toHaveLength(1);

    const ok = await request(ctx.app).post(url).set(bearer(adminToken)).send({ reason: "phone lost on the ward, identity checked in person" });
    expect(ok.status).toBe(200);
    expect(ok.body).toEqual({ userId: target.id, enrolled: false, endedSessions: 1 });
    expect((await request(ctx.app).get("/api/patients").set(bearer(targetSession.body.accessToken))).status).toBe(401);
    expect((await request(ctx.app).post("/api/auth/refresh").set("Cookie", cookieOf(targetSession)!)).status).toBe(401);
    const [event] = await audits(target.id, "second_factor.reset");
    expect(event.actor_id).toBe(admin.id);
    expect(event.details).toEqual({ reason: "phone lost on the ward, identity checked in person", endedSessions: 1 });
    const fresh = await login(target);
    expect(fresh.body.secondFactor).toBe("enrolment_required");
    // A second reset has nothing to remove: refused, and the new session is not ended.
    const again = await request(ctx.app).post(url).set(bearer(adminToken)).send({ reason: "double click on the reset form" });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe("not_enrolled");
    expect((await request(ctx.app).post("/api/auth/refresh").set("Cookie", cookieOf(fresh)!)).status).toBe(200);
    expect(await audits(target.id, "second_factor.reset")).toHaveLength(1);
  });
});

describe("access tokens already issued end with the session", () => {
  const linkToken = (text: string) => /reset-password\?token=([\w-]+)/.exec(text)?.[1];

  it("a password reset ends the access tokens issued before it, not the ones after", async () => {
    const c = await ctx.seedUser({ role: "clinician", secondFactor: true });
    const before = await ctx.login(c.email, c.password);
    expect((await request(ctx.app).get("/api/patients").set(bearer(before))).status).toBe(200);
    await request(ctx.app).post("/api/auth/password-reset/request").send({ email: c.email });
    const token = linkToken((await ctx.mailbox.waitFor((m) => m.to.includes(c.email) && m.subject.includes("Reset"))).text)!;
    expect((await request(ctx.app).post("/api/auth/password-reset/confirm").send({ token, password: "a-new-long-password" })).status).toBe(204);
    const gone = await request(ctx.app).get("/api/patients").set(bearer(before));
    expect(gone.status).toBe(401);
    expect(gone.body.error.code).toBe("invalid_token");
    // The reset does not remove the second factor: the new password still leads to a code.
    const after = await ctx.login(c.email, "a-new-long-password");
    expect((await request(ctx.app).get("/api/patients").set(bearer(after))).status).toBe(200);
  });

  it("refresh-token theft ends the owner's and the copier's access tokens", async () => {
    const p = await ctx.seedUser({ role: "patient" });
    const res = await login(p);
    const cookie = cookieOf(res)!;
    const owner = res.body.accessToken as string;
    const rotated = await request(ctx.app).post("/api/auth/refresh").set("Cookie", cookie);
    expect(rotated.status).toBe(200);
    expect((await request(ctx.app).get("/api/me").set(bearer(rotated.body.accessToken))).status).toBe(200);
    vi.useFakeTimers({ toFake: ["Date"], now: Date.now() + 60_000 });
    try {
      expect((await request(ctx.app).post("/api/auth/refresh").set("Cookie", cookie)).status).toBe(401);
    } finally {
      vi.useRealTimers();
    }
    expect((await request(ctx.app).get("/api/me").set(bearer(owner))).status).toBe(401);
    expect((await request(ctx.app).get("/api/me").set(bearer(rotated.body.accessToken))).status).toBe(401);
    // A new sign-in works.
    expect((await request(ctx.app).get("/api/me").set(bearer((await login(p)).body.accessToken))).status).toBe(200);
  });
});
