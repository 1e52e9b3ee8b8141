/**
 * Reference bands shown beside a patient's trend.
 *
 * Rules:
 * - A band ships only when its value was read in the source's own text (table or abstract) and
 *   re-checked; a value that could not be confirmed is not in this list at all.
 * - Each band says who it describes (age, condition), how they walked, with what system, the
 *   value as published, how the band was derived from it, and where in the source it is.
 * - A band is offered only to a patient it describes: a patient-group band needs the patient's
 *   condition and age inside its population; a healthy-comparison band (the healthy cohort of a
 *   study) needs the patient's age inside that cohort's ages and, where the cohort was matched to
 *   one condition, that condition. A patient outside every population gets no band and a note
 *   that there is no published band for them — never another cohort's band.
 * - Mean ± SD sources become mean ± 1 SD bands (docs/methods.md#reference-bands).
 *
 * Where a source names an age group ("older", "young") without limits in the text we read, the
 * limits used here are marked `ageLimitsBasis: "common practice"` and say so in the population text.
 */
import type { BaseMetric } from "../contracts/metric-catalog";
import { metricDefinition } from "../contracts/metric-catalog";

export type BandRole = "patient-group" | "healthy-comparison";

export interface BandPopulation {
  /** Who the cohort was, in words shown to the clinician. */
  description: string;
  role: BandRole;
  /** Inclusive age limits in years; absent = no limit on that side. */
  ageMin?: number;
  ageMax?: number;
  /** "source" when the limits are the study's own, "common practice" when they are our cut-off for the study's wording. */
  ageLimitsBasis: "source" | "common practice";
  /**
   * Patient conditions (db/src/enums.ts CONDITIONS) the band may be shown for. For a patient-group
   * band these are the cohort's condition; for a healthy comparison matched to one condition, that condition.
   * Absent = any condition (healthy comparisons only).
   */
  conditions?: readonly string[];
}

export interface ReferenceBand {
  id: string;
  metric: BaseMetric;
  low: number;
  high: number;
  /** Short text shown on the chart; names the population. */
  label: string;
  population: BandPopulation;
  /** How the cohort walked: overground or treadmill, which speed, how long. */
  walkingCondition: string;
  /** The system the source measured with. */
  measurementSystem: string;
  /** The value exactly as published (mean ± dispersion, or range) with its unit. */
  publishedValue: string;
  /** How low/high were derived from the published value. */
  derivation: string;
  /** Authors, year, journal volume:page. */
  citation: string;
  /** Where in the source the value is printed: a table, figure or the abstract's results. */
  location: string;
  /** A caution specific to this band (speed dependence, stride count…). */
  note?: string;
}

const meanSd = (m: number, sd: number) => ({ low: round(m - sd), high: round(m + sd) });
// Bands are displayed; rounding to 1e-9 only removes binary noise such as 1.5799999999999998.
const round = (v: number) => Math.round(v * 1e9) / 1e9;

const MEAN_1SD = "mean ± 1 SD of the published cohort";

const FRENKEL_TOLEDO = "Frenkel-Toledo et al. 2005, J NeuroEng Rehabil 2:23";
const FT_WALK = "overground, comfortable walking speed";
const FT_SYSTEM = "the study's gait timing system (see the source's Methods)";
const FT_OLDER_CONTROLS: BandPopulation = {
  description:
    "healthy older adults, the age-matched controls of a Parkinson's disease study (n = 30); age ≥ 60 y is our cut-off for 'older' (common practice)",
  role: "healthy-comparison",
  ageMin: 60,
  ageLimitsBasis: "common practice",
};
const FT_PD: BandPopulation = {
  description:
    "people with Parkinson's disease, Hoehn & Yahr 2–2.5 (n = 36); age ≥ 60 y is our cut-off for this older cohort (common practice)",
  role: "patient-group",
  ageMin: 60,
  ageLimitsBasis: "common practice",
  conditions: ["parkinsons"],
};

