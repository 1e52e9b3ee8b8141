import { randomBytes } from "node:crypto";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import type { Express } from "express";
import type { Knex } from "knex";
import request from "supertest";
import { createTestDatabase } from "@pendula/db";
import { createApp, type CreateAppOptions } from "../app";
import { loadConfig, type Config } from "../config/env";
import type { AppDeps } from "../deps";
import type { Role } from "../contracts/enums";
import { signAccessToken } from "../auth/access-token";
import { hashPassword } from "../auth/passwords";
import { newRecoveryCodes, normalizeRecoveryCode, recoveryCodeDigest } from "../auth/recovery-codes";
import { scopesFor } from "../auth/scopes";
import { sealSecret } from "../auth/secret-box";
import { newTotpSecret, totpCode, totpStep, TOTP_PERIOD_S } from "../auth/totp";
import { S3_FAKE_CREDENTIALS, startS3Fake } from "../dev/s3-fake";
import { startSmtpFake, type SmtpFake } from "../dev/smtp-fake";
import { insertConsentEvent } from "../routes/consent/consent.repository";
import { createRuntime } from "../runtime";

export interface PatientSeed {
  displayName?: string;
  researchId?: string;
  birthYear?: number;
  sex?: "female" | "male" | "other" | "unknown";
  condition?: "incomplete_sci" | "stroke" | "parkinsons" | "other";
  enrolledOn?: string;
  /** Counting research consent from the enrolment day on (an admin record with a reason). */
  researchConsent?: boolean;
}

export interface SeedUserOptions {
  role: Role;
  email?: string;
  /** Default: a random password, returned in the result. */
  password?: string;
  displayName?: string;
  status?: "invited" | "active" | "disabled";
  /** Patient row overrides (role patient only; a patient row is always created for a patient). */
  patient?: PatientSeed;
  /** Clinician ids whose caseload the new patient joins (role patient only). */
  caseloadOf?: string[];
  /**
   * Give the account a confirmed authenticator (secret returned as `totpSecret`). Default: none, as
   * for a freshly invited account; a staff account then signs in limited to enrolment.
   */
  secondFactor?: boolean;
}

export interface SeededUser {
  id: string;
  email: string;
  password: string;
  role: Role;
  displayName: string;
  patientId: string | null;
  /** Base32 authenticator secret when seeded with `secondFactor: true`. */
  totpSecret?: string;
}

export interface TestContext {
  app: Express;
  db: Knex;
  deps: AppDeps;
  config: Config;
  /** The in-process SMTP fake: every message the mailer sent. */
  mailbox: SmtpFake;
  /** A patient record without a user account. */
  seedPatient(patient?: PatientSeed): Promise<string>;
  seedUser(options: SeedUserOptions): Promise<SeededUser>;
  addToCaseload(clinicianId: string, patientId: string): Promise<void>;
  /**
   * Signs in through the API the way a person does and returns the access token: the password,
   * then for an account with an authenticator a code from it (or, when this account's codes for
   * the current and next step were already spent by earlier calls, one of its recovery codes, as a
   * person would); a staff account without one enrols through the enrolment endpoints first.
   */
  login(email: string, password: string): Promise<string>;
  /** The authenticator secret the harness knows for an account (seeded or enrolled by login). */
  totpSecretOf(email: string): string | undefined;
  /** An access token for a seeded user without going through sign-in (no rate limit, no audit). */
  tokenFor(user: Pick<SeededUser, "id" | "role" | "patientId">): Promise<string>;
  close(): Promise<void>;
}

export interface TestContextOptions extends CreateAppOptions {
  /** Extra or replaced environment variables (strings, as in process.env). */
  env?: Record<string, string>;
}

let counter = 0;
const unique = () => `${Date.now().toString(36)}${(counter++).toString(36)}${randomBytes(2).toString("hex")}`;

