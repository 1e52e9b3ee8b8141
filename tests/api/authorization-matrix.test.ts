import { generateKeyPairSync, randomBytes, randomUUID } from "node:crypto";
import { SignJWT, base64url } from "jose";
import request from "supertest";
import type { Response } from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { listEndpoints } from "../../ingest-server/src/app";
import { TOKEN_AUDIENCE, TOKEN_ISSUER } from "../../ingest-server/src/auth/access-token";
import { scopesFor } from "../../ingest-server/src/auth/scopes";
import { createTestContext, type SeededUser, type TestContext } from "../../ingest-server/src/testing/harness";
import { attachFiles, insertDoneSession, seedDevices } from "../../ingest-server/src/testing/session-fixtures";
import { synthesizeSession } from "../../signal/src/synth";

/**
 * Every endpoint the app enumerates (listEndpoints) × every role × own/other resource. The table
 * below is keyed by "METHOD path"; an endpoint without a row fails the first test, so a new route
 * cannot ship without an explicit decision about who may call it.
 *
 * "own" = resources of side A (patient A, on clinician A's caseload); "other" = side B (patient B,
 * on clinician B's caseload). The acting patient is patient A, the acting clinician is clinician A.
 * Expected statuses follow the contract of the server issue: outside the scope → 403; a patient
 * outside the caller's reach → 404 (the same answer as for an id that does not exist).
 */

const ROLES = ["patient", "clinician", "researcher", "admin", "anonymous"] as const;
type Actor = (typeof ROLES)[number];
type Variant = "own" | "other";
type Statuses = Record<Actor, number>;

interface Req {
  method: "get" | "post" | "patch" | "put" | "delete";
  url: string;
  body?: object;
  files?: Array<{ fileName: string; text: string }>;
  fields?: Record<string, string>;
}

interface Rule {
  expect: Partial<Record<Variant, Statuses>>;
  build: (variant: Variant, actor: Actor) => Promise<Req>;
}

/** Statuses in the order patient, clinician, researcher, admin, anonymous. */
const S = (patient: number, clinician: number, researcher: number, admin: number, anonymous: number): Statuses => ({
  patient,
  clinician,
  researcher,
  admin,
  anonymous,
});
const ALL = (n: number) => S(n, n, n, n, n);
const ADMIN_ONLY = (ok: number) => S(403, 403, 403, ok, 401);

let ctx: TestContext;
let f: Fixture;

interface Side {
  clinician: SeededUser;
  patient: SeededUser;
  patientId: string;
  serial: string;
  deviceId: string;
  sessionId: string;
  reprocessSessionId: string;
  noteText: string;
  trainingText: string;
}

interface Fixture {
  A: Side;
  B: Side;
  researcher: SeededUser;
  admin: SeededUser;
  loginUser: SeededUser;
  /** A patient record without an account on clinician B's caseload, invited by an admin. */
  invitedC: { patientId: string; displayName: string; email: string };
  tokens: Record<Exclude<Actor, "anonymous">, string>;
}

const uniq = () => randomBytes(4).toString("hex");
let synthSeed = 500;

/** A small one-sensor session from the device of a side (unique content on every call). */
function sessionFiles(side: Side) {
  synthSeed += 1;
  return synthesizeSession({
    seed: synthSeed,
    durationS: 12,
    sampleRateHz: 60,
    placements: ["left_shank"],
    deviceSerials: { left_shank: side.serial },
    startUtc: `2026-03-${String(1 + (synthSeed % 27)).padStart(2, "0")}T10:${String(synthSeed % 60).padStart(2, "0")}:00.000Z`,
  }).files.map((x) => ({ fileName: x.fileName, text: x.text }));
}

/** A device with an open assignment on a fresh patient record (for the assignment write routes). */
async function freshAssignment(): Promise<{ deviceId: string; assignmentId: string; patientId: string }> {
  const patientId = await ctx.seedPatient({ displayName: `Assignment Holder ${uniq()}` });
  const [device] = await ctx.db("devices").insert({ serial: `MX-${uniq()}`, kind: "imu6", firmware: "1.0", status: "assigned" }).returning("id");
  const [a] = await ctx
    .db("device_assignments")
    .insert({ device_id: device.id, patient_id: patientId, placement: "left_shank", valid_from: "2026-01-01T00:00:00Z" })
    .returning("id");
  return { deviceId: device.id as string, assignmentId: a.id as string, patientId };
}

