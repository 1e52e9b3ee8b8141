import { generateKeyPair, SignJWT, exportSPKI } from "jose";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { TOKEN_AUDIENCE, TOKEN_ISSUER } from "../../../auth/access-token";
import { sha256Hex } from "../../../auth/opaque-token";
import { scopesFor } from "../../../auth/scopes";
import { REFRESH_REUSE_GRACE_S } from "../auth.service";
import { createTestContext, type SeededUser, type TestContext } from "../../../testing/harness";

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext({ env: { LOGIN_RATE_LIMIT: "5", LOGIN_RATE_WINDOW_S: "600" } });
});
afterAll(() => ctx?.close());

const refreshCookie = (res: request.Response): string | undefined => {
  const raw = res.headers["set-cookie"] as unknown as string[] | undefined;
  return raw?.find((c) => c.startsWith("pendula_refresh="));
};
const cookieValue = (cookie: string) => cookie.split(";")[0]!.slice("pendula_refresh=".length);

describe("POST /api/auth/login", () => {
  it("signs in every role and returns the contract shape with a strict refresh cookie", async () => {
    for (const role of ["patient", "clinician", "researcher", "admin"] as const) {
      const u = await ctx.seedUser({ role });
      const res = await request(ctx.app).post("/api/auth/login").send({ email: u.email.toUpperCase(), password: u.password });
      expect(res.status).toBe(200);
      expect(res.body.accessToken).toMatch(/^[\w-]+\.[\w-]+\.[\w-]+$/);
      expect(res.body.user.id).toBe(u.id);
      expect(res.body.user.role).toBe(role);
      if (role === "patient") expect(res.body.user.patientId).toBe(u.patientId);
      else expect(res.body.user).not.toHaveProperty("patientId");
      const cookie = refreshCookie(res)!;
      expect(cookie).toMatch(/HttpOnly/i);
      expect(cookie).toMatch(/SameSite=Strict/i);
      expect(cookie).toMatch(/Path=\/api\/auth/);
      expect(cookie).not.toMatch(/Secure/i); // PUBLIC_URL is http in tests
      // Only the digest of the refresh token is stored.
      const stored = await ctx.db("refresh_tokens").where({ user_id: u.id }).first();
      expect(stored.token_sha256).toBe(sha256Hex(cookieValue(cookie)));
    }
  });

  it("answers a wrong password, an unknown e-mail and a disabled account with the same 401", async () => {
    const u = await ctx.seedUser({ role: "clinician" });
    const off = await ctx.seedUser({ role: "clinician", status: "disabled" });
    const answers = await Promise.all([
      request(ctx.app).post("/api/auth/login").send({ email: u.email, password: "not-the-password" }),
      request(ctx.app).post("/api/auth/login").send({ email: "nobody@example.test", password: "whatever-123" }),
      request(ctx.app).post("/api/auth/login").send({ email: off.email, password: off.password }),
    ]);
    for (const res of answers) {
      expect(res.status).toBe(401);
      expect(res.body.error).toEqual({ code: "invalid_credentials", message: "e-mail or password is wrong" });
      expect(refreshCookie(res)).toBeUndefined();
    }
  });

  it("rejects a malformed body with 400", async () => {
    const res = await request(ctx.app).post("/api/auth/login").send({ email: "not-an-email" });
    expect(res.status).toBe(400);
    expect(res.body.error.details.properties).toHaveProperty("email");
    expect(res.body.error.details.properties).toHaveProperty("password");
  });

  it("writes audit events for a sign-in and a failed sign-in, with address and user agent", async () => {
    const u = await ctx.seedUser({ role: "admin" });
    await request(ctx.app).post("/api/auth/login").set("User-Agent", "ward-tablet/1.0").send({ email: u.email, password: "wrong-pass-1" });
    await request(ctx.app).post("/api/auth/login").set("User-Agent", "ward-tablet/1.0").send({ email: u.email, password: u.password });
    const events = await ctx.db("audit_events").where({ resource_id: u.id }).orderBy("id");
    expect(events.map((e) => e.action)).toEqual(["auth.login_failed", "auth.login"]);
    expect(events[0].details).toEqual({ reason: "wrong_password" });
    expect(events[1].actor_id).toBe(u.id);
    expect(events[1].user_agent).toBe("ward-tablet/1.0");
    expect(events[1].ip).toMatch(/127\.0\.0\.1/);
    const user = await ctx.db("users").where({ id: u.id }).first();
    expect(user.last_login_at).not.toBeNull();
  });

  it("rate-limits failed sign-ins per address and e-mail with 429, while other accounts still sign in", async () => {
    const target = await ctx.seedUser({ role: "clinician" });
    const statuses: number[] = [];
    for (let i = 0; i < 6; i++) {
      statuses.push((await request(ctx.app).post("/api/auth/login").send({ email: target.email, password: `guess-${i}` })).status);
    }
    expect(statuses).toEqual([401, 401, 401, 401, 401, 429]);
    // Even the right password is refused while the window lasts.
    const blocked = await request(ctx.app).post("/api/auth/login").send({ email: target.email, password: target.password });
    expect(blocked.status).toBe(429);
    expect(blocked.body.error.code).toBe("rate_limited");
    const other = await ctx.seedUser({ role: "clinician" });
    expect((await request(ctx.app).post("/api/auth/login").send({ email: other.email, password: other.password })).status).toBe(200);
  });
});

