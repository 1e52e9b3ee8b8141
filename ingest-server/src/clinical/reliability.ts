/**
 * Measurement error and the smallest real change.
 *
 * SEM = SD·√(1 − ICC) and MDC95 = 1.96·√2·SEM (Weir 2005, J Strength Cond Res 19:231). The √2
 * is there because a change is the difference of two measurements, each carrying error. The
 * published MDC95 values used below were computed by their authors with this formula.
 *
 * Two error estimates can exist for one patient and metric: a published test–retest MDC for the
 * patient's condition, and the patient's own baseline sessions (repeated sessions of one person
 * while stable are a within-person test–retest sample, whose SD estimates the SEM). The published
 * values come from timed or walkway tests repeated within a day; weekly home tests with body-worn
 * sensors may vary more. So when both exist the LARGER is used (common practice: the conservative
 * choice, fewer false "real change" flags).
 */
import type { BaseMetric } from "../contracts/metric-catalog";
import { metricDefinition } from "../contracts/metric-catalog";

/** 1.96·√2 = 2.7718585822512662 (Weir 2005; docs/methods.md#measurement-error-and-important-change). */
export const MDC95_FACTOR = 1.96 * Math.SQRT2;

export function standardErrorOfMeasurement(sd: number, icc: number): number {
  if (!Number.isFinite(sd) || sd < 0) throw new RangeError("standardErrorOfMeasurement: sd must be finite and ≥ 0");
  if (!Number.isFinite(icc) || icc < 0 || icc > 1) throw new RangeError("standardErrorOfMeasurement: icc must be in [0, 1]");
  return sd * Math.sqrt(1 - icc);
}

export function minimalDetectableChange95(sem: number): number {
  if (!Number.isFinite(sem) || sem < 0) throw new RangeError("minimalDetectableChange95: sem must be finite and ≥ 0");
  return MDC95_FACTOR * sem;
}

/** ICC bands of Koo & Li 2016 (J Chiropr Med 15:155): < 0.5 poor, 0.5–0.75 moderate, 0.75–0.9 good, > 0.9 excellent (docs/methods.md#measurement-error-and-important-change). */
export function iccBand(icc: number): "poor" | "moderate" | "good" | "excellent" {
  if (!Number.isFinite(icc) || icc < -1 || icc > 1) throw new RangeError("iccBand: icc must be in [-1, 1]");
  if (icc < 0.5) return "poor";
  if (icc < 0.75) return "moderate";
  if (icc <= 0.9) return "good";
  return "excellent";
}

export interface PublishedMdc {
  id: string;
  metric: BaseMetric;
  condition: string;
  /** `pct-of-mean`: MDC% applied to the patient's baseline mean; `absolute`: the MDC95 in the metric's unit. */
  kind: "pct-of-mean" | "absolute";
  value: number;
  /**
   * For speed-stratified values: the baseline means this value applies to, as [min, max] with
   * inclusive/exclusive ends as published. Absent = any baseline.
   */
  baselineRange?: { min: number; minInclusive: boolean; max: number; maxInclusive: boolean };
  population: string;
  walkingCondition: string;
  measurementSystem: string;
  publishedValue: string;
  citation: string;
  location: string;
}

const HOSOI = "Hosoi et al. 2023, Front Neurol 14:1219505";
const HOSOI_POP = "adults after stroke (n = 84), grouped by comfortable gait speed";
const HOSOI_WALK = "10-meter walk test at comfortable speed, measured twice";
const HOSOI_SYSTEM = "timed 10-meter straight track (gait speed from gait time)";

/**
 * Only values read in the source's own text. Nair, Hornby & Behrman 2012 report MDC% from 21 %
 * (cadence) to 80 % (double limb support TIME per limb): the 80 % is not for double support as a
 * percentage of the stride, so it is not used for `doubleSupportPct`.
 * Published ICCs without the sample SD (e.g. PCI ICC 0.566, Richmond 2025) cannot give an SEM for
 * one patient and are not used.
 */
