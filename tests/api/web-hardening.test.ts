import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type SeededUser, type TestContext } from "../../ingest-server/src/testing/harness";
import { insertDoneSession, seedDevices, synthFor, upload } from "../../ingest-server/src/testing/session-fixtures";
import { REPO_ROOT } from "./support/processes";

/**
 * Browser-facing defences, asserted on the wire: the CSP and security headers (helmet), no CORS,
 * the refresh cookie's flags, body-size limits, rate limits on sign-in and uploads, SQL injection
 * strings in every text field of every write route and search parameter, and the research CSV
 * export escaping spreadsheet formulas (OWASP ASVS 4.0 requirement 1.2.10: CSV and formula injection).
 */
let ctx: TestContext;
let strict: TestContext;
let portalDir: string;
let admin: SeededUser;
let clinician: SeededUser;
let patient: SeededUser;
let researcher: SeededUser;
const tok: Record<string, string> = {};

beforeAll(async () => {
  // A stand-in portal build, so the HTML shell and its headers are served as in production.
  portalDir = mkdtempSync(path.join(tmpdir(), "pendula-portal-"));
  writeFileSync(path.join(portalDir, "index.html"), '<!doctype html><html><head><script type="module" src="/assets/app.js"></script></head><body></body></html>');
  ctx = await createTestContext({ env: { PORTAL_DIST: portalDir, LOGIN_RATE_LIMIT: "1000", UPLOAD_RATE_LIMIT: "1000" } });
  strict = await createTestContext({ env: { PUBLIC_URL: "https://gait.clinic.example", LOGIN_RATE_LIMIT: "3", UPLOAD_RATE_LIMIT: "2" } });
  admin = await ctx.seedUser({ role: "admin" });
  clinician = await ctx.seedUser({ role: "clinician" });
  patient = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id] });
  researcher = await ctx.seedUser({ role: "researcher" });
  for (const u of [admin, clinician, patient, researcher]) tok[u.role] = await ctx.tokenFor(u);
});

afterAll(async () => {
  await ctx?.close();
  await strict?.close();
  if (portalDir) rmSync(portalDir, { recursive: true, force: true });
});

function csp(res: request.Response): Map<string, string[]> {
  const header = String(res.headers["content-security-policy"] ?? "");
  return new Map(header.split(";").map((d) => d.trim()).filter(Boolean).map((d) => {
    const [name, ...values] = d.split(/\s+/);
    return [name!, values] as [string, string[]];
  }));
}

