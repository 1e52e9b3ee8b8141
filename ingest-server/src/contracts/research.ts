import { z } from "zod";
import { isoDateTime } from "./common";
import { CONDITIONS } from "./enums";

const AGE_BAND = /^(\d{1,2}-\d{1,2}|90\+)$/;

/** A cohort definition; stateless — the portal keeps it and sends it again (POST body or query). */
export const cohortDefinition = z.object({
  conditions: z.array(z.enum(CONDITIONS)).max(CONDITIONS.length).default([]),
  ageBands: z.array(z.string().regex(AGE_BAND, { error: "age bands look like 60-64 or 90+" })).max(19).default([]),
  weeksSinceEnrolment: z
    // Strict also inside the request: the answer echoes this object, and an answer refuses unknown keys.
    .strictObject({ from: z.number().int().min(0).max(5200).default(0), to: z.number().int().min(0).max(5200).default(5200) })
    .refine((w) => w.from <= w.to, { error: "weeksSinceEnrolment.from must not exceed to" })
    .default({ from: 0, to: 5200 }),
  metrics: z.array(z.string().max(100)).max(40).default([]),
});
export type CohortDefinition = z.infer<typeof cohortDefinition>;

/**
 * A released cell names its condition and age band; a suppressed one names neither (null), so the
 * preview never says which small group exists — only that some group of fewer than k was held back.
 */
export const cohortCell = z.strictObject({
  condition: z.enum(CONDITIONS).nullable(),
  ageBand: z.string().nullable(),
  /** "stroke, 60-64" or "suppressed group (n < 5)". */
  label: z.string(),
  /** Null when suppressed (fewer than k subjects): the count itself would disclose the small group. */
  subjects: z.number().int().nullable(),
  sessions: z.number().int().nullable(),
  suppressed: z.boolean(),
});

export const cohortPreview = z.strictObject({
  k: z.number().int(),
  // The definition as the server read it (defaults filled in), echoed back.
  definition: cohortDefinition.strict(),
  metrics: z.array(z.string()),
  cells: z.array(cohortCell),
  totals: z.strictObject({ subjects: z.number().int(), sessions: z.number().int(), suppressedCells: z.number().int() }),
});

/** GET /api/research/cohort-metrics: the definition as query parameters (comma-separated lists). */
export const cohortMetricsQuery = z.object({
  /** The research project whose pseudonym key names the subjects (see GET /api/research/projects). */
  projectId: z.uuid({ error: "projectId must be the UUID of one of your research projects" }),
  format: z.enum(["json", "csv", "fhir"]).default("json"),
  conditions: z.string().max(200).optional(),
  ageBands: z.string().max(400).optional(),
  weeksFrom: z.coerce.number().int().min(0).max(5200).optional(),
  weeksTo: z.coerce.number().int().min(0).max(5200).optional(),
  metrics: z.string().max(2000).optional(),
});

export const researchRow = z.strictObject({
  subjectId: z.string(),
  sessionRef: z.string(),
  condition: z.enum(CONDITIONS),
  ageBand: z.string(),
  /** First week of the subject's 4-week study block since enrolment (0, 4, 8 …); 52 = week 52 or later. */
  weeksSinceEnrolment: z.number().int(),
  algorithmVersion: z.string().nullable(),
  metrics: z.record(z.string(), z.number().nullable()),
  /** Strides/steps/arm cycles behind each value (null when unknown). */
  counts: z.record(z.string(), z.number().int().nullable()).optional(),
});

export const exportPrecisionEntry = z.strictObject({ key: z.string(), unit: z.string(), label: z.string(), step: z.number(), decimals: z.number().int(), why: z.string() });

export const studyClock = z.strictObject({ blockWeeks: z.number().int(), capWeeks: z.number().int(), releaseLagDays: z.number().int() });

export const cohortMetricsJson = z.strictObject({
  k: z.number().int(),
  project: z.strictObject({ id: z.uuid(), name: z.string() }),
  metrics: z.array(z.strictObject({ key: z.string(), unit: z.string(), countNoun: z.string().optional(), step: z.number(), countStep: z.number() })),
  studyClock,
  rows: z.array(researchRow),
  suppressedCells: z.number().int(),
});

export const researchProject = z.strictObject({
  id: z.uuid(),
  name: z.string(),
  purpose: z.string().nullable(),
  owner: z.strictObject({ id: z.uuid(), displayName: z.string() }),
  createdAt: isoDateTime,
});
export type ResearchProject = z.infer<typeof researchProject>;
export const researchProjectList = z.strictObject({ items: z.array(researchProject) });

export const createResearchProjectRequest = z
  .object({
    name: z.string().trim().min(3, { error: "a project name has at least 3 characters" }).max(120),
    purpose: z.string().trim().max(1000).optional(),
  })
  .strict();

/** How each metric and the study clock leave the server (GET /api/research/export-rules). */
export const exportRules = z.strictObject({ k: z.number().int(), metrics: z.array(exportPrecisionEntry), countStep: z.number(), studyClock });
