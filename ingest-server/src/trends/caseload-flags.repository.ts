import type { Knex } from "knex";
import {
  CASELOAD_FLAG_KEYS,
  CASELOAD_FLAG_RULES_VERSION,
  latestSessionFlags,
  type CaseloadFlagInput,
} from "../clinical/caseload-flags";
import { metricSeries } from "../sessions/metric-rows";
import { trendFingerprints, trendRowsByPatient } from "./trend-rows.repository";

/**
 * Stored caseload flags (table `caseload_flags`): the flags of each patient's latest processed
 * session, written by the worker when a session is processed, so a caseload read does not run
 * every patient's series through the change rules.
 *
 * Every input of the rules is in the row's source fingerprint: the rules' version, the patient's
 * processed sessions (count, latest update, latest processing — a session processed, reprocessed,
 * sent back to the queue, deleted or re-timed moves one of them) and the patient's birth year,
 * condition and enrolment date. A read compares it with the current one and recomputes a row that
 * differs, so a writer that did not refresh the row (a reprocess request, an edit by hand, a rules
 * change) costs one recomputation on the next read, never a stale flag.
 */

export interface PatientFlagFields {
  id: string;
  birth_year: number;
  condition: string;
  enrolled_on: string;
}

export interface ComputedCaseloadFlags {
  flags: CaseloadFlagInput[];
  latestSessionId: string | null;
  fingerprint: string;
}

/** The fingerprint of a patient's flag inputs, from trendFingerprints' value and the patient's fields. */
export function flagSourceFingerprint(sessions: string, p: Omit<PatientFlagFields, "id">): string {
  return `${CASELOAD_FLAG_RULES_VERSION}|${sessions}|${p.birth_year}|${p.condition}|${p.enrolled_on}`;
}

/**
 * Computes the flags of `patientIds` from one snapshot (repeatable read), so each row's
 * fingerprint names exactly the data its flags came from, even while a worker writes.
 */
export async function computeCaseloadFlags(db: Knex, patientIds: readonly string[]): Promise<Map<string, ComputedCaseloadFlags>> {
  const out = new Map<string, ComputedCaseloadFlags>();
  if (patientIds.length === 0) return out;
  const ids = [...patientIds];
  await db.transaction(
    async (trx) => {
      // One connection, one query at a time.
      const patients: PatientFlagFields[] = await trx("patients").whereIn("id", ids).select("id", "birth_year", "condition", "enrolled_on");
      const fingerprints = await trendFingerprints(trx, ids);
      const rows = await trendRowsByPatient(trx, ids, [...CASELOAD_FLAG_KEYS]);
      for (const p of patients) {
        const { flags, latestSessionId } = latestSessionFlags(metricSeries(rows.get(p.id) ?? []), {
          birthYear: p.birth_year,
          condition: p.condition,
          enrolledOn: p.enrolled_on,
        });
        out.set(p.id, { flags, latestSessionId, fingerprint: flagSourceFingerprint(fingerprints.get(p.id)!, p) });
      }
    },
    { isolationLevel: "repeatable read", readOnly: true },
  );
  return out;
}

/**
 * Upserts computed rows, in patient order (two writers never lock each other's rows crosswise).
 * Several writers may race; each row is a consistent (flags, fingerprint) pair, and a row that
 * lost to older data is recomputed on the next read. A patient or session deleted since the
 * snapshot is skipped or unlinked rather than failing the write.
 */
