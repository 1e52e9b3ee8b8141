import { butterworthSections } from "../filter";
import { sosFiltFilt3 } from "../filter/zero-phase-butterworth";

/**
 * Lower edge of the impact band (Hz). A heel strike is a short transient whose energy reaches well
 * above 20 Hz, while the limb's own swing accelerations lie below about 10 Hz (gait is a 1–2 Hz
 * movement with harmonics): a high-pass between the two keeps the impacts and drops the swing.
 * Common practice (no single source gives this number).
 */
export const IMPACT_HIGH_PASS_HZ = 15;
/** Envelope rate (Hz): 10 ms bins, the resolution the offset search works at before interpolation. */
export const IMPACT_ENVELOPE_RATE_HZ = 100;
/** Envelope samples this close to an invalid sample are dropped (the filter rings at data edges). */
const EDGE_GUARD_S = 0.1;

export interface ImpactEnvelope {
  /** |high-passed acceleration| (m/s²) per bin; 0 where not valid. */
  envelope: Float32Array;
  /** 1 where the bin is covered by valid data clear of its edges. */
  valid: Uint8Array;
  /** Bin rate (Hz); bin k covers grid samples [k·factor, (k+1)·factor). */
  rateHz: number;
  /** Grid samples per bin. */
  factor: number;
}

/**
 * The impact signal of one sensor on the session grid: magnitude of the zero-phase high-passed
 * acceleration vector (all three axes, so it does not depend on how the sensor is mounted), on
 * ~100 Hz bins (10 ms: the resolution the lag search starts from before sub-bin interpolation).
 */
export function impactEnvelope(
  accX: ArrayLike<number>,
  accY: ArrayLike<number>,
  accZ: ArrayLike<number>,
  valid: Uint8Array,
  sampleRateHz: number,
): ImpactEnvelope {
  const n = valid.length;
  const factor = Math.max(1, Math.floor(sampleRateHz / IMPACT_ENVELOPE_RATE_HZ));
  const rateHz = sampleRateHz / factor;
  const m = Math.floor(n / factor);
  const envelope = new Float32Array(m);
  const binValid = new Uint8Array(m);
  // The high-pass needs a cut-off below Nyquist; at very low rates there is no impact band at all.
  if (m < 16 || IMPACT_HIGH_PASS_HZ >= 0.45 * rateHz) return { envelope, valid: binValid, rateHz, factor };
  // Bin means first (a fast recording's content above the bin rate's Nyquist folds into the band,
  // where it is still impact energy), then one high-pass per axis at the bin rate: a jolt across
  // the gravity direction barely moves |a|, so the axes are filtered, not the magnitude.
  const binOk = new Uint8Array(m);
  const mx = new Float64Array(m);
  const my = new Float64Array(m);
  const mz = new Float64Array(m);
  binMeansHoldingLast(accX, accY, accZ, valid, factor, binOk, mx, my, mz);
  const sections = butterworthSections("highpass", 4, IMPACT_HIGH_PASS_HZ, rateHz);
  const [hx, hy, hz] = sosFiltFilt3([sections, sections, sections], [mx, my, mz]);
  guardedMagnitude(binOk, Math.round(EDGE_GUARD_S * rateHz), hx, hy, hz, binValid, envelope);
  return { envelope, valid: binValid, rateHz, factor };
}

// The bin loops are small functions of their own, so the engine compiles them rather than the whole
// of impactEnvelope (filters inlined) in the middle of its first long loop.

/**
 * Per bin of `factor` samples: binOk = all samples valid, and the mean of each axis. Invalid bins
 * hold the last valid value, so the filter sees no step there (they are dropped anyway).
 */
function binMeansHoldingLast(
  accX: ArrayLike<number>,
  accY: ArrayLike<number>,
  accZ: ArrayLike<number>,
  valid: Uint8Array,
  factor: number,
  binOk: Uint8Array,
  mx: Float64Array,
  my: Float64Array,
  mz: Float64Array,
): void {
  let lastX = 0;
  let lastY = 0;
  let lastZ = 0;
  for (let k = 0; k < binOk.length; k++) {
    let sx = 0;
    let sy = 0;
    let sz = 0;
    let ok = 1;
    for (let i = k * factor; i < (k + 1) * factor; i++) {
      ok &= valid[i]!;
      sx += accX[i]!;
      sy += accY[i]!;
      sz += accZ[i]!;
    }
    binOk[k] = ok;
    if (ok) {
      lastX = sx / factor;
      lastY = sy / factor;
      lastZ = sz / factor;
    }
    mx[k] = lastX;
    my[k] = lastY;
    mz[k] = lastZ;
  }
}

/**
 * Bins more than `guard` bins from any invalid one (forward and backward distance; the array's ends
 * count as edges) are valid and get |(hx, hy, hz)|; the rest stay 0.
 */
function guardedMagnitude(binOk: Uint8Array, guard: number, hx: Float64Array, hy: Float64Array, hz: Float64Array, binValid: Uint8Array, envelope: Float32Array): void {
  validAfterGuard(binOk, guard, binValid);
  magnitudeBeforeGuard(binOk, guard, hx, hy, hz, binValid, envelope);
}

/** Forward distance: binValid = 1 where more than `guard` valid bins run up to and including k. */
function validAfterGuard(binOk: Uint8Array, guard: number, binValid: Uint8Array): void {
  let run = 0; // valid bins since the last invalid one
  for (let k = 0; k < binOk.length; k++) {
    run = binOk[k] ? run + 1 : 0;
    binValid[k] = run > guard ? 1 : 0;
  }
}

/** Backward distance: clears binValid within `guard` bins before an invalid one; the rest get |(hx, hy, hz)|. */
function magnitudeBeforeGuard(binOk: Uint8Array, guard: number, hx: Float64Array, hy: Float64Array, hz: Float64Array, binValid: Uint8Array, envelope: Float32Array): void {
  let run = 0;
  for (let k = binOk.length - 1; k >= 0; k--) {
    run = binOk[k] ? run + 1 : 0;
    if (run <= guard) binValid[k] = 0;
    if (binValid[k]) envelope[k] = Math.sqrt(hx[k]! * hx[k]! + hy[k]! * hy[k]! + hz[k]! * hz[k]!);
  }
}
