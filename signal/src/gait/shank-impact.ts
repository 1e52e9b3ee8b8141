import { butterworthSections } from "../filter/butterworth-sections";
import { zeroPhaseSegments3 } from "../filter/zero-phase-butterworth";
import { quantileOfMasked } from "../orientation/quantile";
import { IMPACT_HIGH_PASS_HZ } from "../timebase/impact-signal";

/** Shank accelerometer on the analysis grid (m/s², gravity included, any mounting). */
export interface ShankAcceleration {
  accX: ArrayLike<number>;
  accY: ArrayLike<number>;
  accZ: ArrayLike<number>;
}

/**
 * How far after the gyroscope IC the impact may lie (s): the +50 ms of Rampp et al. 2015's IC
 * refinement with the accelerometer (IEEE TBME 62:1089; window −80/+50 ms,
 * docs/methods.md#foot-sensor-events).
 */
export const IMPACT_SEARCH_AFTER_S = 0.05;
/**
 * How far before the gyroscope IC the impact may lie, as a fraction of the stride. The shank's first
 * ω minimum after swing is the loading-response minimum (knee flexing under load), and loading
 * response spans the first 10 % of the gait cycle (Perry & Burnfield 2010, phase boundaries), so the
 * contact is at most 10 % of the stride before it. A fraction, not Rampp's fixed 80 ms: the delay
 * grows with stride time (≈ 50 ms at 1.1 s strides, ≈ 100 ms at 2 s).
 */
export const IMPACT_SEARCH_BEFORE_FRACTION_OF_STRIDE = 0.1;
/**
 * An impact counts only when its high-passed magnitude is at least this multiple of the median of
 * the same signal over the walk (common practice): a heel strike is the largest short transient of
 * the stride, while the median is the ordinary high-frequency content of walking (strap ripple,
 * noise). Below it the gyroscope IC is kept.
 */
export const IMPACT_MIN_RATIO_TO_MEDIAN = 3;

/**
 * |acceleration high-passed at IMPACT_HIGH_PASS_HZ| per sample (m/s²): all three axes, so it does
 * not depend on mounting; gravity and the limb's own swing (< ~10 Hz) are removed. Zero-phase, so an
 * impact is not shifted in time. Null when the sampling rate leaves no band above the cut-off.
 * `work`, when given, is three arrays of the mask's length the caller no longer needs: the low-pass
 * is computed in them (see zeroPhaseSegments3), they are overwritten, and the first of them is
 * returned holding the magnitude.
 */
export function shankImpactMagnitude(
  acc: ShankAcceleration,
  mask: Uint8Array,
  sampleRateHz: number,
  work?: [Float64Array, Float64Array, Float64Array],
): Float64Array | null {
  if (IMPACT_HIGH_PASS_HZ >= 0.4 * sampleRateHz) return null;
  const sections = butterworthSections("lowpass", 4, IMPACT_HIGH_PASS_HZ, sampleRateHz);
  const axes = [acc.accX, acc.accY, acc.accZ] as const;
  const low = zeroPhaseSegments3(axes, [sections, sections, sections], mask, work);
  residualMagnitudeInto(axes[0], axes[1], axes[2], low[0], low[1], low[2], mask, low[0]);
  return low[0];
}

/**
 * out[i] = √((x − lx)² + (y − ly)² + (z − lz)²) where masked, 0 elsewhere (x − lx is the high-passed
 * axis), the squares added in axis order; out may be lx (each sample is read before it is written).
 * One loop of its own (compiled once, not inside shankImpactMagnitude with the segment filter inlined
 * while its first long loop runs). Every sample is read and its magnitude taken, masked or not (the
 * mask picks the magnitude or 0): a walk starts outside the mask, and a loop that skipped those
 * samples was compiled before it had read or computed anything, then compiled again when it did.
 */
function residualMagnitudeInto(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  z: ArrayLike<number>,
  lx: Float64Array,
  ly: Float64Array,
  lz: Float64Array,
  mask: Uint8Array,
  out: Float64Array,
): void {
  const n = mask.length;
  for (let i = 0; i < n; i++) {
    const on = mask[i]! > 0;
    const hx = x[i]! - lx[i]!;
    const hy = y[i]! - ly[i]!;
    const hz = z[i]! - lz[i]!;
    const magnitude = Math.sqrt(hx * hx + hy * hy + hz * hz);
    out[i] = on ? magnitude : 0;
  }
}

/**
 * Moves each gyroscope IC to the heel-strike impact felt by the same shank: the largest peak of the
 * impact magnitude from `IMPACT_SEARCH_BEFORE_FRACTION_OF_STRIDE` of the stride before the gyroscope
 * IC (never before that swing's mid-swing) to `IMPACT_SEARCH_AFTER_S` after it. The contact is the
 * impact; the gyroscope minimum follows it by the loading response. The gyroscope IC is kept when
 * there is no clear impact: the peak lies on the window's edge (still rising or falling, so the
 * transient is outside the window), the window leaves the mask, or the peak is below
 * `IMPACT_MIN_RATIO_TO_MEDIAN` × the walk's median.
 */
export function refineContactsToImpact(
  gyroIc: readonly number[],
  midSwingBefore: readonly number[],
  strideSamples: readonly number[],
  impact: Float64Array,
  mask: Uint8Array,
  sampleRateHz: number,
): number[] {
  const median = quantileOfMasked(impact, mask, 0.5) ?? 0;
  const floor = IMPACT_MIN_RATIO_TO_MEDIAN * median;
  const after = Math.max(1, Math.round(IMPACT_SEARCH_AFTER_S * sampleRateHz));
  return gyroIc.map((g, k) => {
    const a = Math.max(midSwingBefore[k]! + 1, g - Math.round(IMPACT_SEARCH_BEFORE_FRACTION_OF_STRIDE * strideSamples[k]!));
    const b = Math.min(impact.length - 1, g + after);
    if (a >= b) return g;
    let best = a;
    for (let i = a; i <= b; i++) {
      if (!mask[i]) return g;
      if (impact[i]! > impact[best]!) best = i;
    }
    if (best === a || best === b || !(impact[best]! > floor)) return g;
    return best;
  });
}
