/**
 * Research consent as events, read as periods in force. The rule for which events count lives in
 * the database (consent_events_counts_rule) and here, in the same words:
 * - a withdrawal always counts, whoever records it — a patient's "no" is never held back;
 * - a "given" counts when the patient records it themself, or an admin records it with a reason;
 * - a "given" recorded by a clinician is a proposal the patient still has to confirm.
 */
import type { ConsentKind, ConsentRecorderRole } from "../contracts/consent";

export type { ConsentKind, ConsentRecorderRole };

export function consentEventCounts(kind: ConsentKind, recorderRole: ConsentRecorderRole): boolean {
  return kind === "withdrawn" || recorderRole === "patient" || recorderRole === "admin";
}

export interface ConsentEventLike {
  kind: ConsentKind;
  counts: boolean;
  at: Date;
}

/** Half-open periods [from, to) in which consent was in force; `to` null = still in force. */
export interface ConsentPeriod {
  from: Date;
  to: Date | null;
}

/** Events in the order they were recorded (time, then insertion); only counting events move the state. */
export function consentPeriods(events: readonly ConsentEventLike[]): ConsentPeriod[] {
  const periods: ConsentPeriod[] = [];
  let open: ConsentPeriod | null = null;
  for (const e of events) {
    if (!e.counts) continue;
    if (e.kind === "given" && !open) {
      open = { from: e.at, to: null };
      periods.push(open);
    } else if (e.kind === "withdrawn" && open) {
      open.to = e.at;
      open = null;
    }
  }
  return periods;
}

export function consentInForceAt(periods: readonly ConsentPeriod[], at: Date): boolean {
  const t = at.getTime();
  return periods.some((p) => p.from.getTime() <= t && (p.to === null || t < p.to.getTime()));
}
