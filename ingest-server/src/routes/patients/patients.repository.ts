import type { Knex } from "knex";
import { auditEachRowOf, type AuditRowValues } from "../../audit/audit";
import { readSessionMetrics, type SessionMetrics } from "../../sessions/metric-rows";
import type { SessionRow } from "../../sessions/sessions.repository";

export interface PatientRow {
  id: string;
  display_name: string;
  research_id: string;
  birth_year: number;
  sex: "female" | "male" | "other" | "unknown";
  condition: "incomplete_sci" | "stroke" | "parkinsons" | "other";
  condition_detail: string | null;
  /** 'YYYY-MM-DD': DATE columns arrive as the stored day (db/src/connection.ts). */
  enrolled_on: string;
  research_consent: boolean;
  expected_uploads_per_week: number;
  height_cm: number | null;
}

export function findPatient(db: Knex, id: string): Promise<PatientRow | undefined> {
  return db<PatientRow>("patients").where({ id }).first();
}

/** Patients of a clinician's caseload, or all when `clinicianId` is null, optionally filtered by name. */
export function listPatients(db: Knex, clinicianId: string | null, q?: string): Promise<PatientRow[]> {
  const query = db<PatientRow>("patients as p").select("p.*").orderBy("p.display_name").limit(2000);
  if (clinicianId) query.join("caseload as c", "c.patient_id", "p.id").where("c.clinician_id", clinicianId);
  if (q) query.whereILike("p.display_name", `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`);
  return query;
}

/** Sets the clinician-edited fields; false when the patient does not exist. */
export async function updatePatientFields(db: Knex, id: string, fields: { height_cm?: number | null }): Promise<boolean> {
  const n = await db("patients").where({ id }).update(fields);
  return n > 0;
}

export interface SessionStats {
  patient_id: string;
  sessions_count: number;
  last_upload_at: Date | null;
  last_recorded_at: Date | null;
}

export async function sessionStats(db: Knex, patientIds: string[]): Promise<Map<string, SessionStats>> {
  if (patientIds.length === 0) return new Map();
  const rows: Array<{ patient_id: string; sessions_count: string; last_upload_at: Date | null; last_recorded_at: Date | null }> = await db(
    "walk_sessions",
  )
    .whereIn("patient_id", patientIds)
    .groupBy("patient_id")
    .select("patient_id", db.raw("count(*) AS sessions_count"), db.raw("max(created_at) AS last_upload_at"), db.raw("max(recorded_at) AS last_recorded_at"));
  return new Map(rows.map((r) => [r.patient_id, { ...r, sessions_count: Number(r.sessions_count) }]));
}

/** recorded_at of every session (since `since`, when given) that was not a failed upload, per patient (adherence input). */
export async function sessionDates(db: Knex, patientIds: string[], since?: Date): Promise<Map<string, string[]>> {
  const out = new Map<string, string[]>();
  if (patientIds.length === 0) return out;
  const q = db("walk_sessions").whereIn("patient_id", patientIds).whereNot("status", "failed").select("patient_id", "recorded_at");
  if (since) q.andWhere("recorded_at", ">=", since);
  const rows = await q;
  for (const r of rows) {
    const list = out.get(r.patient_id) ?? [];
    list.push(new Date(r.recorded_at).toISOString());
    out.set(r.patient_id, list);
  }
  return out;
}

/** Latest processed session per patient and its stored metrics of `keys`. */
export async function latestMetrics(db: Knex, patientIds: string[], keys: string[]): Promise<Map<string, { sessionId: string; metrics: SessionMetrics }>> {
  const out = new Map<string, { sessionId: string; metrics: SessionMetrics }>();
  if (patientIds.length === 0) return out;
  const latest: Array<{ patient_id: string; id: string }> = await db
    .select(db.raw("DISTINCT ON (patient_id) patient_id, id"))
    .from("walk_sessions")
    .whereIn("patient_id", patientIds)
    .andWhere({ status: "done" })
    .orderBy([{ column: "patient_id" }, { column: "recorded_at", order: "desc" }]);
  const metrics = await readSessionMetrics(db, latest.map((l) => l.id), keys);
  for (const l of latest) out.set(l.patient_id, { sessionId: l.id, metrics: metrics.get(l.id) ?? new Map() });
  return out;
}

export async function listSessions(db: Knex, patientId: string, limit: number, offset: number) {
  const [items, total] = await Promise.all([
    db<SessionRow>("walk_sessions").where({ patient_id: patientId }).orderBy("recorded_at", "desc").limit(limit).offset(offset),
    db("walk_sessions").where({ patient_id: patientId }).count<{ n: string }[]>({ n: "*" }),
  ]);
  return { items, total: Number(total[0]?.n ?? 0) };
}

export interface TrendReadContext {
  patient: Pick<PatientRow, "id" | "birth_year" | "condition" | "enrolled_on">;
  /** Changes whenever a session of the patient is processed, reprocessed or re-timed. */
  fingerprint: string;
}

/**
 * One statement for the hot path of the trend route: the caller's access (the patient must be in
 * `scope`), the patient's fields the annotations depend on, the processed-session fingerprint,
 * and the audit row, inserted only when access holds. A warm trend read is then one round trip
 * after authentication instead of four; undefined means not found or not allowed (same 404).
 */
export async function readTrendContext(
  db: Knex,
  patientId: string,
  scope: Knex.QueryBuilder | string[],
  audit: AuditRowValues,
): Promise<TrendReadContext | undefined> {
  const allowed = db("patients").where("id", patientId).whereIn("id", scope).select("id", "birth_year", "condition", "enrolled_on");
  const row = await db
    .with("allowed", allowed)
    .with("logged", auditEachRowOf(db, audit, "allowed", { resourceId: "id", patientId: "id" }))
    .from("allowed as a")
    .crossJoin(
      db.raw(
        `LATERAL (SELECT count(*)::int AS n, coalesce(max(s.updated_at), 'epoch')::text AS u, coalesce(max(s.processed_at), 'epoch')::text AS p
                  FROM walk_sessions s WHERE s.patient_id = a.id AND s.status = 'done') f`,
      ),
    )
    .first("a.id", "a.birth_year", "a.condition", "a.enrolled_on", "f.n", "f.u", "f.p");
  if (!row) return undefined;
  return { patient: { id: row.id, birth_year: row.birth_year, condition: row.condition, enrolled_on: row.enrolled_on }, fingerprint: `${row.n}|${row.u}|${row.p}` };
}