const side = (v: Variant) => (v === "own" ? f.A : f.B);

const RULES: Record<string, Rule> = {
  "GET /api/health": { expect: { own: ALL(200) }, build: async () => ({ method: "get", url: "/api/health" }) },
  "GET /api/openapi.json": { expect: { own: ALL(200) }, build: async () => ({ method: "get", url: "/api/openapi.json" }) },
  // Public sign-in routes ignore the bearer token; the body decides.
  "POST /api/auth/login": {
    expect: { own: ALL(200) },
    build: async () => ({ method: "post", url: "/api/auth/login", body: { email: f.loginUser.email, password: f.loginUser.password } }),
  },
  "POST /api/auth/refresh": { expect: { own: ALL(401) }, build: async () => ({ method: "post", url: "/api/auth/refresh" }) },
  "POST /api/auth/logout": { expect: { own: ALL(204) }, build: async () => ({ method: "post", url: "/api/auth/logout" }) },
  "POST /api/auth/invitations/accept": {
    expect: { own: ALL(400) },
    build: async () => ({ method: "post", url: "/api/auth/invitations/accept", body: { token: "x".repeat(43), password: "a-long-password-1" } }),
  },
  "POST /api/auth/password-reset/request": {
    expect: { own: ALL(202) },
    build: async () => ({ method: "post", url: "/api/auth/password-reset/request", body: { email: `nobody-${uniq()}@example.test` } }),
  },
  "POST /api/auth/password-reset/confirm": {
    expect: { own: ALL(400) },
    build: async () => ({ method: "post", url: "/api/auth/password-reset/confirm", body: { token: "y".repeat(43), password: "a-long-password-2" } }),
  },
  "GET /api/me": { expect: { own: S(200, 200, 200, 200, 401) }, build: async () => ({ method: "get", url: "/api/me" }) },
  // Second factor. The matrix's tokens belong to accounts without an authenticator: everyone may
  // read their standing and start an enrolment; a wrong first code is 422; codes of an account
  // without one are 409; staff may not remove theirs (403); only an admin resets someone else's.
  "POST /api/auth/login/second-factor": {
    expect: { own: ALL(401) },
    build: async () => ({ method: "post", url: "/api/auth/login/second-factor", body: { challenge: "z".repeat(43), method: "totp", code: "123456" } }),
  },
  "GET /api/auth/second-factor": { expect: { own: S(200, 200, 200, 200, 401) }, build: async () => ({ method: "get", url: "/api/auth/second-factor" }) },
  "POST /api/auth/second-factor/enrolment": {
    expect: { own: S(200, 200, 200, 200, 401) },
    build: async () => ({ method: "post", url: "/api/auth/second-factor/enrolment" }),
  },
  "POST /api/auth/second-factor/enrolment/confirm": {
    expect: { own: S(422, 422, 422, 422, 401) },
    build: async (_v, actor) => {
      if (actor !== "anonymous") {
        const start = await request(ctx.app).post("/api/auth/second-factor/enrolment").set("Authorization", `Bearer ${f.tokens[actor]}`);
        expect(start.status).toBe(200);
      }
      // 000000 is one of the 3 codes valid at a time out of 10^6 with probability 3·10^-6.
      return { method: "post", url: "/api/auth/second-factor/enrolment/confirm", body: { code: "000000" } };
    },
  },
  "POST /api/auth/second-factor/recovery-codes": {
    expect: { own: S(409, 409, 409, 409, 401) },
    build: async () => ({ method: "post", url: "/api/auth/second-factor/recovery-codes", body: { code: "123456" } }),
  },
  "POST /api/auth/second-factor/remove": {
    expect: { own: S(409, 403, 403, 403, 401) },
    build: async () => ({ method: "post", url: "/api/auth/second-factor/remove", body: { code: "123456" } }),
  },
  "POST /api/auth/second-factor/users/:id/reset": {
    expect: { own: ADMIN_ONLY(200) },
    build: async () => {
      const target = await ctx.seedUser({ role: "clinician", secondFactor: true });
      return { method: "post", url: `/api/auth/second-factor/users/${target.id}/reset`, body: { reason: "matrix: phone replaced" } };
    },
  },


  "GET /api/users": { expect: { own: ADMIN_ONLY(200) }, build: async () => ({ method: "get", url: "/api/users?limit=500" }) },
  "GET /api/users/:id": {
    expect: { own: ADMIN_ONLY(200) },
    build: async () => ({ method: "get", url: `/api/users/${f.loginUser.id}` }),
  },
  "PATCH /api/users/:id": {
    expect: { own: ADMIN_ONLY(200) },
    build: async () => {
      const u = await ctx.seedUser({ role: "researcher" });
      return { method: "patch", url: `/api/users/${u.id}`, body: { displayName: `Renamed ${uniq()}` } };
    },
  },
  "POST /api/users/:id/disable": {
    expect: { own: ADMIN_ONLY(200) },
    build: async () => {
      const u = await ctx.seedUser({ role: "researcher" });
      return { method: "post", url: `/api/users/${u.id}/disable` };
    },
  },
  // Clinicians invite patients (who join their caseload); for an existing patient record it must be
  // on their caseload ("other": a record on clinician B's caseload → 404).
  "POST /api/invitations": {
    expect: { own: S(403, 201, 403, 201, 401), other: S(403, 404, 403, 201, 401) },
    build: async (v) => {
      const email = `invitee-${uniq()}@example.test`;
      if (v === "own") {
        return {
          method: "post",
          url: "/api/invitations",
          body: {
            email,
            displayName: `Invitee ${uniq()}`,
            role: "patient",
            patient: { birthYear: 1970, sex: "female", condition: "stroke", enrolledOn: "2026-02-02" },
          },
        };
      }
      const patientId = await ctx.seedPatient({ displayName: `Record Without Account ${uniq()}` });
      await ctx.addToCaseload(f.B.clinician.id, patientId);
      return { method: "post", url: "/api/invitations", body: { email, displayName: `Invitee ${uniq()}`, role: "patient", patientId } };
    },
  },
  "GET /api/invitations": {
    expect: { own: S(403, 200, 403, 200, 401) },
    build: async () => ({ method: "get", url: "/api/invitations?state=all" }),
  },

  "GET /api/devices": { expect: { own: ADMIN_ONLY(200) }, build: async () => ({ method: "get", url: "/api/devices" }) },
  "POST /api/devices": {
    expect: { own: ADMIN_ONLY(201) },
    build: async () => ({ method: "post", url: "/api/devices", body: { serial: `NEW-${uniq()}`, kind: "imu6", firmware: "3.0.0" } }),
  },
  "GET /api/devices/:id": { expect: { own: ADMIN_ONLY(200) }, build: async () => ({ method: "get", url: `/api/devices/${f.A.deviceId}` }) },
  "PATCH /api/devices/:id": {
    expect: { own: ADMIN_ONLY(200) },
    build: async () => ({ method: "patch", url: `/api/devices/${f.A.deviceId}`, body: { firmware: "2.4.2" } }),
  },
  "GET /api/devices/:id/assignments": {
    expect: { own: ADMIN_ONLY(200) },
    build: async () => ({ method: "get", url: `/api/devices/${f.A.deviceId}/assignments` }),
  },
  "POST /api/devices/:id/assignments": {
    expect: { own: ADMIN_ONLY(201) },
    build: async () => {
      const patientId = await ctx.seedPatient({ displayName: `New Wearer ${uniq()}` });
      const [device] = await ctx.db("devices").insert({ serial: `MA-${uniq()}`, kind: "imu6", firmware: "1.0" }).returning("id");
      return {
        method: "post",
        url: `/api/devices/${device.id}/assignments`,
        body: { patientId, placement: "right_wrist", from: "2026-02-01T00:00:00Z" },
      };
    },
  },
  "PATCH /api/devices/:id/assignments/:assignmentId": {
    expect: { own: ADMIN_ONLY(200) },
    build: async () => {
      const a = await freshAssignment();
      return { method: "patch", url: `/api/devices/${a.deviceId}/assignments/${a.assignmentId}`, body: { to: "2026-06-01T00:00:00Z" } };
    },
  },
  "POST /api/devices/:id/assignments/:assignmentId/swap": {
    expect: { own: ADMIN_ONLY(201) },
    build: async () => {
      const a = await freshAssignment();
      return {
        method: "post",
        url: `/api/devices/${a.deviceId}/assignments/${a.assignmentId}/swap`,
        body: { placement: "right_shank", at: "2026-06-01T00:00:00Z" },
      };
    },
  },
  "GET /api/audit": { expect: { own: ADMIN_ONLY(200) }, build: async () => ({ method: "get", url: "/api/audit?limit=500" }) },
  "GET /api/dev/mailbox": { expect: { own: ADMIN_ONLY(200) }, build: async () => ({ method: "get", url: "/api/dev/mailbox" }) },

  // Caseload links: admins list, make and end them; a clinician lists their own (asking for another
  // clinician's is 403); a patient reads only their care team.
  "GET /api/caseload-links": {
    expect: { own: S(403, 200, 403, 200, 401), other: S(403, 403, 403, 200, 401) },
    build: async (v) => ({ method: "get", url: `/api/caseload-links?state=all&clinicianId=${side(v).clinician.id}` }),
  },
  "POST /api/caseload-links": {
    expect: { own: ADMIN_ONLY(201) },
    build: async () => {
      const patientId = await ctx.seedPatient({ displayName: `Linked Walker ${uniq()}` });
      return { method: "post", url: "/api/caseload-links", body: { clinicianId: f.A.clinician.id, patientId, reason: "matrix: covering a colleague" } };
    },
  },
  "DELETE /api/caseload-links/:id": {
    expect: { own: ADMIN_ONLY(200) },
    build: async () => {
      const patientId = await ctx.seedPatient({ displayName: `Unlinked Walker ${uniq()}` });
      await ctx.addToCaseload(f.A.clinician.id, patientId);
      const link = await ctx.db("caseload_links").where({ patient_id: patientId }).first("id");
      return { method: "delete", url: `/api/caseload-links/${link.id}`, body: { reason: "matrix: discharged" } };
    },
  },
  "GET /api/caseload-links/care-team": {
    expect: { own: S(200, 403, 403, 403, 401) },
    build: async () => ({ method: "get", url: "/api/caseload-links/care-team" }),
  },

  // A patient uploads for themself (a patientId of someone else is 404); a clinician for the caseload.
  "POST /api/sessions": {
    expect: { own: S(202, 202, 403, 403, 401), other: S(404, 404, 403, 403, 401) },
    build: async (v, actor) => {
      const s = side(v);
      const fields: Record<string, string> = actor === "patient" && v === "own" ? {} : { patientId: s.patientId };
      return { method: "post", url: "/api/sessions", files: sessionFiles(s), fields };
    },
  },
  "GET /api/sessions/:id": {
    expect: { own: S(200, 200, 403, 403, 401), other: S(404, 404, 403, 403, 401) },
    build: async (v) => ({ method: "get", url: `/api/sessions/${side(v).sessionId}` }),
  },
  "PATCH /api/sessions/:id": {
    expect: { own: S(403, 200, 403, 403, 401), other: S(403, 404, 403, 403, 401) },
    build: async (v) => ({ method: "patch", url: `/api/sessions/${side(v).sessionId}`, body: { walkingAid: "cane" } }),
  },
  "GET /api/sessions/:id/signal": {
    expect: { own: S(200, 200, 403, 403, 401), other: S(404, 404, 403, 403, 401) },
    build: async (v) => ({ method: "get", url: `/api/sessions/${side(v).sessionId}/signal` }),
  },
  "POST /api/sessions/:id/reprocess": {
    expect: { own: S(403, 202, 403, 202, 401), other: S(403, 404, 403, 202, 401) },
    build: async (v) => ({ method: "post", url: `/api/sessions/${side(v).reprocessSessionId}/reprocess` }),
  },

  "GET /api/patients": { expect: { own: S(403, 200, 403, 200, 401) }, build: async () => ({ method: "get", url: "/api/patients" }) },
  "PATCH /api/patients/:id": {
    expect: { own: S(403, 200, 403, 403, 401), other: S(403, 404, 403, 403, 401) },
    build: async (v) => ({ method: "patch", url: `/api/patients/${side(v).patientId}`, body: { heightCm: 171 } }),
  },
  "GET /api/patients/:id": {
    expect: { own: S(200, 200, 403, 200, 401), other: S(404, 404, 403, 200, 401) },
    build: async (v) => ({ method: "get", url: `/api/patients/${side(v).patientId}` }),
  },
  "GET /api/patients/:id/sessions": {
    expect: { own: S(200, 200, 403, 403, 401), other: S(404, 404, 403, 403, 401) },
    build: async (v) => ({ method: "get", url: `/api/patients/${side(v).patientId}/sessions` }),
  },
  "GET /api/patients/:id/trends": {
    expect: { own: S(200, 200, 403, 403, 401), other: S(404, 404, 403, 403, 401) },
    build: async (v) => ({ method: "get", url: `/api/patients/${side(v).patientId}/trends` }),
  },
  // Notes and the training log are the clinician's: patients, admins and researchers lack the scope.
  "GET /api/patients/:id/notes": {
    expect: { own: S(403, 200, 403, 403, 401), other: S(403, 404, 403, 403, 401) },
    build: async (v) => ({ method: "get", url: `/api/patients/${side(v).patientId}/notes` }),
  },
  "POST /api/patients/:id/notes": {
    expect: { own: S(403, 201, 403, 403, 401), other: S(403, 404, 403, 403, 401) },
    build: async (v) => ({ method: "post", url: `/api/patients/${side(v).patientId}/notes`, body: { body: `matrix note ${uniq()}` } }),
  },
  "GET /api/patients/:id/training": {
    expect: { own: S(403, 200, 403, 403, 401), other: S(403, 404, 403, 403, 401) },
    build: async (v) => ({ method: "get", url: `/api/patients/${side(v).patientId}/training` }),
  },
  "POST /api/patients/:id/training": {
    expect: { own: S(403, 201, 403, 403, 401), other: S(403, 404, 403, 403, 401) },
    build: async (v) => ({
      method: "post",
      url: `/api/patients/${side(v).patientId}/training`,
      body: { performedOn: "2026-02-03", kind: "treadmill", minutes: 30 },
    }),
  },
  "POST /api/research/cohorts": {
    expect: { own: S(403, 403, 200, 403, 401) },
    build: async () => ({ method: "post", url: "/api/research/cohorts", body: {} }),
  },
  "GET /api/research/cohort-metrics": {
    expect: { own: S(403, 403, 200, 403, 401) },
    build: async () => {
      // An export is made under one of the caller's own research projects.
      const [p] = await ctx.db("research_projects").insert({ name: `Matrix study ${uniq()}`, owner_id: f.researcher.id, key_salt: randomBytes(32) }).returning("id");
      return { method: "get", url: `/api/research/cohort-metrics?format=json&projectId=${p.id}` };
    },
  },
  // Research projects: researchers own theirs; an admin may list every project.
  "GET /api/research/projects": { expect: { own: S(403, 403, 200, 200, 401) }, build: async () => ({ method: "get", url: "/api/research/projects" }) },
  "POST /api/research/projects": {
    expect: { own: S(403, 403, 201, 403, 401) },
    build: async () => ({ method: "post", url: "/api/research/projects", body: { name: `Matrix project ${uniq()}` } }),
  },
  "GET /api/research/export-rules": { expect: { own: S(403, 403, 200, 403, 401) }, build: async () => ({ method: "get", url: "/api/research/export-rules" }) },
  // Research consent: the patient, their clinicians and admins read and record it; researchers never.
  "GET /api/consent/patients/:id": {
    expect: { own: S(200, 200, 403, 200, 401), other: S(404, 404, 403, 200, 401) },
    build: async (v) => ({ method: "get", url: `/api/consent/patients/${side(v).patientId}` }),
  },
  "POST /api/consent/patients/:id/events": {
    expect: { own: S(201, 201, 403, 201, 401), other: S(404, 404, 403, 201, 401) },
    build: async (v) => {
      // Whatever the earlier rows left, ask for a real change (a no-op is a 409).
      const pid = side(v).patientId;
      const inForce = (await ctx.db("patients").where({ id: pid }).first("research_consent")).research_consent as boolean;
      const last = await ctx.db("consent_events").where({ patient_id: pid }).orderBy("seq", "desc").first("counts", "kind");
      const kind = inForce || (last && !last.counts && last.kind === "given") ? "withdrawn" : "given";
      return { method: "post", url: `/api/consent/patients/${pid}/events`, body: { kind, reason: "matrix: recorded at the visit" } };
    },
  },
};

