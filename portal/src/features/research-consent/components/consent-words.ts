import type { ConsentEvent } from "../api/consent";

const ROLE_WORDS: Record<ConsentEvent["recorderRole"], string> = {
  patient: "patient",
  clinician: "clinician",
  admin: "administrator",
  migration: "earlier yes/no setting",
};

/** One line of the history in words: what changed, who recorded it and whether it counts. */
export function describeConsentEvent(e: ConsentEvent): string {
  const who = e.recordedBy ? `${e.recordedBy.displayName}, ${ROLE_WORDS[e.recorderRole]}` : `the ${ROLE_WORDS[e.recorderRole]}`;
  const what = e.kind === "given" ? (e.counts ? "Consent given" : "Consent proposed, waiting for the patient") : "Consent withdrawn";
  return `${what} — recorded by ${who}`;
}
