/**
 * How precisely each metric leaves the server in a research export (JSON, CSV and FHIR alike).
 * Full-precision values are a fingerprint: a researcher who also sees a clinical screen could match
 * "cadence 97.3846" to one patient. Each value is rounded to a step no finer than a clinician would
 * act on, with the reason and, where there is one, the source beside it. "common practice" marks a
 * step we chose without a published value behind it.
 *
 * Rounding is half away from zero (0.025 → 0.05, −12.5 → −13), as in IEEE 754-2008's
 * roundTiesToAway; the fixture checks it against Python's decimal ROUND_HALF_UP.
 */
export interface ExportPrecision {
  /** The exported value is a whole multiple of this step, in the metric's unit. */
  step: number;
  /** Decimals that printing one step needs (0.05 → 2). */
  decimals: number;
  why: string;
}

const p = (step: number, why: string): ExportPrecision => ({ step, decimals: decimalsOf(step), why });

function decimalsOf(step: number): number {
  const text = String(step);
  const dot = text.indexOf(".");
  return dot < 0 ? 0 : text.length - dot - 1;
}

const TIME = "10 ms, one sample at 100 Hz; finer steps outrun the event detection (common practice)";
const PCT_PHASE = "whole percent of the gait cycle, the resolution stance and swing are reported at clinically (common practice)";
const CV = "0.1 %: healthy older adults' stride-time CV spans 1.58–2.30 % (Frenkel-Toledo et al. 2005, JNER 2:23), so a coarser step would erase the band";
const ASYM = "whole percent (common practice)";
const RATIO = "0.05 of an arm cycle per stride tells 1:1 from 2:1 and the states between (common practice)";
const PHASE = "5°, coarser than the relative-phase circular SD of steady walkers, so rounding does not hide a mode change (common practice)";
const R = "0.05 of the coupling strength R (0–1) (common practice)";
const SD_DEG = "whole degrees (common practice)";

export const EXPORT_PRECISION: Readonly<Record<string, ExportPrecision>> = {
  cadenceStepsPerMin: p(1, "whole steps per minute (common practice)"),
  walkingSpeedMPerS: p(0.05, "0.05 m/s, the smallest published MDC in our table (stroke, slow walkers: Hosoi et al. 2023, Front Neurol 14:1219505)"),
  strideLengthM: p(0.05, "5 cm, the stride-length counterpart of 0.05 m/s at about one stride per second (common practice)"),
  strideTimeMeanS: p(0.01, TIME),
  strideTimeCvPct: p(0.1, CV),
  stepTimeMeanSLeft: p(0.01, TIME),
  stepTimeMeanSRight: p(0.01, TIME),
  stepTimeAsymmetryPct: p(1, ASYM),
  stancePctLeft: p(1, PCT_PHASE),
  stancePctRight: p(1, PCT_PHASE),
  swingPctLeft: p(1, PCT_PHASE),
  swingPctRight: p(1, PCT_PHASE),
  swingTimeCvPctLeft: p(0.1, CV),
  swingTimeCvPctRight: p(0.1, CV),
  doubleSupportPct: p(1, PCT_PHASE),
  phaseCoordinationIndexPct: p(1, "whole percent: healthy 40–74-year-olds span 2.05–4.27 % (Zadik et al. 2022, Gait & Posture 96:87) and stroke 17.2–21.8 % (Meijer et al. 2011, JNER 8:23), so 1 % keeps both groups apart"),
  gaitAsymmetryPct: p(1, ASYM),
  dfaAlpha: p(0.01, "0.01: healthy young adults span 0.72–1.02 (Hausdorff et al. 1997, J Appl Physiol 82:262)"),
  steadyStrideCount: p(5, "counts to the nearest 5, like every count behind a value (common practice)"),
  armSwingAmplitudeDegLeft: p(1, SD_DEG),
  armSwingAmplitudeDegRight: p(1, SD_DEG),
  armSwingAsymmetryPct: p(1, ASYM),
  armLegLeftArmRightLegFrequencyRatio: p(0.05, RATIO),
  armLegLeftArmRightLegMeanRelativePhaseDeg: p(5, PHASE),
  armLegLeftArmRightLegCouplingStrength: p(0.05, R),
  armLegLeftArmRightLegCircularSdDeg: p(1, SD_DEG),
  armLegRightArmLeftLegFrequencyRatio: p(0.05, RATIO),
  armLegRightArmLeftLegMeanRelativePhaseDeg: p(5, PHASE),
  armLegRightArmLeftLegCouplingStrength: p(0.05, R),
  armLegRightArmLeftLegCircularSdDeg: p(1, SD_DEG),
};

/** The strides/steps/arm cycles behind a value are published to the nearest 5 (common practice): an exact count is as matchable as an exact value. */
export const COUNT_STEP = 5;

/** `value` as a whole multiple of `step`, ties away from zero, printed without binary noise (0.15000000000000002 → 0.15). */
export function roundToStep(value: number, step: number): number {
  if (!Number.isFinite(value)) throw new RangeError(`cannot round ${value}`);
  if (!(step > 0)) throw new RangeError(`step must be positive, got ${step}`);
  // The ratio is first cut to 9 significant digits, so 0.35 / 0.05 = 6.999999999999999 counts as the tie it is.
  const ratio = Number((Math.abs(value) / step).toPrecision(9));
  const units = Math.sign(value) * Math.floor(ratio + 0.5);
  const out = Number((units * step).toFixed(decimalsOf(step)));
  return Object.is(out, -0) ? 0 : out;
}

/** The exported value of metric `key`; throws for a metric without a precision entry, so a new metric cannot leave unrounded. */
export function exportValue(key: string, value: number | null): number | null {
  if (value === null || !Number.isFinite(value)) return null;
  const precision = EXPORT_PRECISION[key];
  if (!precision) throw new Error(`no export precision for metric ${key}`);
  return roundToStep(value, precision.step);
}

export function exportCount(n: number | null | undefined): number | null {
  if (n === null || n === undefined || !Number.isFinite(n)) return null;
  return roundToStep(n, COUNT_STEP);
}