export const PUBLISHED_MDC: readonly PublishedMdc[] = [
  {
    id: "cadence-isci-nair-2012",
    metric: "cadenceStepsPerMin",
    condition: "incomplete_sci",
    kind: "pct-of-mean",
    value: 21,
    population: "adults with incomplete spinal cord injury (n = 16)",
    walkingCondition: "self-selected speed, at least 2 trials within one session",
    measurementSystem: "instrumented walkway",
    publishedValue: "MDC% 21 % (cadence)",
    citation: "Nair, Hornby & Behrman 2012, Top Spinal Cord Inj Rehabil 18:273",
    location: "abstract (results)",
  },
  {
    id: "speed-stroke-low-hosoi-2023",
    metric: "walkingSpeedMPerS",
    condition: "stroke",
    kind: "absolute",
    value: 0.05,
    baselineRange: { min: 0, minInclusive: true, max: 0.4, maxInclusive: false },
    population: `${HOSOI_POP}: low-speed group < 0.4 m/s (n = 19)`,
    walkingCondition: HOSOI_WALK,
    measurementSystem: HOSOI_SYSTEM,
    publishedValue: "MDC 0.05 m/s (comfortable speed, low-speed group)",
    citation: HOSOI,
    location: "abstract (results)",
  },
  {
    id: "speed-stroke-moderate-hosoi-2023",
    metric: "walkingSpeedMPerS",
    condition: "stroke",
    kind: "absolute",
    value: 0.11,
    baselineRange: { min: 0.4, minInclusive: true, max: 0.8, maxInclusive: true },
    population: `${HOSOI_POP}: moderate-speed group 0.4–0.8 m/s (n = 29)`,
    walkingCondition: HOSOI_WALK,
    measurementSystem: HOSOI_SYSTEM,
    publishedValue: "MDC 0.11 m/s (comfortable speed, moderate-speed group)",
    citation: HOSOI,
    location: "abstract (results)",
  },
  {
    id: "speed-stroke-high-hosoi-2023",
    metric: "walkingSpeedMPerS",
    condition: "stroke",
    kind: "absolute",
    value: 0.21,
    baselineRange: { min: 0.8, minInclusive: false, max: Number.POSITIVE_INFINITY, maxInclusive: false },
    population: `${HOSOI_POP}: high-speed group > 0.8 m/s (n = 36)`,
    walkingCondition: HOSOI_WALK,
    measurementSystem: HOSOI_SYSTEM,
    publishedValue: "MDC 0.21 m/s (comfortable speed, high-speed group)",
    citation: HOSOI,
    location: "abstract (results)",
  },
  {
    id: "speed-pd-combs-2014",
    metric: "walkingSpeedMPerS",
    condition: "parkinsons",
    kind: "absolute",
    value: 0.09,
    population: "people with Parkinson's disease, Hoehn & Yahr 1–4, mean age 66 y, on medication (n = 88)",
    walkingCondition: "comfortable 10-m walk test, test–retest (ICC(2,1) 0.98)",
    measurementSystem: "timed 10-m walk",
    publishedValue: "MDC95 0.09 m/s (comfortable walk test)",
    citation: "Combs et al. 2014, Gait & Posture 39:784",
    location: "abstract (results)",
  },
];

function inRange(v: number, r: NonNullable<PublishedMdc["baselineRange"]>): boolean {
  const aboveMin = r.minInclusive ? v >= r.min : v > r.min;
  const belowMax = r.maxInclusive ? v <= r.max : v < r.max;
  return aboveMin && belowMax;
}

/** The published MDC entry that fits this metric, condition and baseline mean, if any. */
export function publishedMdcFor(metricKey: string, condition: string, baselineMean: number): PublishedMdc | undefined {
  const base = metricDefinition(metricKey)?.base;
  if (!base) return undefined;
  return PUBLISHED_MDC.find(
    (p) => p.metric === base && p.condition === condition && (!p.baselineRange || inRange(baselineMean, p.baselineRange)),
  );
}

export const PATIENT_BASELINE_CITATION =
  "Patient's own baseline sessions: SEM = SD of the baseline values (n − 1), MDC95 = 1.96·√2·SEM (Weir 2005)";

export interface Baseline {
  /** Mean of the baseline sessions; for an angle, the circular mean in (−180°, 180°]. */
  mean: number;
  /** Sample SD (n − 1); for an angle, of the wrapped deviations from the circular mean. */
  sd: number;
  n: number;
}

