import { assertPositiveFinite, assertSameLength } from "../check";
import type { ArmLegCoupling } from "../types";
import { type ArmRhythm, armRhythm } from "./arm-rhythm";
import { BAND_HIGH_FACTOR, bandPassAroundFundamental } from "./band-pass";
import { circularStats } from "./circular-stats";
import { hilbertPhasePair } from "./hilbert";
import { relativePhase } from "./relative-phase";
import { ANGLE_HIGH_PASS_STRIDE_FRACTION, segmentAngleDeg } from "./segment-angle";

/** Coupling that could not be computed (no arm rhythm, too little steady walking, bad input). */
export const UNAVAILABLE_COUPLING: Readonly<ArmLegCoupling> = Object.freeze({
  frequencyRatio: null,
  meanRelativePhaseDeg: null,
  couplingStrength: null,
  circularSdDeg: null,
  reason: null,
});

/** Fewer steady strides than this and nothing is reported (common practice: R's bias < ~0.1 by 10 cycles). */
export const MIN_STEADY_STRIDES = 10;
/**
 * The mean relative phase is reported only when R reaches this (common practice: circular SD
 * √(−2 ln 0.5) = 68°; below it the "mean" describes a spread, not a pattern) …
 */
export const MIN_COUPLING_STRENGTH = 0.5;
/**
 * … and when the Rayleigh test rejects a uniform phase at this level, with one phase per stride:
 * 2nR² is asymptotically χ²(2), so p ≈ exp(−nR²) (Rayleigh test; Mardia & Jupp 2000,
 * Directional Statistics, §6.3). With 10 strides this asks R ≥ 0.55, with 30 strides R ≥ 0.32.
 */
export const RAYLEIGH_ALPHA = 0.05;
/** Band-passed arm angle RMS below this (degrees) is no measurable rhythm (common practice). */
export const MIN_ARM_ANGLE_RMS_DEG = 0.5;

export interface ArmLegCouplingDetail extends ArmLegCoupling {
  /** Strides' worth of steady samples the statistics used. */
  strideCount: number;
  rhythm: ArmRhythm | null;
}

/**
 * Arm–leg coordination for one arm and the leg it is paired with, on sagittal segment ANGLES.
 *
 * 1. Both ω signals are reduced to ≈ 12.5 Hz (or 13.5 × the stride frequency) by block means (zeros
 *    of the block mean sit at multiples of the new rate, and arm and leg shift alike).
 * 2. Each is integrated to a segment angle and high-passed zero-phase at 0.25 × f_stride
 *    (`segmentAngleDeg`), so phases compare with the angle-based literature at 1:1 and 2:1 alike.
 * 3. The frequency ratio comes from the arm angle's spectrum with a harmonic check (`armRhythm`).
 * 4. Each angle is band-passed zero-phase around its own fundamental (0.7–1.3 × ratio × f_stride for
 *    the arm, × f_stride for the leg), its Hilbert phase taken (Lamb & Stöckl 2014: centre, Hilbert,
 *    phase), and ψ = φ_arm − n·φ_leg with n = the ratio rounded (n:1 locking).
 * 5. Over steady samples: R (`couplingStrength`), circular SD √(−2 ln R) and the circular mean,
 *    which is reported only when R ≥ 0.5 and the Rayleigh test gives p < 0.05 with one phase per
 *    stride; otherwise it is null and `reason` says why. A mixed 1:1/2:1 rhythm never gets a mean.
 *
 * Convention: ψ in (−180°, 180°]; positive = the arm reaches its most forward angle before the leg
 * (arm leads). Both ω must be signed forward-positive (leg: swing forward; arm: shoulder flexion).
 */
