/**
 * Reference bands shown beside a patient's trend, each with the source it comes from.
 *
 * Rules: a band exists only where a source in DOMAIN.md §4 gives one; a metric without such a source
 * has no band (gait asymmetry, step time, arm–leg metrics). `confirmed` mirrors DOMAIN.md: `true`
 * for values marked [src], `false` for values marked *(from memory)*, which the UI must say.
 * Mean ± SD sources become mean ± 1 SD bands (DOMAIN.md §7 "Reporting": normative bands as the
 * source cohort's mean ± SD, with the source named).
 *
 * Age groups: where a source speaks of "young" and "elderly" without ages in our notes, the cut-offs
 * 18–39 and ≥ 65 are common practice, not from the source; these bands are all marked unconfirmed.
 */
import type { BaseMetric } from "./metric-catalog";
import { resolveMetricKey } from "./metric-catalog";

export interface ReferenceBand {
  metric: BaseMetric;
  low: number;
  high: number;
  label: string;
  citation: string;
  confirmed: boolean;
  basis: "mean ± 1 SD" | "published range";
  /** Inclusive age limits in years; absent = any adult age in the source. */
  ageMin?: number;
  ageMax?: number;
  /** Conditions the band describes; absent = a comparison band shown for every patient. */
  conditions?: readonly string[];
}

const meanSd = (m: number, sd: number) => ({ low: round(m - sd), high: round(m + sd) });
// Bands are displayed; rounding to 1e-9 only removes binary noise such as 1.5799999999999998.
const round = (v: number) => Math.round(v * 1e9) / 1e9;

const FRENKEL_TOLEDO =
  "Frenkel-Toledo et al. 2005, J NeuroEng Rehabil 2:23, Table 2 (overground, comfortable speed)";

export const REFERENCE_BANDS: readonly ReferenceBand[] = [
  {
    metric: "strideTimeCvPct",
    ...meanSd(1.94, 0.36),
    label: "Control group, mean ± 1 SD (1.94 ± 0.36 %)",
    citation: FRENKEL_TOLEDO,
    confirmed: true,
    basis: "mean ± 1 SD",
  },
  {
    metric: "strideTimeCvPct",
    ...meanSd(2.24, 0.74),
    label: "Parkinson's disease group, mean ± 1 SD (2.24 ± 0.74 %)",
    citation: FRENKEL_TOLEDO,
    confirmed: true,
    basis: "mean ± 1 SD",
    conditions: ["parkinsons"],
  },
  {
    metric: "strideTimeMeanS",
    ...meanSd(1.08, 0.09),
    label: "Control group, mean ± 1 SD (1.08 ± 0.09 s)",
    citation: FRENKEL_TOLEDO,
    confirmed: true,
    basis: "mean ± 1 SD",
  },
  {
    metric: "strideTimeMeanS",
    ...meanSd(1.12, 0.07),
    label: "Parkinson's disease group, mean ± 1 SD (1.12 ± 0.07 s)",
    citation: FRENKEL_TOLEDO,
    confirmed: true,
    basis: "mean ± 1 SD",
    conditions: ["parkinsons"],
  },
  {
    metric: "cadenceStepsPerMin",
    low: 100,
    high: 120,
    label: "Typical laboratory walking, 100–120 steps/min",
    citation: "Winter 1991, as summarised by R. Baker",
    confirmed: true,
    basis: "published range",
  },
  {
    metric: "cadenceStepsPerMin",
    ...meanSd(109, 9),
    label: "Free-living full-minute walking bouts, mean ± 1 SD (109 ± 9 steps/min)",
    citation: "Dall et al. 2013, as summarised by R. Baker",
    confirmed: true,
    basis: "mean ± 1 SD",
  },
  {
    metric: "cadenceStepsPerMin",
    low: 105,
    high: 120,
    label: "Adults under 70, about 105–120 steps/min (from memory — verify)",
    citation: "Öberg et al. 1993; Hollman et al. 2011 (from memory)",
    confirmed: false,
    basis: "published range",
    ageMin: 18,
    ageMax: 69,
  },
  {
    metric: "stancePct",
    low: 60,
    high: 65,
    label: "Typical stance 60–65 % of the stride",
    citation: "Neurology textbook-level summary (stance 60–65 %, double support 20–25 %)",
    confirmed: true,
    basis: "published range",
  },
  {
    metric: "swingPct",
    low: 35,
    high: 40,
    label: "Typical swing 35–40 % of the stride (complement of stance 60–65 %)",
    citation: "Neurology textbook-level summary (stance 60–65 %); swing 35.27 % in controls, Frenkel-Toledo et al. 2005",
    confirmed: true,
    basis: "published range",
  },
  {
    metric: "doubleSupportPct",
    low: 20,
    high: 25,
    label: "Typical double support 20–25 % of the stride (rises with age)",
    citation: "Neurology textbook-level summary (stance 60–65 %, double support 20–25 %)",
    confirmed: true,
    basis: "published range",
  },
  {
    metric: "phaseCoordinationIndexPct",
    low: 2,
    high: 3,
    label: "Young adults, about 2–3 % (from memory — verify against Plotnik's table)",
    citation: "Plotnik, Giladi & Hausdorff 2007, Exp Brain Res 181:561 (values from memory)",
    confirmed: false,
    basis: "published range",
    ageMin: 18,
    ageMax: 39,
  },
  {
    metric: "phaseCoordinationIndexPct",
    low: 3,
    high: 4,
    label: "Older adults, about 3–4 % (from memory — verify against Plotnik's table)",
    citation: "Plotnik, Giladi & Hausdorff 2007, Exp Brain Res 181:561 (values from memory)",
    confirmed: false,
    basis: "published range",
    ageMin: 65,
  },
  {
    metric: "phaseCoordinationIndexPct",
    low: 4,
    high: 7,
    label: "Parkinson's disease, about 4–7 % (from memory — verify against Plotnik's table)",
    citation: "Plotnik, Giladi & Hausdorff 2007, Exp Brain Res 181:561 (values from memory)",
    confirmed: false,
    basis: "published range",
    conditions: ["parkinsons"],
  },
  {
    metric: "dfaAlpha",
    low: 0.76,
    high: 0.87,
    label: "Young adults, about 0.76–0.87 (from memory — verify)",
    citation: "Hausdorff et al. 1995, J Appl Physiol 78:349 and later work (values from memory)",
    confirmed: false,
    basis: "published range",
    ageMin: 18,
    ageMax: 39,
  },
];

export interface BandQuery {
  /** Age in whole years; `null` when unknown (age-limited bands are then left out). */
  age: number | null;
  condition: string;
}

/** The bands that fit this metric key, age and condition; `[]` where no source fits. */
export function bandsFor(metricKey: string, query: BandQuery): ReferenceBand[] {
  const resolved = resolveMetricKey(metricKey);
  if (!resolved) return [];
  return REFERENCE_BANDS.filter((b) => {
    if (b.metric !== resolved.base) return false;
    if (b.conditions && !b.conditions.includes(query.condition)) return false;
    const ageLimited = b.ageMin !== undefined || b.ageMax !== undefined;
    if (ageLimited && query.age === null) return false;
    if (b.ageMin !== undefined && query.age! < b.ageMin) return false;
    if (b.ageMax !== undefined && query.age! > b.ageMax) return false;
    return true;
  });
}
