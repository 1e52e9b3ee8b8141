import { assertPositiveFinite } from "../check";
import { ANGLE_HIGH_PASS_STRIDE_FRACTION, segmentAngleDeg } from "./segment-angle";

/**
 * Below this median range of motion (degrees per arm cycle) an arm counts as not swinging. Common
 * practice: above the few degrees of sagittal trunk rotation a held or braced arm shares with the
 * trunk during walking, far below free arm swing (tens of degrees at the wrist).
 */
export const NO_ARM_SWING_DEG = 5;
/** Fewer cycles than this and no amplitude is reported (common practice, as for coupling). */
export const MIN_ARM_SWING_CYCLES = 10;

export interface ArmSwingAmplitude {
  /** Median over cycles of the sagittal range of motion (max − min of the segment angle), degrees. */
  amplitudeDeg: number;
  cycleCount: number;
}

/**
 * Sagittal arm swing amplitude: the wrist's ω (forward-positive, deg/s) is integrated to the
 * forearm's sagittal angle (`segmentAngleDeg`, high-passed at 0.25 × the stride frequency), and
 * within each cycle [startS, endS) (a steady stride of the paired leg, so one arm cycle at 1:1 and
 * two at 2:1) the range max − min is taken; the median over cycles is reported, which is robust to a
 * few disturbed strides. Cycles that hold a non-finite or invalid sample are skipped. Returns null
 * with fewer than `MIN_ARM_SWING_CYCLES` usable cycles.
 */
export function armSwingAmplitude(
  armOmegaDegS: Float64Array,
  valid: Uint8Array,
  sampleRateHz: number,
  strideFrequencyHz: number,
  cycles: ReadonlyArray<{ startS: number; endS: number }>,
): ArmSwingAmplitude | null {
  assertPositiveFinite(sampleRateHz, "sampleRateHz");
  assertPositiveFinite(strideFrequencyHz, "strideFrequencyHz");
  const angle = segmentAngleDeg(armOmegaDegS, sampleRateHz, ANGLE_HIGH_PASS_STRIDE_FRACTION * strideFrequencyHz);
  const ranges: number[] = [];
  for (const c of cycles) {
    const from = Math.max(0, Math.ceil(c.startS * sampleRateHz));
    const to = Math.min(angle.length, Math.floor(c.endS * sampleRateHz));
    if (to - from < 3) continue;
    const range = rangeOfMotion(angle, armOmegaDegS, valid, from, to);
    if (range !== NOT_USABLE) ranges.push(range);
  }
  if (ranges.length < MIN_ARM_SWING_CYCLES) return null;
  ranges.sort((a, b) => a - b);
  const mid = ranges.length >> 1;
  const median = ranges.length % 2 === 1 ? ranges[mid]! : 0.5 * (ranges[mid - 1]! + ranges[mid]!);
  return { amplitudeDeg: median, cycleCount: ranges.length };
}

/** rangeOfMotion's answer for a cycle that holds an invalid or non-finite sample (a range is ≥ 0 or NaN). */
const NOT_USABLE = -1;

/**
 * max − min of angle[from, to), or NOT_USABLE when a sample there is invalid or its ω is not finite.
 * A small function of its own, so it is compiled once for every cycle of both arms instead of
 * armSwingAmplitude being compiled in the middle of its cycle loop.
 */
function rangeOfMotion(angle: Float64Array, omega: Float64Array, valid: Uint8Array, from: number, to: number): number {
  let lo = Number.POSITIVE_INFINITY;
  let hi = Number.NEGATIVE_INFINITY;
  for (let i = from; i < to; i++) {
    if (!valid[i] || !Number.isFinite(omega[i]!)) return NOT_USABLE;
    lo = Math.min(lo, angle[i]!);
    hi = Math.max(hi, angle[i]!);
  }
  return hi - lo;
}

/**
 * Arm swing asymmetry (%) as the magnitude of the symmetry angle of Zifchock et al. 2008 (Gait
 * Posture 27:622), the form Lewek et al. 2010 (Gait Posture 31:256) used for arm swing:
 * ASA = |45° − arctan(left/right)| / 90° × 100. 0 = equal swing, 50 = one arm still. Lewek et al.
 * report 5.1 ± 4.0 % in controls and 13.9 ± 7.9 % in early Parkinson's disease (abstract).
 * Null when either amplitude is missing or both are zero.
 */
export function armSwingAsymmetryPct(leftDeg: number | null, rightDeg: number | null): number | null {
  if (leftDeg === null || rightDeg === null || !Number.isFinite(leftDeg) || !Number.isFinite(rightDeg)) return null;
  if (leftDeg < 0 || rightDeg < 0 || (leftDeg === 0 && rightDeg === 0)) return null;
  const angleDeg = (Math.atan2(leftDeg, rightDeg) * 180) / Math.PI;
  return (Math.abs(45 - angleDeg) / 90) * 100;
}
