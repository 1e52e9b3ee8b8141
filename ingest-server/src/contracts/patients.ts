import { z } from "zod";
import { isoDateTime, paging } from "./common";
import { CONDITIONS, SEXES } from "./enums";
import { sessionSummary } from "./sessions";

/** Admin view: identity only — no metrics, no clinical data. */
export const patientIdentity = z.strictObject({
  id: z.uuid(),
  displayName: z.string(),
  researchId: z.string(),
  enrolledOn: z.iso.date(),
  researchConsent: z.boolean(),
});

/** Clinician caseload row: identity plus the summary columns of the caseload table. */
export const patientSummary = patientIdentity.extend({
  birthYear: z.number().int(),
  sex: z.enum(SEXES),
  condition: z.enum(CONDITIONS),
  expectedUploadsPerWeek: z.number().int(),
  sessionsCount: z.number().int(),
  lastUploadAt: isoDateTime.nullable(),
  lastRecordedAt: isoDateTime.nullable(),
  /** Uploads over the last 4 weeks as a share of the expected number (0–100+, null when none expected). */
  adherencePct: z.number().nullable(),
  /** Flags open on the latest session (beyond MDC, or a coordination event): prompts to look, not diagnoses. */
  flags: z.array(
    z.strictObject({
      metricKey: z.string(),
      flag: z.string(),
      /** What the flag is (clinical/caseload-flags.ts): worsened, a coordination event, a phase shift, improved… */
      kind: z.string().optional(),
      /** The flag in plain words, e.g. "Cadence worse than baseline". */
      label: z.string().optional(),
      /** Higher = look sooner; the list is ordered by it, most urgent first. */
      severity: z.number().optional(),
    }),
  ),
  latest: z.strictObject({
    sessionId: z.uuid().nullable(),
    cadenceStepsPerMin: z.number().nullable(),
    strideTimeCvPct: z.number().nullable(),
    phaseCoordinationIndexPct: z.number().nullable(),
    walkingSpeedMPerS: z.number().nullable(),
  }),
});
export type PatientSummary = z.infer<typeof patientSummary>;

export const patientListQuery = z.object({
  q: z.string().trim().max(100).optional(),
});

/** GET /api/patients for a clinician: the caseload, with summary columns. */
export const caseloadList = z.strictObject({ items: z.array(patientSummary) });
export type CaseloadList = z.infer<typeof caseloadList>;
/** GET /api/patients for an admin: identity only. */
export const patientIdentityList = z.strictObject({ items: z.array(patientIdentity) });
export type PatientIdentity = z.infer<typeof patientIdentity>;
/** GET /api/patients: which of the two depends on the caller's role. */
export const patientList = z.union([caseloadList, patientIdentityList]);

export const patientDetail = patientIdentity.extend({
  birthYear: z.number().int().optional(),
  sex: z.enum(SEXES).optional(),
  condition: z.enum(CONDITIONS).optional(),
  conditionDetail: z.string().nullable().optional(),
  expectedUploadsPerWeek: z.number().int().optional(),
  /** Standing height (cm), entered by the clinician; null until entered. */
  heightCm: z.number().nullable().optional(),
});
export type PatientDetail = z.infer<typeof patientDetail>;

/** Plausible adult standing heights (common practice range; the analysis accepts the same 100–230 cm). */
export const HEIGHT_CM_RANGE = { min: 100, max: 230 } as const;
const heightMessage = `heightCm must be a number of centimetres from ${HEIGHT_CM_RANGE.min} to ${HEIGHT_CM_RANGE.max}, or null to clear it`;

/** PATCH /api/patients/:id: the clinical fields a caseload clinician edits. A bad value is a 422. */
export const patientUpdate = z
  .object({
    heightCm: z
      .number({ error: heightMessage })
      .min(HEIGHT_CM_RANGE.min, { error: heightMessage })
      .max(HEIGHT_CM_RANGE.max, { error: heightMessage })
      .nullable(),
  })
  .strict();
export type PatientUpdate = z.infer<typeof patientUpdate>;

export const patientSessionsQuery = paging;
export const patientSessions = z.strictObject({
  items: z.array(sessionSummary),
  total: z.number().int(),
  limit: z.number().int(),
  offset: z.number().int(),
});
