import { z } from "zod";
import { CONDITION_OPTIONS } from "@/lib/condition-labels";

/*
 * The cohort a researcher asks for. The option lists mirror the server's enumerations; the server
 * validates again, so a stale list here fails with a 400 rather than exporting the wrong cohort.
 */
export { CONDITION_OPTIONS } from "@/lib/condition-labels";

/**
 * 5-year bands with everyone 90 or older in one group (HIPAA Safe Harbor, 45 CFR
 * 164.514(b)(2)(i)(C)), in the server's "60-64" / "90+" form. Enrolment is for adults, so the
 * list starts at the band holding 18 and 19.
 */
export const AGE_BAND_OPTIONS: readonly string[] = [
  ...Array.from({ length: 15 }, (_, i) => `${15 + i * 5}-${19 + i * 5}`),
  "90+",
];

export const METRIC_OPTIONS = [
  { value: "walkingSpeedMPerS", label: "Walking speed (m/s)" },
  { value: "strideLengthM", label: "Stride length (m)" },
  { value: "cadenceStepsPerMin", label: "Cadence (steps/min)" },
  { value: "strideTimeMeanS", label: "Stride time, mean (s)" },
  { value: "strideTimeCvPct", label: "Stride time variability, CV (%)" },
  { value: "swingTimeCvPctLeft", label: "Swing time variability, CV, left (%)" },
  { value: "swingTimeCvPctRight", label: "Swing time variability, CV, right (%)" },
  { value: "stepTimeAsymmetryPct", label: "Step-time asymmetry (%)" },
  { value: "stancePctLeft", label: "Stance, left (% of stride)" },
  { value: "stancePctRight", label: "Stance, right (% of stride)" },
  { value: "doubleSupportPct", label: "Double support (% of stride)" },
  { value: "phaseCoordinationIndexPct", label: "Phase Coordination Index (%)" },
  { value: "gaitAsymmetryPct", label: "Gait asymmetry, swing (%)" },
  { value: "armSwingAmplitudeDegLeft", label: "Arm swing amplitude, left (deg)" },
  { value: "armSwingAmplitudeDegRight", label: "Arm swing amplitude, right (deg)" },
  { value: "armSwingAsymmetryPct", label: "Arm swing asymmetry (%)" },
  { value: "armLegLeftArmRightLegFrequencyRatio", label: "Left arm–right leg frequency ratio" },
  { value: "armLegRightArmLeftLegFrequencyRatio", label: "Right arm–left leg frequency ratio" },
  { value: "armLegLeftArmRightLegCouplingStrength", label: "Left arm–right leg coupling strength (R)" },
  { value: "armLegRightArmLeftLegCouplingStrength", label: "Right arm–left leg coupling strength (R)" },
] as const;

export const MAX_WEEKS_SINCE_ENROLMENT = 520;

const week = z
  .number({ error: "enter a whole number of weeks" })
  .int({ error: "enter a whole number of weeks" })
  .min(0, { error: "weeks start at 0 (the first week after enrolment)" })
  .max(MAX_WEEKS_SINCE_ENROLMENT, { error: `at most ${MAX_WEEKS_SINCE_ENROLMENT} weeks` });

export const cohortDefinitionSchema = z.object({
  conditions: z
    .array(z.enum(CONDITION_OPTIONS.map((c) => c.value) as [string, ...string[]]))
    .min(1, { error: "choose at least one condition" }),
  ageBands: z.array(z.enum(AGE_BAND_OPTIONS as [string, ...string[]])).min(1, { error: "choose at least one age band" }),
  weeksSinceEnrolment: z
    .object({ from: week, to: week })
    .refine((w) => w.from <= w.to, { error: "the first week must not be after the last week", path: ["to"] }),
  metrics: z.array(z.string().min(1)).min(1, { error: "choose at least one metric" }),
});

export type CohortDefinition = z.infer<typeof cohortDefinitionSchema>;

export const DEFAULT_COHORT: CohortDefinition = {
  conditions: ["incomplete_sci", "stroke"],
  ageBands: AGE_BAND_OPTIONS.slice(),
  weeksSinceEnrolment: { from: 0, to: 52 },
  metrics: ["cadenceStepsPerMin", "strideTimeCvPct", "phaseCoordinationIndexPct"],
};

export function conditionLabel(value: string): string {
  return CONDITION_OPTIONS.find((c) => c.value === value)?.label ?? value;
}

export function metricLabel(value: string): string {
  return METRIC_OPTIONS.find((m) => m.value === value)?.label ?? value;
}