async function send(r: Req, token: string | undefined): Promise<Response> {
  let t = request(ctx.app)[r.method](r.url);
  if (token) t = t.set("Authorization", `Bearer ${token}`);
  if (r.files) {
    for (const [k, v] of Object.entries(r.fields ?? {})) t = t.field(k, v);
    return attachFiles(t, r.files);
  }
  return r.body ? t.send(r.body) : t;
}

/** Strings an actor must never see: identifiers of the other side (all of them for a researcher). */
function forbiddenFor(actor: Actor): string[] {
  const ids = (s: Side) => [s.patientId, s.patient.displayName, s.patient.email, s.serial, s.sessionId, s.reprocessSessionId, s.clinician.email];
  const texts = (s: Side) => [s.noteText, s.trainingText];
  const c = [f.invitedC.patientId, f.invitedC.displayName, f.invitedC.email];
  switch (actor) {
    case "patient":
    case "clinician":
      return [...ids(f.B), ...texts(f.B), ...c];
    case "researcher":
    case "anonymous":
      return [...ids(f.A), ...ids(f.B), ...texts(f.A), ...texts(f.B), ...c];
    case "admin":
      // Admins manage identities and devices but never read clinical free text.
      return [...texts(f.A), ...texts(f.B)];
  }
}

beforeAll(async () => {
  ctx = await createTestContext({ env: { LOGIN_RATE_LIMIT: "1000", UPLOAD_RATE_LIMIT: "1000" } });
  const admin = await ctx.seedUser({ role: "admin" });
  const researcher = await ctx.seedUser({ role: "researcher" });
  const loginUser = await ctx.seedUser({ role: "researcher" });
  const makeSide = async (label: string): Promise<Side> => {
    const clinician = await ctx.seedUser({ role: "clinician", displayName: `Clinician ${label} ${uniq()}` });
    const patient = await ctx.seedUser({
      role: "patient",
      displayName: `Walker ${label} ${uniq()}`,
      caseloadOf: [clinician.id],
      patient: { researchConsent: true },
    });
    const patientId = patient.patientId!;
    const serials = await seedDevices(ctx, patientId, `SN${label}${uniq()}`.toUpperCase(), { placements: ["left_shank"] });
    const serial = serials.left_shank!;
    const device = await ctx.db("devices").where({ serial }).first("id");
    const sessionId = await insertDoneSession(ctx, patientId, "2026-02-10T09:00:00.000Z", { cadenceStepsPerMin: 101, strideTimeCvPct: 3.1 });
    const reprocessSessionId = await insertDoneSession(ctx, patientId, "2026-02-17T09:00:00.000Z", { cadenceStepsPerMin: 99 });
    const ctoken = await ctx.tokenFor(clinician);
    const noteText = `note-secret-${label}-${uniq()}`;
    const trainingText = `training-secret-${label}-${uniq()}`;
    const n = await request(ctx.app).post(`/api/patients/${patientId}/notes`).set("Authorization", `Bearer ${ctoken}`).send({ body: noteText });
    expect(n.status).toBe(201);
    const t = await request(ctx.app)
      .post(`/api/patients/${patientId}/training`)
      .set("Authorization", `Bearer ${ctoken}`)
      .send({ performedOn: "2026-02-11", kind: "overground", minutes: 20, description: trainingText });
    expect(t.status).toBe(201);
    return { clinician, patient, patientId, serial, deviceId: device.id as string, sessionId, reprocessSessionId, noteText, trainingText };
  };
  const A = await makeSide("A");
  const B = await makeSide("B");
  // An admin invites a patient record on clinician B's caseload: clinician A's invitation list must not show it.
  const cName = `Invited Walker ${uniq()}`;
  const cEmail = `invited-c-${uniq()}@example.test`;
  const cPatient = await ctx.seedPatient({ displayName: cName });
  await ctx.addToCaseload(B.clinician.id, cPatient);
  const inv = await request(ctx.app)
    .post("/api/invitations")
    .set("Authorization", `Bearer ${await ctx.tokenFor(admin)}`)
    .send({ email: cEmail, displayName: cName, role: "patient", patientId: cPatient });
  expect(inv.status).toBe(201);
  f = {
    A,
    B,
    admin,
    researcher,
    loginUser,
    invitedC: { patientId: cPatient, displayName: cName, email: cEmail },
    tokens: {
      patient: await ctx.tokenFor(A.patient),
      clinician: await ctx.tokenFor(A.clinician),
      researcher: await ctx.tokenFor(researcher),
      admin: await ctx.tokenFor(admin),
    },
  };
});

