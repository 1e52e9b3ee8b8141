/**
 * Measurement error and the smallest real change.
 *
 * SEM = SD·√(1 − ICC) and MDC95 = 1.96·√2·SEM (Weir 2005, J Strength Cond Res 19:231 — formula as
 * collected in DOMAIN.md §7, marked there as from memory). The √2 is there because a change is the
 * difference of two measurements, each carrying error.
 *
 * Where a published test–retest value exists for the patient's condition and metric it is used;
 * otherwise the patient's own baseline sessions give the error: repeated sessions of one person
 * while stable are a test–retest sample of size one, whose within-person SD estimates the SEM
 * (SEM = √MSE, Weir 2005 — from memory).
 */
import type { BaseMetric } from "./metric-catalog";
import { resolveMetricKey } from "./metric-catalog";

/** 1.96·√2 = 2.7718585822512662 (DOMAIN.md §7: 2.772; §"check values": 2.7719). */
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

/** ICC bands of Koo & Li 2016 (J Chiropr Med 15:155), as collected in DOMAIN.md §7 (from memory). */
export function iccBand(icc: number): "poor" | "moderate" | "good" | "excellent" {
  if (!Number.isFinite(icc) || icc < -1 || icc > 1) throw new RangeError("iccBand: icc must be in [-1, 1]");
  if (icc < 0.5) return "poor";
  if (icc < 0.75) return "moderate";
  if (icc <= 0.9) return "good";
  return "excellent";
}

export interface PublishedMdc {
  metric: BaseMetric;
  condition: string;
  /** MDC95 as a percentage of the group mean (MDC%), applied to the patient's baseline mean. */
  mdcPctOfMean: number;
  citation: string;
  confirmed: boolean;
}

/**
 * Only the values actually seen in a source. Nair, Hornby & Behrman 2012 report MDC% from 21 %
 * (cadence) to 80 % (double support) in incomplete SCI; the metrics between those two ends are not
 * in our notes, so they are not listed — those metrics fall back to the patient's baseline.
 * Published ICCs without the sample SD (e.g. PCI ICC 0.566, Richmond 2025) cannot give an SEM for
 * one patient and are not used.
 */
export const PUBLISHED_MDC: readonly PublishedMdc[] = [
  {
    metric: "cadenceStepsPerMin",
    condition: "incomplete_sci",
    mdcPctOfMean: 21,
    citation: "Nair, Hornby & Behrman 2012, incomplete SCI test–retest: MDC% 21 % (cadence)",
    confirmed: true,
  },
  {
    metric: "doubleSupportPct",
    condition: "incomplete_sci",
    mdcPctOfMean: 80,
    citation: "Nair, Hornby & Behrman 2012, incomplete SCI test–retest: MDC% 80 % (double support)",
    confirmed: true,
  },
];

export const PATIENT_BASELINE_CITATION =
  "Patient's own baseline sessions: SEM = SD of the baseline values (n − 1), MDC95 = 1.96·√2·SEM (Weir 2005)";

export interface Baseline {
  mean: number;
  sd: number;
  n: number;
}

export interface Mdc {
  value: number;
  source: "published" | "patient-baseline";
  citation: string;
  confirmed: boolean;
  /** The SEM behind `value` (MDC95 / 2.772). */
  sem: number;
}

/**
 * The MDC95 for one patient and metric: published where a value fits the condition, else from the
 * baseline. `null` when neither applies (baseline SD of 0 gives no usable error estimate: with so
 * few sessions it means "not measured", not "no error").
 */
export function resolveMdc(metricKey: string, condition: string, baseline: Baseline | null): Mdc | null {
  if (!baseline) return null;
  const resolved = resolveMetricKey(metricKey);
  const published = resolved
    ? PUBLISHED_MDC.find((p) => p.metric === resolved.base && p.condition === condition)
    : undefined;
  if (published && baseline.mean > 0) {
    const value = (published.mdcPctOfMean / 100) * Math.abs(baseline.mean);
    return { value, source: "published", citation: published.citation, confirmed: published.confirmed, sem: value / MDC95_FACTOR };
  }
  if (baseline.n < 2 || !(baseline.sd > 0)) return null;
  return {
    value: minimalDetectableChange95(baseline.sd),
    source: "patient-baseline",
    citation: PATIENT_BASELINE_CITATION,
    confirmed: false,
    sem: baseline.sd,
  };
}