const MEIJER = "Meijer et al. 2011, J NeuroEng Rehabil 8:23";
const MEIJER_WALK = "overground, back and forth along a straight path in a hall, comfortable speed, 2 minutes";
const MEIJER_SYSTEM = "tri-axial accelerometer";
const MEIJER_DISPERSION = "the abstract prints mean ± dispersion without saying whether it is SD or SE; the band uses it as printed";
const MEIJER_STROKE: BandPopulation = {
  description: "ambulatory adults after stroke (n = 12)",
  role: "patient-group",
  ageLimitsBasis: "source",
  conditions: ["stroke"],
};
const MEIJER_CONTROLS: BandPopulation = {
  description: "healthy adults age-matched to an ambulatory stroke group; shown to stroke patients only",
  role: "healthy-comparison",
  ageLimitsBasis: "source",
  conditions: ["stroke"],
};

const ZADIK = "Zadik et al. 2022, Gait & Posture 96:87";
const PCI_SPEED_NOTE =
  "PCI rises as walking speed falls (Gimmon et al. 2018, J Aging Phys Act 26:382): read it beside the session's walking speed.";

const HAUSDORFF_1997 = "Hausdorff et al. 1997, J Appl Physiol 82:262";
const DFA_NOTE = "α needs long continuous walking (about 600 strides) to be stable; short home tests give a rough value.";

