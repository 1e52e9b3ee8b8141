import type { Knex } from "knex";
import { consentEventCounts, type ConsentKind, type ConsentRecorderRole } from "../../research/consent-periods";

export interface ConsentEventRow {
  id: string;
  patient_id: string;
  kind: ConsentKind;
  recorded_by: string | null;
  recorder_role: ConsentRecorderRole;
  reason: string | null;
  counts: boolean;
  at: Date;
  recorder_name: string | null;
}

export async function consentEventsOf(db: Knex, patientId: string): Promise<ConsentEventRow[]> {
  return db("consent_events as e")
    .leftJoin("users as u", "u.id", "e.recorded_by")
    .where("e.patient_id", patientId)
    .orderBy([{ column: "e.at" }, { column: "e.seq" }])
    .select("e.id", "e.patient_id", "e.kind", "e.recorded_by", "e.recorder_role", "e.reason", "e.counts", "e.at", "u.display_name as recorder_name");
}

export interface NewConsentEvent {
  patientId: string;
  kind: ConsentKind;
  recorderRole: ConsentRecorderRole;
  recordedBy: string | null;
  reason?: string | null;
  /** Database clock when absent; only the demo seed and fixtures date an event. */
  at?: Date;
}

/** Inserts one event; whether it counts follows from kind and recorder (the database checks the same rule). */
export async function insertConsentEvent(db: Knex, e: NewConsentEvent): Promise<string> {
  const [row] = await db("consent_events")
    .insert({
      patient_id: e.patientId,
      kind: e.kind,
      recorded_by: e.recordedBy,
      recorder_role: e.recorderRole,
      reason: e.reason ?? null,
      counts: consentEventCounts(e.kind, e.recorderRole),
      ...(e.at ? { at: e.at } : {}),
    })
    .returning("id");
  return row.id as string;
}

/**
 * How many research-consent proposals the clinician recorded in the last 24 hours, after taking a
 * per-clinician advisory lock for the rest of the transaction, so parallel requests count one
 * after the other.
 */
export async function lockAndCountRecentProposals(trx: Knex, clinicianId: string): Promise<number> {
  await trx.raw("SELECT pg_advisory_xact_lock(hashtext(?))", [`consent-proposals:${clinicianId}`]);
  const row = await trx("consent_events")
    .where({ recorded_by: clinicianId, recorder_role: "clinician", kind: "given" })
    .andWhere("at", ">", trx.raw("now() - interval '24 hours'"))
    .count<{ n: string }[]>({ n: "*" });
  return Number(row[0]?.n ?? 0);
}

/** Serialises changes to one patient's consent until the transaction ends. */
export async function lockPatientConsent(trx: Knex, patientId: string): Promise<void> {
  await trx.raw("SELECT pg_advisory_xact_lock(hashtext(?))", [`consent:${patientId}`]);
}
