import type { Knex } from "knex";
import type { CONDITIONS } from "../../contracts/enums";
import type { ConsentKind } from "../../research/consent-periods";

export interface ProjectRow {
  id: string;
  name: string;
  purpose: string | null;
  owner_id: string;
  owner_name: string;
  key_salt: Buffer;
  created_at: Date;
}

function projects(db: Knex) {
  return db("research_projects as r")
    .join("users as u", "u.id", "r.owner_id")
    .select("r.id", "r.name", "r.purpose", "r.owner_id", "u.display_name as owner_name", "r.key_salt", "r.created_at")
    .orderBy([{ column: "r.created_at", order: "desc" }, { column: "r.id" }]);
}

/** Newest first; only `ownerId`'s when given. */
export function listProjectRows(db: Knex, ownerId: string | null): Promise<ProjectRow[]> {
  const q = projects(db);
  if (ownerId) q.where("r.owner_id", ownerId);
  return q;
}

export async function findProject(db: Knex, id: string, ownerId?: string): Promise<ProjectRow | undefined> {
  const q = projects(db).where("r.id", id);
  if (ownerId) q.andWhere("r.owner_id", ownerId);
  return (await q.first()) as ProjectRow | undefined;
}

/** Names compare trimmed and case-insensitively, as the owner reads them. */
export async function ownerHasProjectNamed(db: Knex, ownerId: string, name: string): Promise<boolean> {
  return (await db("research_projects").where({ owner_id: ownerId }).whereRaw("lower(btrim(name)) = lower(?)", [name]).first("id")) !== undefined;
}

export async function insertProject(db: Knex, p: { name: string; purpose: string | null; owner_id: string; key_salt: Buffer }): Promise<string> {
  const [row] = await db("research_projects").insert(p).returning("id");
  return row.id as string;
}

/** A processed session of a patient who gave research consent at some point (whether it was in force then is decided in code). */
export interface CohortSourceRow {
  patient_id: string;
  session_id: string;
  condition: (typeof CONDITIONS)[number];
  birth_year: number;
  /** 'YYYY-MM-DD' (DATE columns arrive as the stored day). */
  enrolled_on: string;
  recorded_at: Date;
  algorithm_version: string | null;
}

/**
 * Processed sessions recorded before `cutoff` of patients with a counting "given" consent event,
 * optionally of some conditions only, ordered by patient, time and session.
 */
export function cohortSourceRows(db: Knex, cutoff: Date, conditions: readonly string[]): Promise<CohortSourceRow[]> {
  const q = db("walk_sessions as s")
    .join("patients as p", "p.id", "s.patient_id")
    .where("s.status", "done")
    .andWhere("s.recorded_at", "<", cutoff)
    .whereExists(db("consent_events as c").whereRaw("c.patient_id = p.id").andWhere("c.counts", true).andWhere("c.kind", "given"))
    .select("p.id as patient_id", "s.id as session_id", "p.condition", "p.birth_year", "p.enrolled_on", "s.recorded_at", "s.algorithm_version")
    .orderBy([{ column: "p.id" }, { column: "s.recorded_at" }, { column: "s.id" }]);
  if (conditions.length) q.whereIn("p.condition", [...conditions]);
  return q;
}

export interface CountingConsentEvent {
  patient_id: string;
  kind: ConsentKind;
  counts: boolean;
  at: Date;
}

/** The consent events that count, per patient, in the order they happened. */
export async function countingConsentEvents(db: Knex, patientIds: readonly string[]): Promise<Map<string, CountingConsentEvent[]>> {
  const out = new Map<string, CountingConsentEvent[]>();
  if (patientIds.length === 0) return out;
  const rows: CountingConsentEvent[] = await db("consent_events")
    .whereIn("patient_id", [...patientIds])
    .andWhere("counts", true)
    .orderBy([{ column: "patient_id" }, { column: "at" }, { column: "seq" }])
    .select("patient_id", "kind", "counts", "at");
  for (const e of rows) {
    let list = out.get(e.patient_id);
    if (!list) out.set(e.patient_id, (list = []));
    list.push(e);
  }
  return out;
}
