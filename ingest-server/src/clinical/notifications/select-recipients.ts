/**
 * Who gets which e-mail — pure rules, so they are tested without a database or SMTP.
 *
 * - Reminder: an active patient account whose patient expects ≥ 1 upload a week and has fewer
 *   sessions recorded in the current ISO week than expected. Key `reminder:<userId>:<isoWeek>`.
 * - Change alert: when the session has a `worsened` flag on any metric or a coordination event,
 *   every active clinician with the patient in their caseload. Key `alert:<sessionId>:<clinicianId>`.
 * - Digest: every active clinician, counts only. Key `digest:<clinicianId>:<isoWeek>`.
 */
import type { AnnotatedTrends } from "../annotate-trends";
import { changeAlertMail, digestMail, reminderMail, type DigestCounts } from "./messages";

export interface PlannedMail {
  to: string;
  subject: string;
  text: string;
  kind: "clinical_reminder" | "clinical_alert" | "clinical_digest";
  idempotencyKey: string;
}

export interface ReminderCandidate {
  userId: string;
  email: string;
  userStatus: string;
  expectedPerWeek: number;
  sessionsThisWeek: number;
}

export function selectReminders(candidates: readonly ReminderCandidate[], isoWeek: string, publicUrl: string): PlannedMail[] {
  const mail = reminderMail(publicUrl);
  return candidates
    .filter((c) => c.userStatus === "active" && c.expectedPerWeek > 0 && c.sessionsThisWeek < c.expectedPerWeek)
    .map((c) => ({ to: c.email, ...mail, kind: "clinical_reminder", idempotencyKey: `reminder:${c.userId}:${isoWeek}` }));
}

export interface AlertReasons {
  worsenedMetrics: string[];
  eventKinds: string[];
}

/** Why this session warrants an alert (empty lists = no alert). Used for the decision, never put in the e-mail. */
export function alertReasons(trends: AnnotatedTrends, sessionId: string): AlertReasons {
  const worsenedMetrics = trends.metrics
    .filter((m) => m.points.some((p) => p.sessionId === sessionId && p.flag === "worsened"))
    .map((m) => m.key);
  const eventKinds = [...new Set(trends.events.filter((e) => e.sessionId === sessionId).map((e) => e.kind))];
  return { worsenedMetrics, eventKinds };
}

export interface ClinicianRecipient {
  userId: string;
  email: string;
  userStatus: string;
}

export function selectChangeAlerts(
  reasons: AlertReasons,
  clinicians: readonly ClinicianRecipient[],
  session: { sessionId: string; patientId: string },
  publicUrl: string,
): PlannedMail[] {
  if (reasons.worsenedMetrics.length === 0 && reasons.eventKinds.length === 0) return [];
  const mail = changeAlertMail(publicUrl, session.patientId);
  return clinicians
    .filter((c) => c.userStatus === "active")
    .map((c) => ({ to: c.email, ...mail, kind: "clinical_alert", idempotencyKey: `alert:${session.sessionId}:${c.userId}` }));
}

export interface DigestPatient {
  expectedPerWeek: number;
  /** Sessions recorded in the digest week. */
  sessionIds: readonly string[];
  /** Sessions of that week with a worsened flag or an event. */
  sessionIdsToReview: readonly string[];
}

export function digestCounts(isoWeek: string, patients: readonly DigestPatient[]): DigestCounts {
  return {
    isoWeek,
    patients: patients.length,
    sessions: patients.reduce((s, p) => s + p.sessionIds.length, 0),
    sessionsToReview: patients.reduce((s, p) => s + p.sessionIdsToReview.length, 0),
    patientsBehind: patients.filter((p) => p.sessionIds.length < p.expectedPerWeek).length,
  };
}

export function selectDigest(
  clinician: ClinicianRecipient,
  counts: DigestCounts,
  publicUrl: string,
): PlannedMail | null {
  // No caseload, nothing to summarise: an empty digest every week teaches people to ignore it.
  if (clinician.userStatus !== "active" || counts.patients === 0) return null;
  return {
    to: clinician.email,
    ...digestMail(publicUrl, counts),
    kind: "clinical_digest",
    idempotencyKey: `digest:${clinician.userId}:${counts.isoWeek}`,
  };
}
