import { assertPositiveFinite } from "../check";
import { lowPassZeroPhase } from "../filter/zero-phase-butterworth";

/** High-pass corner for the integrated angle, as a fraction of the stride frequency (common practice). */
export const ANGLE_HIGH_PASS_STRIDE_FRACTION = 0.25;
/** Order (per pass) of the low-pass whose complement removes integration drift. */
const DRIFT_LOW_PASS_ORDER = 2;

/**
 * Sagittal segment angle (degrees) from its angular velocity: ω minus its mean over finite samples
 * (gyroscope bias), integrated with the trapezoid rule, then high-passed zero-phase by subtracting
 * a 2nd-order Butterworth low-pass at `highPassHz` run forward and backward. The complement of a
 * zero-phase low-pass is zero-phase too, so the angle keeps the timing of the true rotation; its
 * gain is 1 − 1/(1 + (f/fc)⁴), 0.996 at 4·fc, so with fc = 0.25 × the stride frequency the stride
 * and step rhythms keep their amplitude. Integration drift and posture changes (slow) are removed.
 *
 * Why angles: the angle-based coordination literature (segment or joint angles, Hilbert phase;
 * Lamb & Stöckl 2014, Clin Biomech 29:484) measures where a limb is, not how fast it turns. The
 * phase of ω leads the angle by 90° at every frequency, which cancels in a 1:1 relative phase but
 * not in 2:1 (90° − 2·90°), and ω weights harmonic k by k², which inflates a 2nd harmonic.
 *
 * Non-finite samples count as ω = 0 (no rotation) so one dropout cannot poison the integral; the
 * callers exclude such samples from every statistic.
 */
export function segmentAngleDeg(omegaDegS: ArrayLike<number>, sampleRateHz: number, highPassHz: number): Float64Array {
  assertPositiveFinite(sampleRateHz, "sampleRateHz");
  assertPositiveFinite(highPassHz, "highPassHz");
  const n = omegaDegS.length;
  if (n === 0) return new Float64Array(0);
  const angle = integrateTrapezoid(omegaDegS, finiteMean(omegaDegS), 1 / sampleRateHz);
  if (n < 4 || highPassHz >= sampleRateHz / 2) return angle;
  subtractInPlace(angle, lowPassZeroPhase(angle, sampleRateHz, highPassHz, DRIFT_LOW_PASS_ORDER));
  return angle;
}

// The sample loops are small functions of their own: called for every segment angle of the session,
// they are compiled once, instead of segmentAngleDeg being compiled (filter inlined) mid-loop per call.

/** Mean of the finite samples; 0 when there are none. */
function finiteMean(x: ArrayLike<number>): number {
  let mean = 0;
  let count = 0;
  for (let i = 0; i < x.length; i++) {
    const w = x[i]!;
    if (Number.isFinite(w)) {
      mean += w;
      count++;
    }
  }
  return count > 0 ? mean / count : 0;
}

/** Trapezoid integral of (ω − mean), starting at 0; non-finite samples count as ω − mean = 0. */
function integrateTrapezoid(omega: ArrayLike<number>, mean: number, dt: number): Float64Array {
  const n = omega.length;
  const angle = new Float64Array(n);
  let prev = Number.isFinite(omega[0]!) ? omega[0]! - mean : 0;
  for (let i = 1; i < n; i++) {
    const w = Number.isFinite(omega[i]!) ? omega[i]! - mean : 0;
    angle[i] = angle[i - 1]! + 0.5 * (prev + w) * dt;
    prev = w;
  }
  return angle;
}

function subtractInPlace(x: Float64Array, y: Float64Array): void {
  for (let i = 0; i < x.length; i++) x[i] = x[i]! - y[i]!;
}
