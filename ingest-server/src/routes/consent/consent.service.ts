import type { Request } from "express";
import type { Knex } from "knex";
import { audit } from "../../audit/audit";
import { assertPatientAccess } from "../../auth/patient-access";
import type { ConsentState, RecordConsentRequest } from "../../contracts/consent";
import type { AppDeps } from "../../deps";
import { HttpError } from "../../http-error";
import type { AuthContext } from "../../middleware/authenticate";
import { consentEventCounts, consentPeriods, type ConsentRecorderRole } from "../../research/consent-periods";
import { consentEventsOf, insertConsentEvent, lockAndCountRecentProposals, lockPatientConsent, type ConsentEventRow } from "./consent.repository";

/**
 * How many research-consent proposals ("given" recorded by a clinician, with an invitation or on
 * its own) one clinician may record in a rolling 24 hours. Proposals do not count as consent, but a
 * burst of them is the signature of padding a small research cell, so it is refused and audited.
 * The number is our choice (common practice), generous for a clinic day.
 */
export const CONSENT_PROPOSALS_PER_DAY = 5;
const MIN_STAFF_REASON = 10;

function toConsentState(patientId: string, rows: readonly ConsentEventRow[]): ConsentState {
  const events = rows.map((r) => ({ ...r, at: new Date(r.at) }));
  const periods = consentPeriods(events);
  const last = periods.at(-1);
  const inForce = Boolean(last && last.to === null);
  const lastCounting = [...events].reverse().find((e) => e.counts);
  const lastProposal = [...events].reverse().find((e) => !e.counts && e.kind === "given");
  const awaitingConfirmation = !inForce && Boolean(lastProposal) && (!lastCounting || lastCounting.at.getTime() <= lastProposal!.at.getTime());
  return {
    patientId,
    inForce,
    since: inForce && last ? last.from.toISOString() : null,
    awaitingConfirmation,
    events: [...events].reverse().map((e) => ({
      id: e.id,
      kind: e.kind,
      at: e.at.toISOString(),
      recorderRole: e.recorder_role,
      recordedBy: e.recorded_by ? { id: e.recorded_by, displayName: e.recorder_name ?? "" } : null,
      reason: e.reason,
      counts: e.counts,
    })),
  };
}

/**
 * Refuses a clinician's proposal beyond CONSENT_PROPOSALS_PER_DAY (429) and audits the refusal
 * outside the transaction, so it survives the rollback. Serialised per clinician by an advisory
 * lock, so parallel requests cannot all slip under the limit.
 */
async function assertProposalQuota(auditDb: Knex, trx: Knex, req: Request, clinicianId: string): Promise<void> {
  const n = await lockAndCountRecentProposals(trx, clinicianId);
  if (n >= CONSENT_PROPOSALS_PER_DAY) {
    await audit(auditDb, req, { action: "consent.proposal_rate_limited", resourceType: "consent", details: { proposalsLast24h: n, limit: CONSENT_PROPOSALS_PER_DAY } });
    throw new HttpError(
      429,
      "consent_rate_limited",
      `at most ${CONSENT_PROPOSALS_PER_DAY} research-consent proposals per clinician in 24 hours; ask an admin, or let the patient record consent in the portal`,
      { limit: CONSENT_PROPOSALS_PER_DAY },
    );
  }
}

export async function getConsent(deps: AppDeps, req: Request, auth: AuthContext, patientId: string): Promise<ConsentState> {
  await assertPatientAccess(deps.db, auth, patientId, "identity");
  const state = toConsentState(patientId, await consentEventsOf(deps.db, patientId));
  await audit(deps.db, req, { action: "consent.read", resourceType: "consent", resourceId: patientId, patientId });
  return state;
}

function recorderRoleOf(auth: AuthContext): ConsentRecorderRole {
  if (auth.role === "patient" || auth.role === "clinician" || auth.role === "admin") return auth.role;
  throw new HttpError(404, "not_found", "patient not found");
}

/**
 * Records a change. A patient records their own consent (no reason needed); staff give a reason of
 * at least 10 characters. A change that would not change anything (consent again while in force, a
 * withdrawal with nothing in force and no proposal waiting) is refused with 409, so the history
 * holds only real changes.
 */
export async function recordConsent(deps: AppDeps, req: Request, auth: AuthContext, patientId: string, body: RecordConsentRequest): Promise<ConsentState> {
  await assertPatientAccess(deps.db, auth, patientId, "identity");
  const role = recorderRoleOf(auth);
  const reason = body.reason?.trim() || null;
  if (role !== "patient" && (!reason || reason.length < MIN_STAFF_REASON)) {
    throw new HttpError(422, "consent_reason_required", `staff record consent with a reason of at least ${MIN_STAFF_REASON} characters (what it rests on, e.g. "signed paper form on file")`);
  }
  return deps.db.transaction(async (trx) => {
    // One change at a time per patient, so the 409 checks below see the latest state.
    await lockPatientConsent(trx, patientId);
    const before = toConsentState(patientId, await consentEventsOf(trx, patientId));
    if (body.kind === "given" && before.inForce) throw new HttpError(409, "consent_unchanged", "research consent is already in force");
    if (body.kind === "given" && role === "clinician" && before.awaitingConfirmation) {
      throw new HttpError(409, "consent_unchanged", "a proposal is already waiting for the patient's confirmation");
    }
    if (body.kind === "withdrawn" && !before.inForce && !before.awaitingConfirmation) {
      throw new HttpError(409, "consent_unchanged", "research consent is not in force");
    }
    if (body.kind === "given" && role === "clinician") await assertProposalQuota(deps.db, trx, req, auth.userId);
    const counts = consentEventCounts(body.kind, role);
    const id = await insertConsentEvent(trx, { patientId, kind: body.kind, recorderRole: role, recordedBy: auth.userId, reason });
    await audit(trx, req, {
      action: `consent.${body.kind}`,
      resourceType: "consent",
      resourceId: id,
      patientId,
      details: { recorderRole: role, counts, ...(reason ? { reasonGiven: true } : {}) },
    });
    return toConsentState(patientId, await consentEventsOf(trx, patientId));
  });
}

/**
 * Consent ticked while enrolling a patient by invitation. A clinician's tick is a proposal (within
 * the daily quota) that the patient confirms in the portal; an admin's counts and needs the reason
 * it rests on. Runs inside the invitation's transaction, so a refusal stores nothing.
 */
export async function recordConsentAtEnrolment(
  auditDb: Knex,
  trx: Knex,
  req: Request,
  actor: AuthContext,
  patientId: string,
  reason: string | undefined,
): Promise<void> {
  const why = reason?.trim() || null;
  if (actor.role === "admin" && (!why || why.length < MIN_STAFF_REASON)) {
    throw new HttpError(422, "consent_reason_required", `an admin recording research consent gives researchConsentReason (at least ${MIN_STAFF_REASON} characters, e.g. "signed paper form on file")`);
  }
  const role = recorderRoleOf(actor);
  if (role === "clinician") await assertProposalQuota(auditDb, trx, req, actor.userId);
  const id = await insertConsentEvent(trx, { patientId, kind: "given", recorderRole: role, recordedBy: actor.userId, reason: why ?? "ticked when the patient was invited" });
  await audit(trx, req, {
    action: "consent.given",
    resourceType: "consent",
    resourceId: id,
    patientId,
    details: { recorderRole: role, counts: consentEventCounts("given", role), withInvitation: true },
  });
}