/**
 * A whole server against real local services: a throwaway PostgreSQL database (cloned from the
 * migrated template), s3rver and the SMTP fake on free loopback ports, and the real adapters.
 * The pg-boss queue starts lazily, on the first send or work. Call close() in afterAll.
 */
export async function createTestContext(options: TestContextOptions = {}): Promise<TestContext> {
  const database = await createTestDatabase("srv");
  const dir = mkdtempSync(path.join(tmpdir(), "pendula-srv-"));
  const bucket = "pendula-test";
  const s3 = await startS3Fake({ directory: path.join(dir, "s3"), bucket });
  const mailbox = await startSmtpFake({ directory: path.join(dir, "mailbox") });
  const config = loadConfig({
    NODE_ENV: "test",
    // The harness runs the local fakes, which only demo mode accepts.
    PENDULA_MODE: "demo",
    DATABASE_URL: database.url,
    JWT_SECRET: randomBytes(32).toString("hex"),
    RESEARCH_HMAC_KEY: randomBytes(32).toString("hex"),
    BCRYPT_COST: "4",
    S3_ENDPOINT: s3.endpoint,
    S3_BUCKET: bucket,
    S3_ACCESS_KEY_ID: S3_FAKE_CREDENTIALS.accessKeyId,
    S3_SECRET_ACCESS_KEY: S3_FAKE_CREDENTIALS.secretAccessKey,
    SMTP_HOST: "127.0.0.1",
    SMTP_PORT: String(mailbox.port),
    DEV_MAILBOX_DIR: mailbox.directory,
    PUBLIC_URL: "http://127.0.0.1:8641",
    PORTAL_DIST: path.join(dir, "no-portal"),
    ...options.env,
  });
  const runtime = createRuntime(config, { application: "pendula-test" });
  const { deps } = runtime;
  const { db } = deps;
  const app = createApp(deps, options);

  const seedPatient = async (p: PatientSeed = {}): Promise<string> => {
    const [row] = await db("patients")
      .insert({
        display_name: p.displayName ?? `Test Patient ${unique()}`,
        research_id: p.researchId ?? `R-${unique()}`,
        birth_year: p.birthYear ?? 1968,
        sex: p.sex ?? "unknown",
        condition: p.condition ?? "incomplete_sci",
        enrolled_on: p.enrolledOn ?? "2026-01-05",
      })
      .returning("id");
    // Consent is a history (consent_events); a fixture's consent is an admin record dated at enrolment, which counts.
    if (p.researchConsent) {
      await insertConsentEvent(db, {
        patientId: row.id,
        kind: "given",
        recorderRole: "admin",
        recordedBy: null,
        reason: "consent form on file (test fixture)",
        at: new Date(`${p.enrolledOn ?? "2026-01-05"}T00:00:00Z`),
      });
    }
    return row.id as string;
  };

  const addToCaseload = async (clinicianId: string, patientId: string): Promise<void> => {
    await db("caseload").insert({ clinician_id: clinicianId, patient_id: patientId }).onConflict(["clinician_id", "patient_id"]).ignore();
  };

  const totpSecrets = new Map<string, string>();
  const lastStepUsed = new Map<string, number>();

  const seedUser = async (o: SeedUserOptions): Promise<SeededUser> => {
    const email = (o.email ?? `${o.role}-${unique()}@example.test`).toLowerCase();
    const password = o.password ?? `pw-${randomBytes(9).toString("base64url")}`;
    const displayName = o.displayName ?? `Test ${o.role} ${unique()}`;
    const patientId = o.role === "patient" ? await seedPatient({ displayName, ...o.patient }) : null;
    const status = o.status ?? "active";
    const [row] = await db("users")
      .insert({
        email,
        display_name: displayName,
        password_hash: status === "invited" ? null : await hashPassword(password, config.bcryptCost),
        role: o.role,
        status,
        patient_id: patientId,
      })
      .returning("id");
    if (patientId) for (const c of o.caseloadOf ?? []) await addToCaseload(c, patientId);
    let totpSecret: string | undefined;
    if (o.secondFactor) {
      totpSecret = newTotpSecret();
      await db("user_totp").insert({ user_id: row.id, secret_sealed: sealSecret(totpSecret, config), confirmed_at: db.fn.now() });
      totpSecrets.set(email, totpSecret);
    }
    return { id: row.id as string, email, password, role: o.role, displayName, patientId, ...(totpSecret ? { totpSecret } : {}) };
  };

  const expectOk = (what: string, res: request.Response, status = 200) => {
    if (res.status !== status) throw new Error(`${what} failed: ${res.status} ${JSON.stringify(res.body)}`);
  };

  /** A code the server has not seen yet: this step's or the next one's (both inside its ±1 window). */
  const freshCode = async (email: string): Promise<string | null> => {
    const secret = totpSecrets.get(email);
    if (!secret) return null;
    const now = Date.now();
    for (const ahead of [0, 1]) {
      const step = totpStep(now) + ahead;
      if (step > (lastStepUsed.get(email) ?? -1)) {
        lastStepUsed.set(email, step);
        return totpCode(secret, now + ahead * TOTP_PERIOD_S * 1000);
      }
    }
    return null;
  };

  /** A recovery code added to the account for this one sign-in (both TOTP codes of the window are spent). */
  const recoveryCodeFor = async (email: string): Promise<string> => {
    const [code] = newRecoveryCodes(1);
    const u = await db("users").whereRaw("lower(email) = lower(?)", [email]).first("id");
    await db("recovery_codes").insert({ user_id: u.id, code_sha256: recoveryCodeDigest(normalizeRecoveryCode(code!)!) });
    return code!;
  };

  const login = async (rawEmail: string, password: string): Promise<string> => {
    const email = rawEmail.toLowerCase();
    const res = await request(app).post("/api/auth/login").send({ email, password });
    expectOk(`login ${email}`, res);
    if (res.body.secondFactorRequired === true) {
      const code = await freshCode(email);
      const body = code
        ? { challenge: res.body.challenge, method: "totp", code }
        : { challenge: res.body.challenge, method: "recovery_code", code: await recoveryCodeFor(email) };
      const second = await request(app).post("/api/auth/login/second-factor").send(body);
      expectOk(`second factor for ${email}`, second);
      return second.body.accessToken as string;
    }
    if (res.body.secondFactor === "enrolment_required") {
      const auth = { Authorization: `Bearer ${res.body.accessToken as string}` };
      const start = await request(app).post("/api/auth/second-factor/enrolment").set(auth);
      expectOk(`enrolment of ${email}`, start);
      totpSecrets.set(email, start.body.secret as string);
      const confirm = await request(app)
        .post("/api/auth/second-factor/enrolment/confirm")
        .set(auth)
        .send({ code: await freshCode(email) });
      expectOk(`enrolment confirmation of ${email}`, confirm);
      return confirm.body.session.accessToken as string;
    }
    return res.body.accessToken as string;
  };

  const tokenFor = async (user: Pick<SeededUser, "id" | "role" | "patientId">) => {
    const row = await db("users").where({ id: user.id }).first("session_epoch");
    return signAccessToken(
      { userId: user.id, role: user.role, scopes: scopesFor(user.role), patientId: user.patientId, sessionEpoch: row?.session_epoch ?? 0 },
      config.jwtSecret,
      config.accessTokenTtlS,
    );
  };

  return {
    app,
    db,
    deps,
    config,
    mailbox,
    seedPatient,
    seedUser,
    addToCaseload,
    login,
    totpSecretOf: (email: string) => totpSecrets.get(email.toLowerCase()),
    tokenFor,
    async close() {
      await runtime.close();
      await Promise.allSettled([s3.close(), mailbox.close()]);
      await database.drop();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