export async function storeCaseloadFlags(db: Knex, computed: ReadonlyMap<string, ComputedCaseloadFlags>): Promise<void> {
  if (computed.size === 0) return;
  const rows = [...computed]
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
    .map(([patientId, c]) => ({ patient_id: patientId, flags: c.flags, latest_session_id: c.latestSessionId, source_fingerprint: c.fingerprint }));
  await db.raw(
    `INSERT INTO caseload_flags (patient_id, flags, latest_session_id, rules_version, source_fingerprint, computed_at)
     SELECT r.patient_id, r.flags,
            CASE WHEN EXISTS (SELECT 1 FROM walk_sessions s WHERE s.id = r.latest_session_id) THEN r.latest_session_id END,
            ?, r.source_fingerprint, now()
     FROM jsonb_to_recordset(?::jsonb) AS r(patient_id uuid, flags jsonb, latest_session_id uuid, source_fingerprint text)
     WHERE EXISTS (SELECT 1 FROM patients p WHERE p.id = r.patient_id)
     ON CONFLICT (patient_id) DO UPDATE SET flags = excluded.flags, latest_session_id = excluded.latest_session_id,
       rules_version = excluded.rules_version, source_fingerprint = excluded.source_fingerprint, computed_at = excluded.computed_at`,
    [CASELOAD_FLAG_RULES_VERSION, JSON.stringify(rows)],
  );
}

/** Recomputes and stores the flags of `patientIds` (the worker calls it after each processed session). */
export async function refreshCaseloadFlags(db: Knex, patientIds: readonly string[]): Promise<Map<string, ComputedCaseloadFlags>> {
  const computed = await computeCaseloadFlags(db, patientIds);
  await storeCaseloadFlags(db, computed);
  return computed;
}

/**
 * The caseload read: stored rows joined with the patients' current fingerprints; a missing or
 * stale row is recomputed (and stored) on the spot. `patients` carry the fields the fingerprint names.
 */
export async function readCaseloadFlags(db: Knex, patients: readonly PatientFlagFields[]): Promise<Map<string, CaseloadFlagInput[]>> {
  const out = new Map<string, CaseloadFlagInput[]>();
  if (patients.length === 0) return out;
  const ids = patients.map((p) => p.id);
  const [stored, fingerprints] = await Promise.all([
    db("caseload_flags").whereIn("patient_id", ids).select("patient_id", "flags", "source_fingerprint") as Promise<
      Array<{ patient_id: string; flags: CaseloadFlagInput[]; source_fingerprint: string }>
    >,
    trendFingerprints(db, ids),
  ]);
  const byId = new Map(stored.map((r) => [r.patient_id, r]));
  const stale: string[] = [];
  for (const p of patients) {
    const row = byId.get(p.id);
    if (row && row.source_fingerprint === flagSourceFingerprint(fingerprints.get(p.id)!, p)) out.set(p.id, row.flags);
    else stale.push(p.id);
  }
  if (stale.length > 0) for (const [id, c] of await refreshCaseloadFlags(db, stale)) out.set(id, c.flags);
  return out;
}

/**
 * Every patient whose stored row is missing or stale, recomputed in batches (the worker runs it on
 * start: after a rules change or on a database that never stored flags). Returns how many.
 */
export async function refreshStaleCaseloadFlags(db: Knex, batchSize = 100): Promise<number> {
  let refreshed = 0;
  let after = "00000000-0000-0000-0000-000000000000";
  for (;;) {
    const patients: PatientFlagFields[] = await db("patients").where("id", ">", after).orderBy("id").limit(batchSize).select("id", "birth_year", "condition", "enrolled_on");
    if (patients.length === 0) return refreshed;
    after = patients.at(-1)!.id;
    const ids = patients.map((p) => p.id);
    const [stored, fingerprints] = await Promise.all([
      db("caseload_flags").whereIn("patient_id", ids).select("patient_id", "source_fingerprint") as Promise<Array<{ patient_id: string; source_fingerprint: string }>>,
      trendFingerprints(db, ids),
    ]);
    const current = new Map(stored.map((r) => [r.patient_id, r.source_fingerprint]));
    const stale = patients.filter((p) => current.get(p.id) !== flagSourceFingerprint(fingerprints.get(p.id)!, p)).map((p) => p.id);
    if (stale.length > 0) await refreshCaseloadFlags(db, stale);
    refreshed += stale.length;
  }
}