export const REFERENCE_BANDS: readonly ReferenceBand[] = [
  {
    id: "stride-cv-older-controls-frenkel-toledo-2005",
    metric: "strideTimeCvPct",
    ...meanSd(1.94, 0.36),
    label: "Healthy older adults (age-matched controls), 1.94 ± 0.36 %",
    population: FT_OLDER_CONTROLS,
    walkingCondition: FT_WALK,
    measurementSystem: FT_SYSTEM,
    publishedValue: "1.94 ± 0.36 % (mean ± SD)",
    derivation: MEAN_1SD,
    citation: FRENKEL_TOLEDO,
    location: "Table 2",
    note: "Stride-time variability falls as walking speed rises (same study): read it beside walking speed.",
  },
  {
    id: "stride-cv-pd-frenkel-toledo-2005",
    metric: "strideTimeCvPct",
    ...meanSd(2.24, 0.74),
    label: "Parkinson's disease, H&Y 2–2.5, 2.24 ± 0.74 %",
    population: FT_PD,
    walkingCondition: FT_WALK,
    measurementSystem: FT_SYSTEM,
    publishedValue: "2.24 ± 0.74 % (mean ± SD)",
    derivation: MEAN_1SD,
    citation: FRENKEL_TOLEDO,
    location: "Table 2",
  },
  {
    id: "stride-time-older-controls-frenkel-toledo-2005",
    metric: "strideTimeMeanS",
    ...meanSd(1.08, 0.09),
    label: "Healthy older adults (age-matched controls), 1.08 ± 0.09 s",
    population: FT_OLDER_CONTROLS,
    walkingCondition: FT_WALK,
    measurementSystem: FT_SYSTEM,
    publishedValue: "1.08 ± 0.09 s (mean ± SD)",
    derivation: MEAN_1SD,
    citation: FRENKEL_TOLEDO,
    location: "Table 2",
  },
  {
    id: "stride-time-pd-frenkel-toledo-2005",
    metric: "strideTimeMeanS",
    ...meanSd(1.12, 0.07),
    label: "Parkinson's disease, H&Y 2–2.5, 1.12 ± 0.07 s",
    population: FT_PD,
    walkingCondition: FT_WALK,
    measurementSystem: FT_SYSTEM,
    publishedValue: "1.12 ± 0.07 s (mean ± SD)",
    derivation: MEAN_1SD,
    citation: FRENKEL_TOLEDO,
    location: "Table 2",
  },
  {
    id: "swing-older-controls-frenkel-toledo-2005",
    metric: "swingPct",
    ...meanSd(35.27, 1.97),
    label: "Healthy older adults (age-matched controls), swing 35.27 ± 1.97 %",
    population: FT_OLDER_CONTROLS,
    walkingCondition: FT_WALK,
    measurementSystem: FT_SYSTEM,
    publishedValue: "35.27 ± 1.97 % of the stride (mean ± SD)",
    derivation: MEAN_1SD,
    citation: FRENKEL_TOLEDO,
    location: "Table 2",
  },
  {
    id: "swing-pd-frenkel-toledo-2005",
    metric: "swingPct",
    ...meanSd(34.45, 2.6),
    label: "Parkinson's disease, H&Y 2–2.5, swing 34.45 ± 2.60 %",
    population: FT_PD,
    walkingCondition: FT_WALK,
    measurementSystem: FT_SYSTEM,
    publishedValue: "34.45 ± 2.60 % of the stride (mean ± SD)",
    derivation: MEAN_1SD,
    citation: FRENKEL_TOLEDO,
    location: "Table 2",
  },
  {
    id: "stance-older-controls-frenkel-toledo-2005",
    metric: "stancePct",
    ...meanSd(100 - 35.27, 1.97),
    label: "Healthy older adults (age-matched controls), stance 64.73 ± 1.97 % (100 − swing)",
    population: FT_OLDER_CONTROLS,
    walkingCondition: FT_WALK,
    measurementSystem: FT_SYSTEM,
    publishedValue: "swing 35.27 ± 1.97 % of the stride (mean ± SD)",
    derivation: "stance = 100 % − swing for every stride, so the mean is 100 − 35.27 and the SD is unchanged; ± 1 SD",
    citation: FRENKEL_TOLEDO,
    location: "Table 2 (swing)",
  },
  {
    id: "stance-pd-frenkel-toledo-2005",
    metric: "stancePct",
    ...meanSd(100 - 34.45, 2.6),
    label: "Parkinson's disease, H&Y 2–2.5, stance 65.55 ± 2.60 % (100 − swing)",
    population: FT_PD,
    walkingCondition: FT_WALK,
    measurementSystem: FT_SYSTEM,
    publishedValue: "swing 34.45 ± 2.60 % of the stride (mean ± SD)",
    derivation: "stance = 100 % − swing for every stride, so the mean is 100 − 34.45 and the SD is unchanged; ± 1 SD",
    citation: FRENKEL_TOLEDO,
    location: "Table 2 (swing)",
  },
  {
    id: "cadence-adults-tudor-locke-rowe-2012",
    metric: "cadenceStepsPerMin",
    low: 81,
    high: 138,
    label: "Healthy adults, laboratory walking: women 96–138, men 81–135 steps/min",
    population: {
      description:
        "healthy adults across adulthood, from the laboratory studies the review collected; age ≥ 18 y is our reading of 'adult' (common practice). No age effect on step frequency from 10 to 79 y (Öberg et al. 1993, J Rehabil Res Dev 30:210).",
      role: "healthy-comparison",
      ageMin: 18,
      ageLimitsBasis: "common practice",
    },
    walkingCondition: "laboratory walking at the speeds of the reviewed studies",
    measurementSystem: "the reviewed laboratory studies' systems (review)",
    publishedValue: "women 96–138, men 81–135 steps/min (ranges)",
    derivation: "union of the women's and men's published ranges",
    citation: "Tudor-Locke & Rowe 2012, Sports Med 42:381",
    location: "abstract (results)",
  },
  {
    id: "pci-40-74-zadik-2022",
    metric: "phaseCoordinationIndexPct",
    ...meanSd(3.16, 1.11),
    label: "Healthy adults 40–75 y, 3.16 ± 1.11 %",
    population: {
      description: "healthy adults aged 40–75 y (IMU study, n = 66 in total)",
      role: "healthy-comparison",
      ageMin: 40,
      ageMax: 74,
      ageLimitsBasis: "source",
    },
    walkingCondition: "walking as described in the source's Methods",
    measurementSystem: "inertial measurement units (IMU)",
    publishedValue: "3.16 ± 1.11 % (mean ± SD)",
    derivation: MEAN_1SD,
    citation: ZADIK,
    location: "abstract (results)",
    note: PCI_SPEED_NOTE,
  },
  {
    id: "pci-75plus-zadik-2022",
    metric: "phaseCoordinationIndexPct",
    ...meanSd(5.68, 2.01),
    label: "Healthy adults ≥ 75 y, 5.68 ± 2.01 %",
    population: {
      description: "healthy adults aged 75 y and over (IMU study, n = 66 in total)",
      role: "healthy-comparison",
      ageMin: 75,
      ageLimitsBasis: "source",
    },
    walkingCondition: "walking as described in the source's Methods",
    measurementSystem: "inertial measurement units (IMU)",
    publishedValue: "5.68 ± 2.01 % (mean ± SD)",
    derivation: MEAN_1SD,
    citation: ZADIK,
    location: "abstract (results)",
    note: PCI_SPEED_NOTE,
  },
  {
    id: "pci-stroke-meijer-2011",
    metric: "phaseCoordinationIndexPct",
    ...meanSd(19.5, 2.3),
    label: "Ambulatory stroke, 19.5 ± 2.3 %",
    population: MEIJER_STROKE,
    walkingCondition: MEIJER_WALK,
    measurementSystem: MEIJER_SYSTEM,
    publishedValue: "19.5 ± 2.3 %",
    derivation: `mean ± 1 printed dispersion; ${MEIJER_DISPERSION}`,
    citation: MEIJER,
    location: "abstract (results)",
    note: `${PCI_SPEED_NOTE} This stroke group walked at 1.1 m/s.`,
  },
  {
    id: "pci-stroke-controls-meijer-2011",
    metric: "phaseCoordinationIndexPct",
    ...meanSd(6.2, 1.0),
    label: "Healthy controls of a stroke study, 6.2 ± 1.0 %",
    population: MEIJER_CONTROLS,
    walkingCondition: MEIJER_WALK,
    measurementSystem: MEIJER_SYSTEM,
    publishedValue: "6.2 ± 1.0 %",
    derivation: `mean ± 1 printed dispersion; ${MEIJER_DISPERSION}`,
    citation: MEIJER,
    location: "abstract (results)",
    note: `${PCI_SPEED_NOTE} These controls walked at 1.7 m/s.`,
  },
  {
    id: "ga-stroke-meijer-2011",
    metric: "gaitAsymmetryPct",
    ...meanSd(26.3, 5.6),
    label: "Ambulatory stroke, 26.3 ± 5.6",
    population: MEIJER_STROKE,
    walkingCondition: MEIJER_WALK,
    measurementSystem: MEIJER_SYSTEM,
    publishedValue: "26.3 ± 5.6 (GA = 100·|ln(short swing / long swing)|, Yogev et al. 2007)",
    derivation: `mean ± 1 printed dispersion; ${MEIJER_DISPERSION}`,
    citation: MEIJER,
    location: "abstract (results)",
  },
  {
    id: "ga-stroke-controls-meijer-2011",
    metric: "gaitAsymmetryPct",
    ...meanSd(5.5, 1.2),
    label: "Healthy controls of a stroke study, 5.5 ± 1.2",
    population: MEIJER_CONTROLS,
    walkingCondition: MEIJER_WALK,
    measurementSystem: MEIJER_SYSTEM,
    publishedValue: "5.5 ± 1.2 (GA = 100·|ln(short swing / long swing)|)",
    derivation: `mean ± 1 printed dispersion; ${MEIJER_DISPERSION}`,
    citation: MEIJER,
    location: "abstract (results)",
  },
  {
    id: "speed-stroke-meijer-2011",
    metric: "walkingSpeedMPerS",
    ...meanSd(1.1, 0.1),
    label: "Ambulatory stroke, 1.1 ± 0.1 m/s",
    population: MEIJER_STROKE,
    walkingCondition: MEIJER_WALK,
    measurementSystem: MEIJER_SYSTEM,
    publishedValue: "1.1 ± 0.1 m/s",
    derivation: `mean ± 1 printed dispersion; ${MEIJER_DISPERSION}`,
    citation: MEIJER,
    location: "abstract (results)",
    note: "A small group of fast, ambulatory stroke survivors; many patients walk far slower.",
  },
  {
    id: "speed-stroke-controls-meijer-2011",
    metric: "walkingSpeedMPerS",
    ...meanSd(1.7, 0.1),
    label: "Healthy controls of a stroke study, 1.7 ± 0.1 m/s",
    population: MEIJER_CONTROLS,
    walkingCondition: MEIJER_WALK,
    measurementSystem: MEIJER_SYSTEM,
    publishedValue: "1.7 ± 0.1 m/s",
    derivation: `mean ± 1 printed dispersion; ${MEIJER_DISPERSION}`,
    citation: MEIJER,
    location: "abstract (results)",
  },
  {
    id: "dfa-young-hausdorff-1997",
    metric: "dfaAlpha",
    ...meanSd(0.87, 0.15),
    label: "Healthy young adults, 0.87 ± 0.15",
    population: {
      description: "healthy young adults; 18–30 y is our cut-off for the source's 'young' (common practice)",
      role: "healthy-comparison",
      ageMin: 18,
      ageMax: 30,
      ageLimitsBasis: "common practice",
    },
    walkingCondition: "continuous walking at the usual pace (see the source's Methods)",
    measurementSystem: "stride intervals from the study's foot-contact recordings (see the source's Methods)",
    publishedValue: "0.87 ± 0.15 (mean ± SD)",
    derivation: MEAN_1SD,
    citation: HAUSDORFF_1997,
    location: "abstract (results)",
    note: DFA_NOTE,
  },
  {
    id: "dfa-elderly-hausdorff-1997",
    metric: "dfaAlpha",
    ...meanSd(0.68, 0.14),
    label: "Healthy elderly adults, 0.68 ± 0.14",
    population: {
      description: "healthy elderly adults; ≥ 70 y is our cut-off for the source's 'elderly' (common practice)",
      role: "healthy-comparison",
      ageMin: 70,
      ageLimitsBasis: "common practice",
    },
    walkingCondition: "continuous walking at the usual pace (see the source's Methods)",
    measurementSystem: "stride intervals from the study's foot-contact recordings (see the source's Methods)",
    publishedValue: "0.68 ± 0.14 (mean ± SD)",
    derivation: MEAN_1SD,
    citation: HAUSDORFF_1997,
    location: "abstract (results)",
    note: DFA_NOTE,
  },
];

