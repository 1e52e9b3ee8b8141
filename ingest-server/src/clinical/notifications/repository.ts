/** Knex reads for the clinical e-mail jobs. Read-only: sending goes through the Mailer. */
import type { Knex } from "knex";
import type { AnnotateTrendsInput } from "../annotate-trends";
import { metricSeries } from "../../sessions/metric-rows";
import type { ClinicianRecipient, ReminderCandidate } from "./select-recipients";

export interface WeekRange {
  start: Date;
  end: Date;
}

/** Sessions that count as an upload: everything except a failed processing attempt. */
const COUNTED = ["queued", "processing", "done"];

export async function reminderCandidates(db: Knex, week: WeekRange): Promise<ReminderCandidate[]> {
  const rows = await db("users as u")
    .join("patients as p", "p.id", "u.patient_id")
    .leftJoin("walk_sessions as s", function () {
      this.on("s.patient_id", "=", "p.id")
        .andOn("s.recorded_at", ">=", db.raw("?", [week.start]))
        .andOn("s.recorded_at", "<", db.raw("?", [week.end]))
        .andOnIn("s.status", COUNTED);
    })
    .where("u.role", "patient")
    .groupBy("u.id", "u.email", "u.status", "p.expected_uploads_per_week")
    .select("u.id", "u.email", "u.status", "p.expected_uploads_per_week", db.raw("count(s.id)::int as sessions"));
  return rows.map((r) => ({
    userId: r.id as string,
    email: r.email as string,
    userStatus: r.status as string,
    expectedPerWeek: Number(r.expected_uploads_per_week),
    sessionsThisWeek: Number(r.sessions),
  }));
}

export async function cliniciansOf(db: Knex, patientId: string): Promise<ClinicianRecipient[]> {
  const rows = await db("caseload as c")
    .join("users as u", "u.id", "c.clinician_id")
    .where({ "c.patient_id": patientId, "u.role": "clinician" })
    .orderBy("u.id")
    .select("u.id", "u.email", "u.status");
  return rows.map((r) => ({ userId: r.id as string, email: r.email as string, userStatus: r.status as string }));
}

export async function activeClinicians(db: Knex): Promise<ClinicianRecipient[]> {
  const rows = await db("users").where({ role: "clinician", status: "active" }).orderBy("id").select("id", "email", "status");
  return rows.map((r) => ({ userId: r.id as string, email: r.email as string, userStatus: r.status as string }));
}

export async function caseloadPatientIds(db: Knex, clinicianId: string): Promise<string[]> {
  const rows = await db("caseload").where({ clinician_id: clinicianId }).orderBy("patient_id").select("patient_id");
  return rows.map((r) => r.patient_id as string);
}

export interface SessionRef {
  sessionId: string;
  patientId: string;
  recordedAt: string;
}

export async function sessionRef(db: Knex, sessionId: string): Promise<SessionRef | null> {
  const row = await db("walk_sessions").where({ id: sessionId }).first("id", "patient_id", "recorded_at");
  if (!row) return null;
  return { sessionId: row.id, patientId: row.patient_id, recordedAt: new Date(row.recorded_at).toISOString() };
}

export interface PatientTrendData {
  patient: AnnotateTrendsInput["patient"] & { expectedPerWeek: number };
  metrics: AnnotateTrendsInput["metrics"];
}

/**
 * A patient's stored metrics as annotateTrends input, optionally only up to `until` (inclusive), so
 * an alert for a reprocessed older session judges it against what came before it.
 */
export async function patientTrendData(
  db: Knex,
  patientId: string,
  until?: string | { sessionId: string },
): Promise<PatientTrendData | null> {
  const p = await db("patients").where({ id: patientId }).first("birth_year", "condition", "enrolled_on", "expected_uploads_per_week");
  if (!p) return null;
  const q = db("session_metrics as m")
    .join("walk_sessions as s", "s.id", "m.session_id")
    .where({ "m.patient_id": patientId, "s.status": "done" })
    .orderBy([{ column: "m.recorded_at" }, { column: "m.session_id" }])
    .select("m.session_id", "m.recorded_at", "m.metric_key", "m.value", "m.unit", "m.n", "s.walking_aid");
  // By session: compared in SQL, so microsecond timestamps are not cut to JavaScript milliseconds.
  if (typeof until === "string") q.andWhere("m.recorded_at", "<=", until);
  else if (until) q.andWhere("m.recorded_at", "<=", db("walk_sessions").where({ id: until.sessionId }).select("recorded_at"));
  return {
    patient: {
      birthYear: Number(p.birth_year),
      condition: p.condition as string,
      // 'YYYY-MM-DD' as stored: the pool reads DATE columns as text (db/src/connection.ts).
      enrolledOn: p.enrolled_on as string,
      expectedPerWeek: Number(p.expected_uploads_per_week),
    },
    // The trend page's series (sessions/metric-rows.ts), counts included, so an e-mail never flags what the page does not.
    metrics: metricSeries(await q),
  };
}

export async function sessionsInWeek(db: Knex, patientId: string, week: WeekRange): Promise<string[]> {
  const rows = await db("walk_sessions")
    .where({ patient_id: patientId })
    .whereIn("status", COUNTED)
    .andWhere("recorded_at", ">=", week.start)
    .andWhere("recorded_at", "<", week.end)
    .orderBy("recorded_at")
    .select("id");
  return rows.map((r) => r.id as string);
}
