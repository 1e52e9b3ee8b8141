import { butterworthSections, sosFiltFilt } from "../filter";

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
  /** |high-passed acceleration| (m/s²), block maximum per bin; 0 where not valid. */
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
 * acceleration vector (all three axes, so it does not depend on how the sensor is mounted), reduced
 * to ~100 Hz bins by the block maximum (a transient survives decimation; a mean would blur it).
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
  if (n < 16 || IMPACT_HIGH_PASS_HZ >= 0.45 * sampleRateHz) return { envelope, valid: binValid, rateHz, factor };
  const sections = butterworthSections("highpass", 4, IMPACT_HIGH_PASS_HZ, sampleRateHz);
  const hx = sosFiltFilt(sections, accX);
  const hy = sosFiltFilt(sections, accY);
  const hz = sosFiltFilt(sections, accZ);
  // Valid samples at least EDGE_GUARD_S from any invalid one (forward and backward distance).
  const guard = Math.round(EDGE_GUARD_S * sampleRateHz);
  const clear = new Uint8Array(n);
  let run = 0; // valid samples since the last invalid one (the array's start counts as an edge)
  for (let i = 0; i < n; i++) {
    run = valid[i] ? run + 1 : 0;
    clear[i] = run > guard ? 1 : 0;
  }
  run = 0;
  for (let i = n - 1; i >= 0; i--) {
    run = valid[i] ? run + 1 : 0;
    if (run <= guard) clear[i] = 0;
  }
  for (let k = 0; k < m; k++) {
    let peak = 0;
    let ok = 1;
    for (let i = k * factor; i < (k + 1) * factor; i++) {
      if (!clear[i]) {
        ok = 0;
        break;
      }
      const v = Math.hypot(hx[i]!, hy[i]!, hz[i]!);
      if (v > peak) peak = v;
    }
    if (ok) {
      envelope[k] = peak;
      binValid[k] = 1;
    }
  }
  return { envelope, valid: binValid, rateHz, factor };
}
