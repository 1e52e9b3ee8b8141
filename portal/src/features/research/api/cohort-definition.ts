import { z } from "zod";
import { labelWithUnit, METRICS } from "@pendula/ingest-server/contracts";
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

/** Every metric of the catalogue, named with its unit; the server exports each at its catalogue precision. */
export const METRIC_OPTIONS: ReadonlyArray<{ value: string; label: string }> = METRICS.map((m) => ({ value: m.key, label: labelWithUnit(m) }));

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
