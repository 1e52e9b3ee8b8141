import { z } from "zod";
import { isoDateTime } from "./common";

export const CONSENT_KINDS = ["given", "withdrawn"] as const;
export type ConsentKind = (typeof CONSENT_KINDS)[number];
/** 'migration': the yes/no flag that predates the history (never counts as a "given"). */
export const CONSENT_RECORDER_ROLES = ["patient", "clinician", "admin", "migration"] as const;
export type ConsentRecorderRole = (typeof CONSENT_RECORDER_ROLES)[number];

/** One recorded change of a patient's research consent. */
export const consentEvent = z.strictObject({
  id: z.uuid(),
  kind: z.enum(CONSENT_KINDS),
  at: isoDateTime,
  recorderRole: z.enum(CONSENT_RECORDER_ROLES),
  /** Null when the account was removed, or for the flag that predates the history. */
  recordedBy: z.strictObject({ id: z.uuid(), displayName: z.string() }).nullable(),
  reason: z.string().nullable(),
  /** False for a clinician's "given", which waits for the patient's own confirmation. */
  counts: z.boolean(),
});
export type ConsentEvent = z.infer<typeof consentEvent>;

export const consentState = z.strictObject({
  patientId: z.uuid(),
  /** Research use allowed now, by the counting events. */
  inForce: z.boolean(),
  /** When the current period in force began (null when not in force). */
  since: isoDateTime.nullable(),
  /** A "given" recorded by staff (or the earlier flag) that the patient has not confirmed or declined yet. */
  awaitingConfirmation: z.boolean(),
  /** Newest first. */
  events: z.array(consentEvent),
});
export type ConsentState = z.infer<typeof consentState>;

export const recordConsentRequest = z
  .object({
    kind: z.enum(CONSENT_KINDS),
    /** Required from staff (at least 10 characters): what the record rests on, e.g. "signed paper form on file". */
    reason: z.string().trim().max(500).optional(),
  })
  .strict();
export type RecordConsentRequest = z.infer<typeof recordConsentRequest>;