export interface Mdc {
  value: number;
  source: "published" | "patient-baseline";
  citation: string;
  /** The SEM behind `value` (MDC95 / 2.772). */
  sem: number;
  /** Who, how and where the published value comes from; or how the baseline value was formed. */
  basis: string;
  /** The other estimate when both existed and this one was larger (see the module note). */
  alternative?: { value: number; source: "published" | "patient-baseline"; citation: string };
}

function publishedMdc(p: PublishedMdc, baseline: Baseline): Mdc | null {
  const value = p.kind === "absolute" ? p.value : (p.value / 100) * Math.abs(baseline.mean);
  if (!(value > 0)) return null;
  return {
    value,
    source: "published",
    citation: `${p.citation}, ${p.location}`,
    sem: value / MDC95_FACTOR,
    basis: `${p.publishedValue}; ${p.population}; ${p.walkingCondition}; ${p.measurementSystem}.`,
  };
}

function baselineMdc(baseline: Baseline): Mdc | null {
  if (baseline.n < 2 || !(baseline.sd > 0) || !Number.isFinite(baseline.sd)) return null;
  return {
    value: minimalDetectableChange95(baseline.sd),
    source: "patient-baseline",
    citation: PATIENT_BASELINE_CITATION,
    sem: baseline.sd,
    basis: `SD of this patient's first ${baseline.n} sessions; a rough estimate with few sessions.`,
  };
}

/**
 * The MDC95 for one patient and metric: the larger of the published value (where one fits the
 * condition and baseline speed group) and the patient-baseline value. `null` without a baseline,
 * or when neither applies (a baseline SD of 0 gives no usable error estimate: with so few
 * sessions it means "not measured", not "no error").
 */
export function resolveMdc(metricKey: string, condition: string, baseline: Baseline | null): Mdc | null {
  if (!baseline) return null;
  const entry = publishedMdcFor(metricKey, condition, baseline.mean);
  const published = entry ? publishedMdc(entry, baseline) : null;
  const own = baselineMdc(baseline);
  if (published && own) {
    const [larger, smaller] = own.value > published.value ? [own, published] : [published, own];
    return { ...larger, alternative: { value: smaller.value, source: smaller.source, citation: smaller.citation } };
  }
  return published ?? own;
}

/**
 * Published clinically important changes: how large a change patients or disability scales notice.
 * Shown beside the MDC for interpretation only; flags use the MDC alone. A change can exceed the
 * MDC (probably real) and still be smaller than these (perhaps not important), or the reverse.
 */
export interface ImportantChange {
  id: string;
  metric: BaseMetric;
  condition: string;
  /** The published thresholds in the metric's unit, smallest first, with their meaning. */
  thresholds: readonly { value: number; meaning: string }[];
  population: string;
  method: string;
  citation: string;
  location: string;
}

export const PUBLISHED_IMPORTANT_CHANGE: readonly ImportantChange[] = [
  {
    id: "speed-mcid-subacute-stroke-tilson-2010",
    metric: "walkingSpeedMPerS",
    condition: "stroke",
    thresholds: [{ value: 0.16, meaning: "minimal clinically important difference" }],
    population:
      "first-time stroke, 20 to 60 days after onset, with severe gait-speed impairment (mean comfortable speed 0.18 m/s at 20 days, 0.39 m/s at 60 days; n = 283); other stages of stroke were not studied",
    method: "comfortable gait speed anchored to a 1-point improvement of the modified Rankin Scale",
    citation: "Tilson et al. 2010, Phys Ther 90:196",
    location: "abstract (results)",
  },
  {
    id: "speed-important-pd-hass-2014",
    metric: "walkingSpeedMPerS",
    condition: "parkinsons",
    thresholds: [
      { value: 0.06, meaning: "small important difference" },
      { value: 0.14, meaning: "moderate important difference" },
      { value: 0.22, meaning: "large important difference" },
    ],
    population: "people with idiopathic Parkinson's disease on medication, a range of disease stages (n = 324)",
    method: "distribution-based effect sizes, gait speed on an instrumented walkway",
    citation: "Hass et al. 2014, J Neurol Phys Ther 38:233",
    location: "abstract (results)",
  },
];

export function importantChangeFor(metricKey: string, condition: string): ImportantChange | null {
  const base = metricDefinition(metricKey)?.base;
  return PUBLISHED_IMPORTANT_CHANGE.find((c) => c.metric === base && c.condition === condition) ?? null;
}
