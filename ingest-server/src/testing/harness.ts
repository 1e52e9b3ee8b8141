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
import { scopesFor } from "../auth/scopes";
import { S3_FAKE_CREDENTIALS, startS3Fake } from "../dev/s3-fake";
import { startSmtpFake, type SmtpFake } from "../dev/smtp-fake";
import { insertConsentEvent } from "../routes/consent/consent.service";
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
}

export interface SeededUser {
  id: string;
  email: string;
  password: string;
  role: Role;
  displayName: string;
  patientId: string | null;
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
  /** Signs in through POST /api/auth/login and returns the access token. */
  login(email: string, password: string): Promise<string>;
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
    return { id: row.id as string, email, password, role: o.role, displayName, patientId };
  };

  const login = async (email: string, password: string): Promise<string> => {
    const res = await request(app).post("/api/auth/login").send({ email, password });
    if (res.status !== 200) throw new Error(`login ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
    return res.body.accessToken as string;
  };

  const tokenFor = (user: Pick<SeededUser, "id" | "role" | "patientId">) =>
    signAccessToken(
      { userId: user.id, role: user.role, scopes: scopesFor(user.role), patientId: user.patientId },
      config.jwtSecret,
      config.accessTokenTtlS,
    );

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
    tokenFor,
    async close() {
      await runtime.close();
      await Promise.allSettled([s3.close(), mailbox.close()]);
      await database.drop();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