export function armLegCouplingDetail(
  armOmegaDegS: Float64Array,
  legOmegaDegS: Float64Array,
  sampleRateHz: number,
  strideFrequencyHz: number,
  steadyMask: Uint8Array,
): ArmLegCouplingDetail {
  assertSameLength(armOmegaDegS, legOmegaDegS, "armOmegaDegS and legOmegaDegS");
  assertSameLength(armOmegaDegS, steadyMask, "armOmegaDegS and steadyMask");
  assertPositiveFinite(sampleRateHz, "sampleRateHz");
  const none = (reason: string, strideCount = 0, rhythm: ArmRhythm | null = null): ArmLegCouplingDetail => ({
    ...UNAVAILABLE_COUPLING,
    reason,
    strideCount,
    rhythm,
  });
  if (!Number.isFinite(strideFrequencyHz) || strideFrequencyHz <= 0) return none("no stride frequency (no steady strides)");

  const targetHz = Math.max(12.5, 13.5 * strideFrequencyHz);
  const factor = Math.max(1, Math.floor(sampleRateHz / targetHz));
  const rateHz = sampleRateHz / factor;
  const { arm, leg, mask, steadyCount } = decimate(armOmegaDegS, legOmegaDegS, steadyMask, factor);
  const strideCount = Math.floor((steadyCount * strideFrequencyHz) / rateHz);
  if (strideCount < MIN_STEADY_STRIDES) {
    return none(`only ${strideCount} steady strides with arm data; at least ${MIN_STEADY_STRIDES} are needed`, strideCount);
  }
  const highPassHz = ANGLE_HIGH_PASS_STRIDE_FRACTION * strideFrequencyHz;
  const armAngle = segmentAngleDeg(arm, rateHz, highPassHz);
  const legAngle = segmentAngleDeg(leg, rateHz, highPassHz);

  const rhythm = armRhythm(armAngle, rateHz, strideFrequencyHz, mask);
  if (!rhythm) return none("no arm rhythm stands out in the walking spectrum", strideCount);
  const n = Math.max(1, Math.round(rhythm.frequencyRatio));
  const armFundamentalHz = n * strideFrequencyHz;
  if (BAND_HIGH_FACTOR * armFundamentalHz >= 0.45 * rateHz) return none("arm rhythm too fast for the sampling rate", strideCount, rhythm);

  const armBand = bandPassAroundFundamental(armAngle, rateHz, armFundamentalHz);
  const legBand = bandPassAroundFundamental(legAngle, rateHz, strideFrequencyHz);
  if (Math.sqrt(maskedSumOfSquares(armBand, mask) / steadyCount) < MIN_ARM_ANGLE_RMS_DEG) {
    return { ...none("arm rhythm below the measurable amplitude", strideCount, rhythm), frequencyRatio: rhythm.frequencyRatio };
  }

  const [armPhase, legPhase] = hilbertPhasePair(armBand, legBand);
  const psi = relativePhase(armPhase, legPhase, n);
  const stats = circularStats(psi, mask);
  if (!stats) return none("no steady samples", strideCount, rhythm);
  const deg = 180 / Math.PI;
  const r = stats.resultantLength;
  const rayleighP = Math.exp(-strideCount * r * r);
  let reason: string | null = null;
  if (rhythm.mode === "mixed") reason = "the arm swings partly at stride and partly at step frequency; no single relative phase";
  else if (r < MIN_COUPLING_STRENGTH) reason = `coupling too weak for a mean phase (R ${r.toFixed(2)} < ${MIN_COUPLING_STRENGTH})`;
  else if (!(rayleighP < RAYLEIGH_ALPHA)) reason = `phase not distinguishable from uniform over ${strideCount} strides (Rayleigh p ${rayleighP.toFixed(2)})`;
  return {
    frequencyRatio: rhythm.frequencyRatio,
    meanRelativePhaseDeg: reason === null && Number.isFinite(stats.meanRad) ? stats.meanRad * deg : null,
    couplingStrength: r,
    circularSdDeg: stats.sdRad * deg,
    reason,
    strideCount,
    rhythm,
  };
}

/** `armLegCouplingDetail` without the diagnostics: the shape stored in the analysis. */
export function armLegCoupling(
  armOmegaDegS: Float64Array,
  legOmegaDegS: Float64Array,
  sampleRateHz: number,
  strideFrequencyHz: number,
  steadyMask: Uint8Array,
): ArmLegCoupling {
  const { strideCount: _count, rhythm: _rhythm, ...coupling } = armLegCouplingDetail(armOmegaDegS, legOmegaDegS, sampleRateHz, strideFrequencyHz, steadyMask);
  return coupling;
}

function decimate(
  armIn: Float64Array,
  legIn: Float64Array,
  steadyIn: Uint8Array,
  factor: number,
): { arm: Float64Array; leg: Float64Array; mask: Uint8Array; steadyCount: number } {
  const blocks = Math.floor(armIn.length / factor);
  const arm = new Float64Array(blocks);
  const leg = new Float64Array(blocks);
  const mask = new Uint8Array(blocks);
  const steadyCount = blockMeans(armIn, legIn, steadyIn, factor, arm, leg, mask);
  return { arm, leg, mask, steadyCount };
}

// The sample loops are small functions of their own that end in a plain return: each is compiled
// once for both arms, instead of its caller being compiled mid-loop and dropped after it.

/**
 * Per block of `factor` samples: the arm's and the leg's mean (sums over the finite pairs, divided by
 * the block length) and mask 1 when every pair is finite and steady. Returns the number of such blocks.
 */
function blockMeans(armIn: Float64Array, legIn: Float64Array, steadyIn: Uint8Array, factor: number, arm: Float64Array, leg: Float64Array, mask: Uint8Array): number {
  let steadyCount = 0;
  for (let b = 0; b < mask.length; b++) {
    let sa = 0;
    let sl = 0;
    let ok = 1;
    for (let j = b * factor, end = j + factor; j < end; j++) {
      const a = armIn[j]!;
      const l = legIn[j]!;
      if (Number.isFinite(a) && Number.isFinite(l)) {
        sa += a;
        sl += l;
      } else ok = 0;
      if (steadyIn[j] !== 1) ok = 0;
    }
    arm[b] = sa / factor;
    leg[b] = sl / factor;
    mask[b] = ok;
    steadyCount += ok;
  }
  return steadyCount;
}

/** Σ x[i]² over mask[i] = 1, in index order. */
function maskedSumOfSquares(x: Float64Array, mask: Uint8Array): number {
  let sumSq = 0;
  for (let i = 0; i < x.length; i++) if (mask[i] === 1) sumSq += x[i]! * x[i]!;
  return sumSq;
}