describe("access tokens", () => {
  let user: SeededUser;
  let good: string;
  beforeAll(async () => {
    user = await ctx.seedUser({ role: "admin" });
    good = await ctx.tokenFor(user);
  });
  const me = (token: string) => request(ctx.app).get("/api/me").set("Authorization", `Bearer ${token}`);
  const claims = () => ({ role: "admin", scopes: scopesFor("admin"), pid: null });
  const b64 = (o: object) => Buffer.from(JSON.stringify(o)).toString("base64url");

  it("accepts a valid token", async () => {
    expect((await me(good)).status).toBe(200);
  });

  it("rejects a missing or malformed Authorization header with 401", async () => {
    expect((await request(ctx.app).get("/api/me")).status).toBe(401);
    expect((await request(ctx.app).get("/api/me").set("Authorization", `Basic ${good}`)).status).toBe(401);
    expect((await request(ctx.app).get("/api/me").set("Authorization", "Bearer ")).status).toBe(401);
  });

  it("rejects a token whose payload was altered", async () => {
    const [h, , s] = good.split(".");
    const forged = `${h}.${b64({ ...claims(), sub: user.id, role: "admin", scopes: ["audit:read", "research:read"], iss: TOKEN_ISSUER, aud: TOKEN_AUDIENCE, jti: "x", iat: 1, exp: 4102444800 })}.${s}`;
    const res = await me(forged);
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe("invalid_token");
  });

  it("rejects alg none", async () => {
    const payload = { ...claims(), sub: user.id, iss: TOKEN_ISSUER, aud: TOKEN_AUDIENCE, jti: "n", iat: Math.floor(Date.now() / 1000), exp: Math.floor(Date.now() / 1000) + 600 };
    for (const alg of ["none", "None", "NONE"]) {
      expect((await me(`${b64({ alg, typ: "JWT" })}.${b64(payload)}.`)).status).toBe(401);
    }
  });

  it("rejects a token signed with the right secret but another HMAC algorithm", async () => {
    const key = new TextEncoder().encode(ctx.config.jwtSecret);
    for (const alg of ["HS384", "HS512"]) {
      const t = await new SignJWT(claims()).setProtectedHeader({ alg }).setSubject(user.id).setJti("a").setIssuer(TOKEN_ISSUER).setAudience(TOKEN_AUDIENCE).setIssuedAt().setExpirationTime("5m").sign(key);
      expect((await me(t)).status).toBe(401);
    }
  });

  it("rejects RS256 tokens, including HS256 signed with a public key as the secret (key confusion)", async () => {
    const { privateKey, publicKey } = await generateKeyPair("RS256");
    const rs = await new SignJWT(claims()).setProtectedHeader({ alg: "RS256" }).setSubject(user.id).setJti("r").setIssuer(TOKEN_ISSUER).setAudience(TOKEN_AUDIENCE).setIssuedAt().setExpirationTime("5m").sign(privateKey);
    expect((await me(rs)).status).toBe(401);
    const pem = new TextEncoder().encode(await exportSPKI(publicKey));
    const confused = await new SignJWT(claims()).setProtectedHeader({ alg: "HS256" }).setSubject(user.id).setJti("c").setIssuer(TOKEN_ISSUER).setAudience(TOKEN_AUDIENCE).setIssuedAt().setExpirationTime("5m").sign(pem);
    expect((await me(confused)).status).toBe(401);
  });

  it("rejects an expired token with token_expired", async () => {
    const key = new TextEncoder().encode(ctx.config.jwtSecret);
    const now = Math.floor(Date.now() / 1000);
    const t = await new SignJWT(claims()).setProtectedHeader({ alg: "HS256" }).setSubject(user.id).setJti("e").setIssuer(TOKEN_ISSUER).setAudience(TOKEN_AUDIENCE).setIssuedAt(now - 1000).setExpirationTime(now - 10).sign(key);
    const res = await me(t);
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe("token_expired");
  });

  it("rejects a token for another audience or issuer", async () => {
    const key = new TextEncoder().encode(ctx.config.jwtSecret);
    const t = await new SignJWT(claims()).setProtectedHeader({ alg: "HS256" }).setSubject(user.id).setJti("x").setIssuer("someone-else").setAudience(TOKEN_AUDIENCE).setIssuedAt().setExpirationTime("5m").sign(key);
    expect((await me(t)).status).toBe(401);
  });

  it("stops working as soon as the account is disabled or its role changes", async () => {
    const a = await ctx.seedUser({ role: "researcher" });
    const b = await ctx.seedUser({ role: "researcher" });
    const ta = await ctx.tokenFor(a);
    const tb = await ctx.tokenFor(b);
    await ctx.db("users").where({ id: a.id }).update({ status: "disabled" });
    await ctx.db("users").where({ id: b.id }).update({ role: "clinician" });
    expect((await me(ta)).status).toBe(401);
    expect((await me(tb)).status).toBe(401);
  });
});