describe("security headers", () => {
  it("sends a strict CSP on API answers and on the portal shell: self only, no inline or eval script, no framing", async () => {
    for (const res of [
      await request(ctx.app).get("/api/health"),
      await request(ctx.app).get("/patients/123").set("Accept", "text/html"),
    ]) {
      expect(res.status).toBe(200);
      const d = csp(res);
      expect(d.get("default-src")).toEqual(["'self'"]);
      expect(d.get("script-src")).toEqual(["'self'"]);
      expect(d.get("style-src")).toEqual(["'self'"]);
      expect(d.get("font-src")).toEqual(["'self'"]);
      expect(d.get("object-src")).toEqual(["'none'"]);
      expect(d.get("frame-ancestors")).toEqual(["'none'"]);
      expect(d.get("base-uri")).toEqual(["'self'"]);
      const all = String(res.headers["content-security-policy"]);
      expect(all).not.toMatch(/unsafe-inline|unsafe-eval|https?:|\*/);
      expect(res.headers["x-content-type-options"]).toBe("nosniff");
      expect(res.headers["referrer-policy"]).toBe("no-referrer");
      expect(res.headers["x-frame-options"]).toBe("SAMEORIGIN");
      expect(res.headers["cross-origin-resource-policy"]).toBe("same-origin");
      expect(res.headers["x-powered-by"]).toBeUndefined();
    }
    const api = await request(ctx.app).get("/api/me").set("Authorization", `Bearer ${tok.patient}`);
    expect(api.headers["cache-control"]).toBe("no-store");
  });

  it("adds HSTS and upgrade-insecure-requests only when served over https", async () => {
    const plain = await request(ctx.app).get("/api/health");
    expect(plain.headers["strict-transport-security"]).toBeUndefined();
    const tls = await request(strict.app).get("/api/health");
    expect(tls.headers["strict-transport-security"]).toMatch(/max-age=31536000/);
    expect(csp(tls).has("upgrade-insecure-requests")).toBe(true);
  });

  it("the portal's HTML source has no inline script and loads no font or asset from another origin", () => {
    const html = readFileSync(path.join(REPO_ROOT, "portal", "index.html"), "utf8");
    for (const tag of html.match(/<script\b[^>]*>[\s\S]*?<\/script>/gi) ?? []) {
      expect(tag, "inline script").toMatch(/<script\b[^>]*\bsrc=/i);
      expect(tag.replace(/<script\b[^>]*>/i, "").replace(/<\/script>/i, "").trim()).toBe("");
    }
    expect(html).not.toMatch(/\son[a-z]+\s*=/i); // inline event handlers
    expect(html).not.toMatch(/(src|href)\s*=\s*["']?(https?:)?\/\//i);
  });
});

describe("CORS", () => {
  it("is closed: a foreign Origin gets no Access-Control-Allow-Origin, on requests and preflights", async () => {
    const evil = "https://attacker.example";
    const get = await request(ctx.app).get("/api/me").set("Origin", evil).set("Authorization", `Bearer ${tok.patient}`);
    expect(get.headers["access-control-allow-origin"]).toBeUndefined();
    expect(get.headers["access-control-allow-credentials"]).toBeUndefined();
    const pre = await request(ctx.app)
      .options("/api/auth/login")
      .set("Origin", evil)
      .set("Access-Control-Request-Method", "POST")
      .set("Access-Control-Request-Headers", "content-type,authorization");
    expect(pre.headers["access-control-allow-origin"]).toBeUndefined();
    expect(pre.headers["access-control-allow-methods"]).toBeUndefined();
    expect(pre.headers["access-control-allow-headers"]).toBeUndefined();
  });
});

describe("refresh cookie", () => {
  const refreshCookie = (res: request.Response) => ([] as string[]).concat(res.headers["set-cookie"] ?? []).find((c) => c.startsWith("pendula_refresh="));

  it("is HttpOnly, SameSite=Strict, scoped to /api/auth, and Secure when the public URL is https", async () => {
    const res = await request(ctx.app).post("/api/auth/login").send({ email: patient.email, password: patient.password });
    expect(res.status).toBe(200);
    const c = refreshCookie(res)!;
    expect(c).toMatch(/;\s*HttpOnly/i);
    expect(c).toMatch(/;\s*SameSite=Strict/i);
    expect(c).toMatch(/;\s*Path=\/api\/auth(;|$)/);
    expect(c).toMatch(/;\s*Expires=/);
    expect(c).not.toMatch(/;\s*Domain=/i);
    expect(JSON.stringify(res.body)).not.toContain(c.split(";")[0]!.split("=")[1]!);

    const u = await strict.seedUser({ role: "clinician" });
    const tls = await request(strict.app).post("/api/auth/login").send({ email: u.email, password: u.password });
    expect(refreshCookie(tls)).toMatch(/;\s*Secure/i);
  });
});

describe("request size limits", () => {
  it("answers oversize JSON with 413 payload_too_large before any route runs", async () => {
    const big = { email: "a@example.test", password: "x".repeat(200 * 1024) };
    const login = await request(ctx.app).post("/api/auth/login").send(big);
    expect(login.status).toBe(413);
    expect(login.body.error.code).toBe("payload_too_large");
    const note = await request(ctx.app)
      .post(`/api/patients/${patient.patientId}/notes`)
      .set("Authorization", `Bearer ${tok.clinician}`)
      .send({ body: "n".repeat(150 * 1024) });
    expect(note.status).toBe(413);
    const notes = await ctx.db("clinician_notes").where({ patient_id: patient.patientId }).count<{ n: string }[]>({ n: "*" });
    expect(Number(notes[0]?.n)).toBe(0);
  });

  it("answers malformed JSON with 400 malformed_json", async () => {
    const res = await request(ctx.app).post("/api/auth/login").set("Content-Type", "application/json").send('{"email": ');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("malformed_json");
  });
});

describe("rate limits", () => {
  it("sign-in: failed attempts beyond LOGIN_RATE_LIMIT per address and e-mail get 429, another account still signs in", async () => {
    const u = await strict.seedUser({ role: "clinician" });
    const statuses: number[] = [];
    for (let i = 0; i < 5; i++) statuses.push((await request(strict.app).post("/api/auth/login").send({ email: u.email, password: "wrong-password-1" })).status);
    expect(statuses).toEqual([401, 401, 401, 429, 429]);
    const blocked = await request(strict.app).post("/api/auth/login").send({ email: u.email, password: u.password });
    expect(blocked.status).toBe(429);
    expect(blocked.body.error.code).toBe("rate_limited");
    const other = await strict.seedUser({ role: "clinician" });
    expect((await request(strict.app).post("/api/auth/login").send({ email: other.email, password: other.password })).status).toBe(200);
  });

  it("uploads: beyond UPLOAD_RATE_LIMIT per user get 429 with a message and store nothing; another user is unaffected", async () => {
    const p1 = await strict.seedUser({ role: "patient" });
    const p2 = await strict.seedUser({ role: "patient" });
    const s1 = await seedDevices(strict, p1.patientId!, "RL1", { placements: ["left_shank"] });
    const s2 = await seedDevices(strict, p2.patientId!, "RL2", { placements: ["left_shank"] });
    const t1 = await strict.tokenFor(p1);
    const files = (serials: Record<string, string>, seed: number) =>
      synthFor(serials, { seed, durationS: 10, sampleRateHz: 60, placements: ["left_shank"] }).files;
    const a = await upload(strict, t1, files(s1, 1));
    const b = await upload(strict, t1, [{ fileName: "bad.csv", text: "" }]); // refused uploads count too
    const c = await upload(strict, t1, files(s1, 3));
    expect([a.status, b.status, c.status]).toEqual([202, 422, 429]);
    expect(c.body.error.code).toBe("rate_limited");
    expect(c.body.error.message).toMatch(/too many uploads/);
    const stored = await strict.db("walk_sessions").where({ patient_id: p1.patientId }).count<{ n: string }[]>({ n: "*" });
    expect(Number(stored[0]?.n)).toBe(1);
    expect((await upload(strict, await strict.tokenFor(p2), files(s2, 4))).status).toBe(202);
  });
});

const INJECTIONS = [
  "'; DROP TABLE users; --",
  '" OR 1=1 --',
  "$$",
  "$1",
  "' OR ''='",
  "1; SELECT pg_sleep(3); --",
  "%_\\",
  "Zoë ⚕ 🦶 ‮evil‬ 中文",
  "\u0000",
  "a\u0000b",
  "\ud800",
  "=cmd|' /C calc'!A0",
] as const;

describe("SQL injection strings in every text field", () => {
  interface Target {
    label: string;
    role: "admin" | "clinician" | "patient" | "researcher";
    method: "get" | "post" | "patch";
    url: (s: string) => string;
    body?: (s: string) => object;
  }
  let deviceId: string;
  let sessionId: string;

  beforeAll(async () => {
    const [d] = await ctx.db("devices").insert({ serial: "INJ-1", kind: "imu6", firmware: "1.0" }).returning("id");
    deviceId = d.id as string;
    sessionId = await insertDoneSession(ctx, patient.patientId!, "2026-02-02T09:00:00.000Z", { cadenceStepsPerMin: 100 });
  });

  // A lone surrogate cannot be percent-encoded; send the invalid UTF-8 bytes it stands for instead.
  const q = (s: string) => {
    try {
      return encodeURIComponent(s);
    } catch {
      return "%ED%A0%80";
    }
  };
  const targets: Target[] = [
    { label: "note body", role: "clinician", method: "post", url: () => `/api/patients/${patient.patientId}/notes`, body: (s) => ({ body: `note ${s}` }) },
    { label: "note sessionId", role: "clinician", method: "post", url: () => `/api/patients/${patient.patientId}/notes`, body: (s) => ({ body: "x", sessionId: s }) },
    {
      label: "training description",
      role: "clinician",
      method: "post",
      url: () => `/api/patients/${patient.patientId}/training`,
      body: (s) => ({ performedOn: "2026-02-03", kind: "balance", minutes: 15, description: `training ${s}` }),
    },
    { label: "training kind", role: "clinician", method: "post", url: () => `/api/patients/${patient.patientId}/training`, body: (s) => ({ performedOn: "2026-02-03", kind: s, minutes: 15 }) },
    { label: "training date", role: "clinician", method: "post", url: () => `/api/patients/${patient.patientId}/training`, body: (s) => ({ performedOn: s, kind: "balance", minutes: 15 }) },
    {
      label: "invitation display name and condition detail",
      role: "admin",
      method: "post",
      url: () => "/api/invitations",
      body: (s) => ({
        email: `inj-${Math.random().toString(36).slice(2)}@example.test`,
        displayName: `Invitee ${s}`,
        role: "patient",
        patient: { birthYear: 1960, sex: "male", condition: "parkinsons", conditionDetail: `detail ${s}`, enrolledOn: "2026-01-12" },
      }),
    },
    { label: "invitation e-mail", role: "admin", method: "post", url: () => "/api/invitations", body: (s) => ({ email: `${s}@example.test`, displayName: "X", role: "researcher" }) },
    { label: "device serial", role: "admin", method: "post", url: () => "/api/devices", body: (s) => ({ serial: s, kind: "imu6", firmware: "1.0" }) },
    {
      label: "device firmware and notes",
      role: "admin",
      method: "post",
      url: () => "/api/devices",
      body: (s) => ({ serial: `INJ-${Math.random().toString(36).slice(2, 8)}`, kind: "imu6", firmware: `fw ${s}`.slice(0, 40), notes: `notes ${s}` }),
    },
    { label: "device patch", role: "admin", method: "patch", url: () => `/api/devices/${deviceId}`, body: (s) => ({ firmware: `fw ${s}`.slice(0, 40), notes: `n ${s}` }) },
    { label: "user display name", role: "admin", method: "patch", url: () => `/api/users/${researcher.id}`, body: (s) => ({ displayName: `Researcher ${s}` }) },
    { label: "user search q", role: "admin", method: "get", url: (s) => `/api/users?q=${q(s)}` },
    { label: "user role filter", role: "admin", method: "get", url: (s) => `/api/users?role=${q(s)}` },
    { label: "patient search q (admin)", role: "admin", method: "get", url: (s) => `/api/patients?q=${q(s)}` },
    { label: "patient search q (clinician)", role: "clinician", method: "get", url: (s) => `/api/patients?q=${q(s)}` },
    { label: "audit action filter", role: "admin", method: "get", url: (s) => `/api/audit?action=${q(s)}` },
    { label: "audit date filter", role: "admin", method: "get", url: (s) => `/api/audit?from=${q(s)}` },
    { label: "device list filter", role: "admin", method: "get", url: (s) => `/api/devices?status=${q(s)}` },
    { label: "session signal placement", role: "patient", method: "get", url: (s) => `/api/sessions/${sessionId}/signal?placement=${q(s)}` },
    { label: "patient sessions paging", role: "patient", method: "get", url: (s) => `/api/patients/${patient.patientId}/sessions?limit=${q(s)}` },
    { label: "research query parameters", role: "researcher", method: "get", url: (s) => `/api/research/cohort-metrics?format=csv&conditions=${q(s)}&ageBands=${q(s)}&metrics=${q(s)}` },
    { label: "research cohort body", role: "researcher", method: "post", url: () => "/api/research/cohorts", body: (s) => ({ conditions: [s], ageBands: [s], metrics: [s] }) },
    { label: "sign-in e-mail and password", role: "patient", method: "post", url: () => "/api/auth/login", body: (s) => ({ email: s, password: s }) },
    { label: "password reset e-mail", role: "patient", method: "post", url: () => "/api/auth/password-reset/request", body: (s) => ({ email: `${s}@example.test` }) },
    { label: "invitation token", role: "patient", method: "post", url: () => "/api/auth/invitations/accept", body: (s) => ({ token: s, password: `${s}-long-enough` }) },
  ];

  it(`answers ${targets.length} fields × ${INJECTIONS.length} strings with 2xx/4xx, never 5xx, and leaves every table intact`, async () => {
    const tables = ["users", "patients", "devices", "device_assignments", "walk_sessions", "raw_files", "clinician_notes", "audit_events"];
    const count = async (t: string) => Number((await ctx.db(t).count<{ n: string }[]>({ n: "*" }))[0]?.n);
    const before = Object.fromEntries(await Promise.all(tables.map(async (t) => [t, await count(t)] as const)));
    const failures: string[] = [];
    let cases = 0;
    for (const t of targets) {
      for (const s of INJECTIONS) {
        cases++;
        let r = request(ctx.app)[t.method](t.url(s)).set("Authorization", `Bearer ${tok[t.role]}`);
        if (t.body) r = r.send(t.body(s));
        const res = await r;
        if (res.status >= 500) failures.push(`${t.label} with ${JSON.stringify(s)}: ${res.status} ${res.text.slice(0, 160)}`);
        else if (res.status >= 400 && !res.body?.error?.message) failures.push(`${t.label} with ${JSON.stringify(s)}: ${res.status} without a message`);
      }
    }
    console.log(`injection strings: ${cases} field × string cases`);
    expect(failures).toEqual([]);
    // Tables are still there and nothing was deleted (writes only add rows).
    for (const t of tables) expect(await count(t), t).toBeGreaterThanOrEqual(before[t]!);
    expect(await ctx.db("users").where({ id: admin.id }).first("id")).toBeTruthy();
  });

  it("refuses NUL characters and unpaired surrogates (PostgreSQL text and jsonb cannot hold them) with 400 invalid_text", async () => {
    for (const body of ["a\u0000b", "x\ud800y"]) {
      const res = await request(ctx.app).post(`/api/patients/${patient.patientId}/notes`).set("Authorization", `Bearer ${tok.clinician}`).send({ body });
      expect(res.status).toBe(400);
      expect(res.body.error).toMatchObject({ code: "invalid_text", details: { field: "body.body" } });
    }
    const search = await request(ctx.app).get("/api/patients?q=a%00b").set("Authorization", `Bearer ${tok.admin}`);
    expect(search.status).toBe(400);
    expect(search.body.error.details.field).toBe("query.q");
  });

  it("stores accepted text verbatim (bound as data, never interpreted) and reads it back unchanged", async () => {
    const text = "'; DROP TABLE users; -- \" OR 1=1 -- $$ Zoë 🦶";
    const res = await request(ctx.app).post(`/api/patients/${patient.patientId}/notes`).set("Authorization", `Bearer ${tok.clinician}`).send({ body: text });
    expect(res.status).toBe(201);
    const list = await request(ctx.app).get(`/api/patients/${patient.patientId}/notes`).set("Authorization", `Bearer ${tok.clinician}`);
    expect(list.body.items.map((n: { body: string }) => n.body)).toContain(text);
    const found = await request(ctx.app).get(`/api/users?q=${encodeURIComponent("%")}`).set("Authorization", `Bearer ${tok.admin}`);
    expect(found.status).toBe(200);
    // '%' is matched literally, not as a LIKE wildcard that lists everyone.
    expect(found.body.items.every((u: { email: string; displayName: string }) => `${u.email}${u.displayName}`.includes("%"))).toBe(true);
  });
});

describe("research CSV export through the API", () => {
  it("escapes text cells a spreadsheet would evaluate (a leading = + - @ gets a quote)", async () => {
    const formulas = ["=cmd|' /C calc'!A0", "@SUM(A1:A9)", "+1+1", "-2+3"];
    for (let i = 0; i < 6; i++) {
      const pid = await ctx.seedPatient({ birthYear: 1952, condition: "stroke", researchConsent: true, enrolledOn: "2026-01-05" });
      await insertDoneSession(ctx, pid, `2026-02-${String(2 + i).padStart(2, "0")}T09:00:00.000Z`, { cadenceStepsPerMin: 95 + i }, { algorithmVersion: formulas[i % formulas.length] });
    }
    // An export runs under one of the researcher's own projects.
    const project = await request(ctx.app).post("/api/research/projects").set("Authorization", `Bearer ${tok.researcher}`).send({ name: "Hardening study" });
    expect(project.status).toBe(201);
    const res = await request(ctx.app)
      .get(`/api/research/cohort-metrics?format=csv&conditions=stroke&projectId=${project.body.id}`)
      .set("Authorization", `Bearer ${tok.researcher}`);
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toMatch(/^text\/csv/);
    const lines = res.text.trim().split(/\r\n/);
    const header = lines[0]!.split(",");
    const col = header.indexOf("algorithm_version");
    expect(col).toBeGreaterThanOrEqual(0);
    expect(lines.length).toBeGreaterThan(5); // six subjects in one cell: not suppressed (k = 5)
    const cells = lines.slice(1).map((l) => {
      // RFC 4180: quoted cells may hold commas; unquote with the doubled-quote rule.
      const out: string[] = [];
      const re = /("(?:[^"]|"")*"|[^,]*)(,|$)/g;
      let m: RegExpExecArray | null;
      while ((m = re.exec(l)) && m[0] !== "") {
        out.push(m[1]!.startsWith('"') ? m[1]!.slice(1, -1).replace(/""/g, '"') : m[1]!);
        if (m[2] === "") break;
      }
      return out[col]!;
    });
    for (const c of cells) expect(c, c).not.toMatch(/^[=+\-@\t\r]/);
    expect(cells).toContain("'=cmd|' /C calc'!A0");
    expect(cells).toContain("'@SUM(A1:A9)");
  });
});