afterAll(async () => {
  await ctx?.close();
});

function freshToken(actor: Exclude<(typeof ROLES)[number], "anonymous">): Promise<string> {
  const user = { patient: f.A.patient, clinician: f.A.clinician, researcher: f.researcher, admin: f.admin }[actor];
  return ctx.tokenFor(user);
}

describe("authorization matrix", () => {
  it("has an explicit rule for every endpoint the app enumerates, and no rule for a route that is gone", () => {
    const enumerated = listEndpoints(ctx.app).map((e) => `${e.method.toUpperCase()} ${e.path}`);
    expect(enumerated.length).toBeGreaterThan(30);
    const missing = enumerated.filter((k) => !(k in RULES));
    expect(missing, `endpoints without an authorization rule: ${missing.join(", ")}`).toEqual([]);
    const stale = Object.keys(RULES).filter((k) => !enumerated.includes(k));
    expect(stale, `rules for endpoints that no longer exist: ${stale.join(", ")}`).toEqual([]);
  });

  it("answers every endpoint × role × own/other with the expected status and no foreign data", async () => {
    const failures: string[] = [];
    let cases = 0;
    for (const e of listEndpoints(ctx.app)) {
      const key = `${e.method.toUpperCase()} ${e.path}`;
      const rule = RULES[key];
      if (!rule) continue; // reported by the test above
      for (const variant of ["own", "other"] as const) {
        const expected = rule.expect[variant];
        if (!expected) continue;
        for (const actor of ROLES) {
          cases++;
          const r = await rule.build(variant, actor);
          // Signing out revokes the token it is sent with, so it gets a token of its own.
          const token = actor === "anonymous" ? undefined : key === "POST /api/auth/logout" ? await freshToken(actor) : f.tokens[actor];
          const res = await send(r, token);
          const label = `${key} [${variant}] as ${actor}`;
          if (res.status !== expected[actor]) {
            failures.push(`${label}: expected ${expected[actor]}, got ${res.status} ${res.text.slice(0, 200)}`);
          }
          if (res.status >= 400 && !(res.body?.error?.code && res.body?.error?.message)) {
            failures.push(`${label}: error without {error: {code, message}}`);
          }
          const text = res.text ?? "";
          for (const secret of forbiddenFor(actor)) {
            if (text.includes(secret)) failures.push(`${label}: body contains foreign data "${secret}"`);
          }
        }
      }
    }
    console.log(`authorization matrix: ${cases} endpoint × role × resource cases`);
    expect(failures).toEqual([]);
    expect(cases).toBeGreaterThan(200);
  });

  it("answers a patient outside reach exactly like a patient that does not exist (ids cannot be probed)", async () => {
    const missing = randomUUID();
    for (const actor of ["patient", "clinician"] as const) {
      for (const suffix of ["", "/sessions", "/trends"]) {
        const other = await request(ctx.app).get(`/api/patients/${f.B.patientId}${suffix}`).set("Authorization", `Bearer ${f.tokens[actor]}`);
        const none = await request(ctx.app).get(`/api/patients/${missing}${suffix}`).set("Authorization", `Bearer ${f.tokens[actor]}`);
        expect(other.status).toBe(404);
        expect({ status: other.status, body: other.body }).toEqual({ status: none.status, body: none.body });
      }
      const otherSession = await request(ctx.app).get(`/api/sessions/${f.B.sessionId}`).set("Authorization", `Bearer ${f.tokens[actor]}`);
      const noSession = await request(ctx.app).get(`/api/sessions/${missing}`).set("Authorization", `Bearer ${f.tokens[actor]}`);
      expect(otherSession.status).toBe(404);
      expect(otherSession.body).toEqual(noSession.body);
    }
  });
});

