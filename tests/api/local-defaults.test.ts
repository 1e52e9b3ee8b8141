import { randomBytes } from "node:crypto";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { createApp, listEndpoints } from "../../ingest-server/src/app";
import { loadConfig } from "../../ingest-server/src/config/env";
import { createTestContext, type SeededUser, type TestContext } from "../../ingest-server/src/testing/harness";
import { insertDoneSession } from "../../ingest-server/src/testing/session-fixtures";
import { childEnv, freePort, startTsx } from "./support/processes";

/**
 * The safe defaults of a start, asserted on the wire and on real processes: the Host allowlist
 * (DNS rebinding), `no-store` on every API answer, the development mailbox in demo mode only, a
 * production server that refuses to run beside demo accounts, and the warning for a reverse proxy
 * without TRUST_PROXY.
 */
let ctx: TestContext;
let admin: SeededUser;
let clinician: SeededUser;
let patient: SeededUser;
const tok: Record<string, string> = {};
let sessionId: string;

beforeAll(async () => {
  ctx = await createTestContext({ env: { ALLOWED_HOSTS: "intranet.clinic.example" } });
  admin = await ctx.seedUser({ role: "admin" });
  clinician = await ctx.seedUser({ role: "clinician" });
  patient = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id] });
  for (const u of [admin, clinician, patient]) tok[u.role] = await ctx.tokenFor(u);
  tok.researcher = await ctx.tokenFor(await ctx.seedUser({ role: "researcher" }));
  sessionId = await insertDoneSession(ctx, patient.patientId!, "2026-03-02T10:00:00Z", { cadenceStepsPerMin: 96 });
});
afterAll(() => ctx?.close());

const bearer = (t: string) => ({ Authorization: `Bearer ${t}` });

describe("Host allowlist", () => {
  it("answers for PUBLIC_URL's host, loopback and ALLOWED_HOSTS", async () => {
    for (const host of ["127.0.0.1:8641", "localhost:8641", "intranet.clinic.example", "INTRANET.clinic.example:443"]) {
      expect((await request(ctx.app).get("/api/health").set("Host", host)).status, host).toBe(200);
    }
  });

  it("refuses any other name with 421 before authentication, on the API and the portal alike", async () => {
    for (const path of ["/api/health", "/api/me", "/patients/1"]) {
      const res = await request(ctx.app).get(path).set("Host", "rebind.attacker.example:8641").set(bearer(tok.patient!));
      expect(res.status, path).toBe(421);
      expect(res.body.error.code).toBe("host_not_allowed");
    }
  });
});

describe("Cache-Control: no-store", () => {
  it("is on every GET answer of every API endpoint, whatever the caller and the status", async () => {
    const gets = listEndpoints(ctx.app).filter((e) => e.method === "get");
    expect(gets.length).toBeGreaterThan(10);
    const ids: Record<string, string> = { id: patient.patientId!, patientId: patient.patientId!, sessionId };
    for (const e of gets) {
      const path = e.path.replace(/:(\w+)/g, (_m, name: string) => ids[name] ?? randomBytes(4).toString("hex"));
      for (const who of ["clinician", "admin", "researcher", "patient"]) {
        const res = await request(ctx.app).get(path).set(bearer(tok[who]!));
        expect(res.headers["cache-control"], `${who} GET ${path} → ${res.status}`).toBe("no-store");
      }
    }
  });

  it("is on the trend and session answers with data, which keep their ETag", async () => {
    for (const path of [`/api/patients/${patient.patientId}/trends`, `/api/sessions/${sessionId}`]) {
      const res = await request(ctx.app).get(path).set(bearer(tok.clinician!));
      expect(res.status, path).toBe(200);
      expect(res.headers["cache-control"]).toBe("no-store");
      expect(res.headers.etag).toMatch(/^"/);
    }
  });
});

describe("development mailbox", () => {
  it("exists in demo mode for admins", async () => {
    expect(ctx.config.mode).toBe("demo");
    expect((await request(ctx.app).get("/api/dev/mailbox").set(bearer(tok.admin!))).status).toBe(200);
  });

  it("does not exist in production mode: 404, and no endpoint is listed", async () => {
    const production = loadConfig({
      PENDULA_MODE: "production",
      DATABASE_URL: ctx.config.databaseUrl,
      JWT_SECRET: ctx.config.jwtSecret,
      RESEARCH_HMAC_KEY: ctx.config.researchHmacKey,
      S3_ACCESS_KEY_ID: "production-key",
      S3_SECRET_ACCESS_KEY: "production-secret",
      PUBLIC_URL: "https://gait.clinic.example",
    });
    const app = createApp({ ...ctx.deps, config: production });
    expect(listEndpoints(app).some((e) => e.path.startsWith("/api/dev/"))).toBe(false);
    const res = await request(app).get("/api/dev/mailbox").set("Host", "gait.clinic.example").set(bearer(tok.admin!));
    expect(res.status).toBe(404);
  });
});

describe("reverse proxy without TRUST_PROXY", () => {
  it("logs one warning on the first forwarded request, and none before", async () => {
    const app = createApp(ctx.deps);
    const warn = vi.spyOn(console, "warn").mockImplementation(() => undefined);
    try {
      await request(app).get("/api/health");
      expect(warn).not.toHaveBeenCalled();
      await request(app).get("/api/health").set("X-Forwarded-For", "198.51.100.4");
      await request(app).get("/api/health").set("X-Forwarded-For", "198.51.100.5");
      expect(warn).toHaveBeenCalledTimes(1);
      expect(String(warn.mock.calls[0]![0])).toContain("TRUST_PROXY");
    } finally {
      warn.mockRestore();
    }
  });
});

describe("a production server process", () => {
  const productionEnv = (port: number) =>
    childEnv(ctx, {
      PENDULA_MODE: "production",
      PORT: String(port),
      PUBLIC_URL: "https://gait.clinic.example",
      S3_ACCESS_KEY_ID: "production-key",
      S3_SECRET_ACCESS_KEY: "production-secret",
      SMTP_HOST: "smtp.clinic.example",
    });

  it("refuses to start while a demo account exists, with one line and exit code 1; starts once it is gone", async () => {
    const demo = await ctx.seedUser({ role: "clinician", email: "clinician@demo.pendula.test" });
    const port = await freePort();
    const refused = startTsx("ingest-server/src/server.ts", productionEnv(port));
    const code = await new Promise<number | null>((resolve) => refused.proc.once("exit", (c) => resolve(c)));
    expect(code).toBe(1);
    expect(refused.output()).toMatch(/refusing a production start: 1 demo account\(s\)/);
    expect(refused.output()).not.toContain(`http://127.0.0.1:${port}`);

    await ctx.db("users").where({ id: demo.id }).delete();
    const server = startTsx("ingest-server/src/server.ts", productionEnv(port));
    try {
      await server.waitForLine(new RegExp(`^http://127\\.0\\.0\\.1:${port}$`));
      expect(server.output()).not.toContain("DEMO MODE");
      const health = await fetch(`http://127.0.0.1:${port}/api/health`);
      expect(health.status).toBe(200);
      const mailbox = await fetch(`http://127.0.0.1:${port}/api/dev/mailbox`, { headers: bearer(tok.admin!) });
      expect(mailbox.status).toBe(404);
    } finally {
      await server.kill("SIGTERM");
    }
  }, 120_000);
});
