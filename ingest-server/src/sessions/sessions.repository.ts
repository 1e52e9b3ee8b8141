import type { Knex } from "knex";
import { auditEachRowOf, type AuditRowValues } from "../audit/audit";
import type { WalkingAid } from "../contracts/enums";

export interface SessionRow {
  id: string;
  patient_id: string;
  recorded_at: Date;
  uploaded_by: string | null;
  status: "queued" | "processing" | "done" | "failed";
  progress_pct: number;
  attempts: number;
  algorithm_version: string | null;
  analysis: unknown;
  error: string | null;
  content_sha256: string;
  duration_s: number | null;
  created_at: Date;
  updated_at: Date;
  processed_at: Date | null;
  walking_aid: WalkingAid | null;
}

export interface RawFileRow {
  id: string;
  session_id: string;
  storage_key: string;
  sha256: string;
  size_bytes: string | number;
  original_name: string;
  format: "pendula-csv-v1" | "bids-motion";
  device_serial: string;
  device_id: string | null;
  placement: string;
  start_utc: Date;
  recording_placements: Record<string, string> | null;
}

export type NewRawFile = Omit<RawFileRow, "id" | "session_id">;

/** The device with this serial and, when one is active at `at`, its assignment (any patient). */
export async function findDeviceAt(
  db: Knex,
  serial: string,
  at: string,
): Promise<{ deviceId: string; assignment: { patientId: string; placement: string } | null } | null> {
  const device = await db("devices").where({ serial }).first("id");
  if (!device) return null;
  const assignment = await db("device_assignments")
    .where({ device_id: device.id })
    .andWhere("valid_from", "<=", at)
    .andWhere((q) => q.whereNull("valid_to").orWhere("valid_to", ">", at))
    .first("patient_id", "placement");
  return {
    deviceId: device.id as string,
    assignment: assignment ? { patientId: assignment.patient_id as string, placement: assignment.placement as string } : null,
  };
}

export type SessionHead = Omit<SessionRow, "analysis">;

/**
 * Every column but the stored analysis (hundreds of kilobytes of JSONB that only the session
 * answer sends, read apart by sessionAnalysis).
 */
const SESSION_HEAD_COLUMNS = [
  "id", "patient_id", "recorded_at", "uploaded_by", "status", "progress_pct", "attempts", "algorithm_version",
  "error", "content_sha256", "duration_s", "created_at", "updated_at", "processed_at", "walking_aid",
] as const satisfies ReadonlyArray<keyof SessionHead>;

export function findSessionByContent(db: Knex, patientId: string, contentSha256: string): Promise<SessionHead | undefined> {
  return db("walk_sessions").where({ patient_id: patientId, content_sha256: contentSha256 }).first(...SESSION_HEAD_COLUMNS);
}

export function findSession(db: Knex, id: string): Promise<SessionHead | undefined> {
  return db("walk_sessions").where({ id }).first(...SESSION_HEAD_COLUMNS);
}

/**
 * One statement for the hot path of the session route: the session without its stored analysis,
 * only when its patient is in `scope`, and the audit row of the read, inserted only then.
 * Undefined means not found or not allowed (the same 404).
 */
export async function readSessionHead(
  db: Knex,
  sessionId: string,
  scope: Knex.QueryBuilder | string[],
  audit: AuditRowValues,
): Promise<SessionHead | undefined> {
  const allowed = db("walk_sessions").where("id", sessionId).whereIn("patient_id", scope).select(...SESSION_HEAD_COLUMNS);
  return db
    .with("allowed", allowed)
    .with("logged", auditEachRowOf(db, audit, "allowed", { resourceId: "id", patientId: "patient_id" }))
    .from("allowed")
    .first<SessionHead | undefined>("*");
}

/** The stored analysis of a processed session (null before processing ends). */
export async function sessionAnalysis(db: Knex, sessionId: string): Promise<unknown> {
  const row = await db("walk_sessions").where({ id: sessionId }).first("analysis");
  return row?.analysis ?? null;
}

export function listRawFiles(db: Knex, sessionId: string): Promise<RawFileRow[]> {
  return db<RawFileRow>("raw_files").where({ session_id: sessionId }).orderBy("storage_key");
}

/** The session and its files in one transaction: either both exist or neither does. */
export async function insertSessionWithFiles(
  db: Knex,
  session: { id: string; patientId: string; recordedAt: string; uploadedBy: string; contentSha256: string },
  files: NewRawFile[],
): Promise<void> {
  await db.transaction(async (trx) => {
    await trx("walk_sessions").insert({
      id: session.id,
      patient_id: session.patientId,
      recorded_at: session.recordedAt,
      uploaded_by: session.uploadedBy,
      status: "queued",
      progress_pct: 0,
      content_sha256: session.contentSha256,
    });
    await trx("raw_files").insert(
      files.map((f) => ({
        ...f,
        session_id: session.id,
        recording_placements: f.recording_placements ? JSON.stringify(f.recording_placements) : null,
      })),
    );
  });
}

/** True for PostgreSQL's unique violation on (patient_id, content_sha256). */
export function isDuplicateContentError(err: unknown): boolean {
  const e = err as { code?: string; constraint?: string };
  return e?.code === "23505" && typeof e.constraint === "string" && e.constraint.includes("content_sha256");
}

/** Records the walking aid of a session; touching updated_at renews the session and trend answers. */
export async function setWalkingAid(db: Knex, id: string, walkingAid: WalkingAid | null): Promise<void> {
  await db("walk_sessions").where({ id }).update({ walking_aid: walkingAid, updated_at: db.fn.now() });
}

export async function markQueued(db: Knex, id: string): Promise<void> {
  await db("walk_sessions").where({ id }).update({ status: "queued", progress_pct: 0, error: null, updated_at: db.fn.now() });
}

export function listTraces(db: Knex, sessionId: string, placement?: string) {
  const q = db("session_traces")
    .where({ session_id: sessionId })
    .select("placement", "sample_rate_hz", "start_s", "sample_count", "samples")
    .orderBy("placement");
  if (placement) q.andWhere({ placement });
  return q as Promise<Array<{ placement: string; sample_rate_hz: number; start_s: number; sample_count: number; samples: Buffer }>>;
}