export interface BandQuery {
  /** Age in whole years; `null` when unknown (age-limited bands are then left out). */
  age: number | null;
  condition: string;
}

function fits(b: ReferenceBand, query: BandQuery): boolean {
  const p = b.population;
  if (p.conditions && !p.conditions.includes(query.condition)) return false;
  if (p.role === "patient-group" && !p.conditions) return false; // a patient group always names its condition
  const ageLimited = p.ageMin !== undefined || p.ageMax !== undefined;
  if (ageLimited && query.age === null) return false;
  if (p.ageMin !== undefined && query.age! < p.ageMin) return false;
  if (p.ageMax !== undefined && query.age! > p.ageMax) return false;
  return true;
}

/** The bands that describe this patient for this metric key; `[]` where none does. */
export function bandsFor(metricKey: string, query: BandQuery): ReferenceBand[] {
  const resolved = metricDefinition(metricKey);
  if (!resolved) return [];
  return REFERENCE_BANDS.filter((b) => b.metric === resolved.base && fits(b, query));
}

export const NO_BAND_FOR_MEASURE = "No published reference band for this measure.";
export const NO_BAND_FOR_PATIENT = "No published band for this patient: the published cohorts for this measure differ in age or condition.";

/** What to say when `bandsFor` is empty; `null` when there are bands. */
export function bandNote(metricKey: string, query: BandQuery): string | null {
  if (bandsFor(metricKey, query).length > 0) return null;
  const base = metricDefinition(metricKey)?.base;
  if (!base || !REFERENCE_BANDS.some((b) => b.metric === base)) return NO_BAND_FOR_MEASURE;
  return query.age === null
    ? `${NO_BAND_FOR_PATIENT} (The patient's age is unknown, and every band for this measure is limited by age.)`
    : NO_BAND_FOR_PATIENT;
}