describe("refresh and sign-out", () => {
  const signIn = async () => {
    const u = await ctx.seedUser({ role: "clinician" });
    const res = await request(ctx.app).post("/api/auth/login").send({ email: u.email, password: u.password });
    return { user: u, cookie: refreshCookie(res)!.split(";")[0]! };
  };

  it("rotates the refresh token: the new one works, the old one no longer does", async () => {
    const { user, cookie } = await signIn();
    const r1 = await request(ctx.app).post("/api/auth/refresh").set("Cookie", cookie);
    expect(r1.status).toBe(200);
    expect(r1.body.user.id).toBe(user.id);
    const next = refreshCookie(r1)!.split(";")[0]!;
    expect(next).not.toBe(cookie);
    expect((await request(ctx.app).get("/api/me").set("Authorization", `Bearer ${r1.body.accessToken}`)).status).toBe(200);
    expect((await request(ctx.app).post("/api/auth/refresh").set("Cookie", next)).status).toBe(200);
  });

  const refresh = (cookie: string) => request(ctx.app).post("/api/auth/refresh").set("Cookie", cookie);
  const liveSessions = async (userId: string) => (await ctx.db("refresh_tokens").where({ user_id: userId }).whereNull("revoked_at")).length;
  const theftEvents = (userId: string) => ctx.db("audit_events").where({ action: "auth.refresh_reuse", resource_id: userId }).orderBy("id");
  /** Runs `fn` with the server's clock moved `seconds` ahead (Date only: sockets and timers keep real time). */
  const later = async <T>(seconds: number, fn: () => Promise<T>): Promise<T> => {
    vi.useFakeTimers({ toFake: ["Date"], now: Date.now() + seconds * 1000 });
    try {
      return await fn();
    } finally {
      vi.useRealTimers();
    }
  };

  it("two tabs refreshing at once both stay signed in", async () => {
    const { user, cookie } = await signIn();
    const [tabA, tabB] = await Promise.all([refresh(cookie), refresh(cookie)]);
    expect([tabA.status, tabB.status]).toEqual([200, 200]);
    const cookies = [tabA, tabB].map((r) => refreshCookie(r)!.split(";")[0]!);
    expect(new Set([cookie, ...cookies]).size).toBe(3);
    for (const tab of [tabA, tabB]) {
      expect((await request(ctx.app).get("/api/me").set("Authorization", `Bearer ${tab.body.accessToken}`)).status).toBe(200);
    }
    // Whichever cookie the browser kept, the next refresh works.
    for (const c of cookies) expect((await refresh(c)).status).toBe(200);
    expect(await theftEvents(user.id)).toHaveLength(0);
  });

  it("a second tab presenting the token just replaced, one after the other, is signed in too", async () => {
    const { user, cookie } = await signIn();
    const first = await refresh(cookie);
    const second = await later(REFRESH_REUSE_GRACE_S - 2, () => refresh(cookie));
    expect(first.status).toBe(200);
    expect(second.status).toBe(200);
    expect(second.body.user.id).toBe(user.id);
    expect((await refresh(refreshCookie(first)!.split(";")[0]!)).status).toBe(200);
    expect((await refresh(refreshCookie(second)!.split(";")[0]!)).status).toBe(200);
    expect(await ctx.db("audit_events").where({ action: "auth.refresh_grace", resource_id: user.id })).toHaveLength(1);
    expect(await theftEvents(user.id)).toHaveLength(0);
  });

  it("a stolen refresh token replayed after the grace window still revokes every session", async () => {
    const { user, cookie } = await signIn();
    const other = await request(ctx.app).post("/api/auth/login").send({ email: user.email, password: user.password });
    const otherDevice = refreshCookie(other)!.split(";")[0]!;
    const r1 = await refresh(cookie);
    const current = refreshCookie(r1)!.split(";")[0]!;
    const replay = await later(REFRESH_REUSE_GRACE_S + 1, () => refresh(cookie));
    expect(replay.status).toBe(401);
    expect(replay.body.error.code).toBe("invalid_refresh");
    expect(refreshCookie(replay)).toMatch(/pendula_refresh=;/);
    expect((await refresh(current)).status).toBe(401);
    expect((await refresh(otherDevice)).status).toBe(401);
    expect(await liveSessions(user.id)).toBe(0);
    expect((await theftEvents(user.id).first()).details).toEqual({ revokedSessions: 2 });
  });

  it("a replaced refresh token replayed a second time inside the grace window revokes every session", async () => {
    const { user, cookie } = await signIn();
    const r1 = await refresh(cookie);
    const graced = await refresh(cookie);
    expect(graced.status).toBe(200);
    const again = await refresh(cookie);
    expect(again.status).toBe(401);
    expect(again.body.error.code).toBe("invalid_refresh");
    expect((await refresh(refreshCookie(r1)!.split(";")[0]!)).status).toBe(401);
    expect((await refresh(refreshCookie(graced)!.split(";")[0]!)).status).toBe(401);
    expect(await liveSessions(user.id)).toBe(0);
    // The second replay ended both sessions the first two presentations had opened.
    expect((await theftEvents(user.id).first()).details).toEqual({ revokedSessions: 2 });
  });

  it("a token replaced a moment before sign-out does not bring the signed-out session back", async () => {
    const { user, cookie } = await signIn();
    const r1 = await refresh(cookie);
    expect((await request(ctx.app).post("/api/auth/logout").set("Cookie", refreshCookie(r1)!.split(";")[0]!)).status).toBe(204);
    const replay = await refresh(cookie);
    expect(replay.status).toBe(401);
    expect(refreshCookie(replay)).toMatch(/pendula_refresh=;/);
    expect(await liveSessions(user.id)).toBe(0);
  });

  it("rejects a missing, unknown or expired refresh cookie with 401", async () => {
    expect((await request(ctx.app).post("/api/auth/refresh")).status).toBe(401);
    expect((await request(ctx.app).post("/api/auth/refresh").set("Cookie", "pendula_refresh=made-up")).status).toBe(401);
    const { user, cookie } = await signIn();
    await ctx.db("refresh_tokens").where({ user_id: user.id }).update({ expires_at: new Date(Date.now() - 1000) });
    expect((await request(ctx.app).post("/api/auth/refresh").set("Cookie", cookie)).status).toBe(401);
  });

  it("sign-out revokes the session and clears the cookie", async () => {
    const { user, cookie } = await signIn();
    const out = await request(ctx.app).post("/api/auth/logout").set("Cookie", cookie);
    expect(out.status).toBe(204);
    expect(refreshCookie(out)).toMatch(/pendula_refresh=;/);
    expect((await request(ctx.app).post("/api/auth/refresh").set("Cookie", cookie)).status).toBe(401);
    expect(await ctx.db("audit_events").where({ action: "auth.logout", resource_id: user.id }).first()).toBeTruthy();
    // Signing out twice, or without a cookie, is harmless.
    expect((await request(ctx.app).post("/api/auth/logout")).status).toBe(204);
  });

  it("sign-out also ends the access token presented with it, at once rather than at its expiry", async () => {
    const u = await ctx.seedUser({ role: "clinician" });
    const login = await request(ctx.app).post("/api/auth/login").send({ email: u.email, password: u.password });
    const bearer = { Authorization: `Bearer ${login.body.accessToken}` };
    expect((await request(ctx.app).get("/api/me").set(bearer)).status).toBe(200);
    const cookie = refreshCookie(login)!.split(";")[0]!;
    expect((await request(ctx.app).post("/api/auth/logout").set(bearer).set("Cookie", cookie)).status).toBe(204);
    const after = await request(ctx.app).get("/api/me").set(bearer);
    expect(after.status).toBe(401);
    expect(after.body.error.code).toBe("invalid_token");
    // A second sign-in gets a fresh token that works.
    const again = await request(ctx.app).post("/api/auth/login").send({ email: u.email, password: u.password });
    expect((await request(ctx.app).get("/api/me").set({ Authorization: `Bearer ${again.body.accessToken}` })).status).toBe(200);
  });
});