describe("hostile access tokens on every protected endpoint", () => {
  const secretKey = () => new TextEncoder().encode(ctx.config.jwtSecret);
  const claimsOf = (u: SeededUser) => ({ role: u.role, scopes: scopesFor(u.role), pid: u.patientId });

  async function hostileTokens(): Promise<Record<string, string>> {
    const u = f.A.clinician;
    const good = await ctx.tokenFor(u);
    const [h, p, s] = good.split(".") as [string, string, string];
    const payload = JSON.parse(new TextDecoder().decode(base64url.decode(p))) as Record<string, unknown>;
    const enc = (o: object) => base64url.encode(JSON.stringify(o));
    // Privilege escalation by editing the payload: admin scopes, signature kept.
    const tampered = `${h}.${enc({ ...payload, role: "admin", scopes: scopesFor("admin") })}.${s}`;
    const unsigned = `${enc({ alg: "none", typ: "JWT" })}.${enc(payload)}.`;
    const base = () =>
      new SignJWT(claimsOf(u)).setSubject(u.id).setJti(randomUUID()).setIssuer(TOKEN_ISSUER).setAudience(TOKEN_AUDIENCE).setIssuedAt();
    const expired = await base()
      .setProtectedHeader({ alg: "HS256", typ: "JWT" })
      .setIssuedAt(Math.floor(Date.now() / 1000) - 7200)
      .setExpirationTime(Math.floor(Date.now() / 1000) - 3600)
      .sign(secretKey());
    const hs512 = await base().setProtectedHeader({ alg: "HS512", typ: "JWT" }).setExpirationTime("10m").sign(secretKey());
    const { privateKey, publicKey } = generateKeyPairSync("rsa", { modulusLength: 2048 });
    const rs256 = await base().setProtectedHeader({ alg: "RS256", typ: "JWT" }).setExpirationTime("10m").sign(privateKey);
    // HS/RS confusion: HS256 keyed with the (public) RSA key, as a verifier that trusts the header would accept.
    const pem = publicKey.export({ type: "spki", format: "pem" }).toString();
    const confused = await base().setProtectedHeader({ alg: "HS256", typ: "JWT" }).setExpirationTime("10m").sign(new TextEncoder().encode(pem));
    const otherSecret = await base()
      .setProtectedHeader({ alg: "HS256", typ: "JWT" })
      .setExpirationTime("10m")
      .sign(new TextEncoder().encode(randomBytes(32).toString("hex")));
    // Revoked: the account was disabled after the token was issued.
    const disabled = await ctx.seedUser({ role: "clinician" });
    const disabledToken = await ctx.tokenFor(disabled);
    await ctx.db("users").where({ id: disabled.id }).update({ status: "disabled" });
    // Revoked by a role change: a token minted as admin for a user who is now a researcher.
    const demoted = await ctx.seedUser({ role: "admin" });
    const demotedToken = await ctx.tokenFor(demoted);
    await ctx.db("users").where({ id: demoted.id }).update({ role: "researcher" });
    return {
      tampered,
      "alg none": unsigned,
      expired,
      "HS512 with the server secret": hs512,
      RS256: rs256,
      "HS256 keyed with an RSA public key": confused,
      "another secret": otherSecret,
      "disabled account": disabledToken,
      "role changed": demotedToken,
      garbage: "not.a.jwt",
    };
  }

  it("rejects tampered, unsigned, expired, wrong-algorithm and revoked tokens with 401 everywhere", async () => {
    const tokens = await hostileTokens();
    const protectedEndpoints = listEndpoints(ctx.app).filter((e) => e.access !== "public");
    expect(protectedEndpoints.length).toBeGreaterThan(25);
    const failures: string[] = [];
    let cases = 0;
    for (const e of protectedEndpoints) {
      // Concrete ids in the path; the token is refused before any of them is looked at.
      const url = e.path.replace(/:[A-Za-z]+/g, () => f.A.sessionId);
      for (const [name, token] of Object.entries(tokens)) {
        cases++;
        const res = await request(ctx.app)[e.method](url).set("Authorization", `Bearer ${token}`).send({});
        if (res.status !== 401) failures.push(`${e.method.toUpperCase()} ${e.path} with ${name}: ${res.status}`);
        else if (!String(res.body?.error?.code).match(/^(invalid_token|token_expired|unauthorized)$/)) {
          failures.push(`${e.method.toUpperCase()} ${e.path} with ${name}: code ${res.body?.error?.code}`);
        }
      }
    }
    console.log(`hostile tokens: ${cases} endpoint × token cases`);
    expect(failures).toEqual([]);
    expect(tokens.expired && (await request(ctx.app).get("/api/me").set("Authorization", `Bearer ${tokens.expired}`)).body.error.code).toBe(
      "token_expired",
    );
  });

  it("a refresh cookie stops working after sign-out (revoked), and the access token's account check still applies", async () => {
    const u = await ctx.seedUser({ role: "clinician" });
    const login = await request(ctx.app).post("/api/auth/login").send({ email: u.email, password: u.password });
    expect(login.status).toBe(200);
    const cookie = ([] as string[]).concat(login.headers["set-cookie"] ?? []).find((c) => c.startsWith("pendula_refresh="))!;
    const pair = cookie.split(";")[0]!;
    const out = await request(ctx.app).post("/api/auth/logout").set("Cookie", pair);
    expect(out.status).toBe(204);
    const again = await request(ctx.app).post("/api/auth/refresh").set("Cookie", pair);
    expect(again.status).toBe(401);
    expect(again.body.error.code).toBe("invalid_refresh");
  });
});