describe("password reset", () => {
  const linkToken = (text: string) => /reset-password\?token=([\w-]+)/.exec(text)?.[1];

  it("answers 202 with the same body whether or not the address has an account", async () => {
    const u = await ctx.seedUser({ role: "patient" });
    const known = await request(ctx.app).post("/api/auth/password-reset/request").send({ email: u.email });
    const unknown = await request(ctx.app).post("/api/auth/password-reset/request").send({ email: "no-one-here@example.test" });
    expect(known.status).toBe(202);
    expect(unknown.status).toBe(202);
    expect(known.body).toEqual(unknown.body);
    await ctx.mailbox.waitFor((m) => m.to.includes(u.email));
    await new Promise((r) => setTimeout(r, 150));
    expect(ctx.mailbox.messages().some((m) => m.to.includes("no-one-here@example.test"))).toBe(false);
  });

  it("sets a new password once, ends other sessions, and refuses the link afterwards", async () => {
    const u = await ctx.seedUser({ role: "clinician" });
    const session = await request(ctx.app).post("/api/auth/login").send({ email: u.email, password: u.password });
    const oldCookie = refreshCookie(session)!.split(";")[0]!;
    await request(ctx.app).post("/api/auth/password-reset/request").send({ email: u.email });
    const mail = await ctx.mailbox.waitFor((m) => m.to.includes(u.email) && m.subject.includes("Reset"));
    const token = linkToken(mail.text)!;
    expect(mail.text).toContain(`${ctx.config.publicUrl}/reset-password?token=`);
    expect(await ctx.db("password_resets").where({ token_sha256: sha256Hex(token) }).first()).toBeTruthy();

    const weak = await request(ctx.app).post("/api/auth/password-reset/confirm").send({ token, password: "short" });
    expect(weak.status).toBe(400);
    const ok = await request(ctx.app).post("/api/auth/password-reset/confirm").send({ token, password: "a-new-long-password" });
    expect(ok.status).toBe(204);
    expect((await request(ctx.app).post("/api/auth/password-reset/confirm").send({ token, password: "another-long-password" })).status).toBe(410);
    expect((await request(ctx.app).post("/api/auth/refresh").set("Cookie", oldCookie)).status).toBe(401);
    expect((await request(ctx.app).post("/api/auth/login").send({ email: u.email, password: u.password })).status).toBe(401);
    expect((await request(ctx.app).post("/api/auth/login").send({ email: u.email, password: "a-new-long-password" })).status).toBe(200);
  });

  it("a password reset ends every session, and a refresh token replaced a moment before does not revive one", async () => {
    const u = await ctx.seedUser({ role: "clinician" });
    const session = await request(ctx.app).post("/api/auth/login").send({ email: u.email, password: u.password });
    const replaced = refreshCookie(session)!.split(";")[0]!;
    const rotated = await request(ctx.app).post("/api/auth/refresh").set("Cookie", replaced);
    expect(rotated.status).toBe(200);
    await request(ctx.app).post("/api/auth/password-reset/request").send({ email: u.email });
    const token = linkToken((await ctx.mailbox.waitFor((m) => m.to.includes(u.email) && m.subject.includes("Reset"))).text)!;
    expect((await request(ctx.app).post("/api/auth/password-reset/confirm").send({ token, password: "a-new-long-password" })).status).toBe(204);
    expect((await request(ctx.app).post("/api/auth/refresh").set("Cookie", replaced)).status).toBe(401);
    expect((await request(ctx.app).post("/api/auth/refresh").set("Cookie", refreshCookie(rotated)!.split(";")[0]!)).status).toBe(401);
    expect(await ctx.db("refresh_tokens").where({ user_id: u.id }).whereNull("revoked_at")).toHaveLength(0);
  });

  it("refuses an expired reset link and a link replaced by a newer one", async () => {
    const u = await ctx.seedUser({ role: "researcher" });
    await request(ctx.app).post("/api/auth/password-reset/request").send({ email: u.email });
    const first = linkToken((await ctx.mailbox.waitFor((m) => m.to.includes(u.email))).text)!;
    ctx.mailbox.clear();
    await request(ctx.app).post("/api/auth/password-reset/request").send({ email: u.email });
    const second = linkToken((await ctx.mailbox.waitFor((m) => m.to.includes(u.email))).text)!;
    expect(second).not.toBe(first);
    expect((await request(ctx.app).post("/api/auth/password-reset/confirm").send({ token: first, password: "long-enough-pass" })).status).toBe(410);
    await ctx.db("password_resets").where({ token_sha256: sha256Hex(second) }).update({ expires_at: new Date(Date.now() - 1000) });
    const expired = await request(ctx.app).post("/api/auth/password-reset/confirm").send({ token: second, password: "long-enough-pass" });
    expect(expired.status).toBe(410);
    expect(expired.body.error.code).toBe("reset_expired");
    const bogus = await request(ctx.app).post("/api/auth/password-reset/confirm").send({ token: "x".repeat(43), password: "long-enough-pass" });
    expect(bogus.status).toBe(400);
  });
});
