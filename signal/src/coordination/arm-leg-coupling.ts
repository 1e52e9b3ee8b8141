import { assertPositiveFinite, assertSameLength } from "../check";
import type { ArmLegCoupling } from "../types";
import { BAND_HIGH_FACTOR, bandPassAroundFundamental } from "./band-pass";
import { circularStats } from "./circular-stats";
import { dominantFrequency } from "./dominant-frequency";
import { frequencyRatio } from "./frequency-ratio";
import { hilbertPhase } from "./hilbert";
import { relativePhase } from "./relative-phase";

/** Coupling that could not be computed (no arm rhythm, too little steady walking, bad input). */
export const UNAVAILABLE_COUPLING: Readonly<ArmLegCoupling> = Object.freeze({
  frequencyRatio: null,
  meanRelativePhaseDeg: null,
  couplingStrength: null,
  circularSdDeg: null,
});

// Project choices (no published source; documented here and in the report):
/** Fewer steady strides than this and R is not reported (10 cycles keep R's bias under ~0.1). */
export const MIN_STEADY_STRIDES = 10;
/** Arm peak PSD must stand this far above the median of the search band to count as a rhythm. */
export const MIN_PEAK_TO_MEDIAN = 5;
/** Band-passed arm RMS below this (deg/s) is treated as no arm swing. */
export const MIN_ARM_RMS_DEG_S = 1;
/** The arm's fundamental is searched between these multiples of the stride frequency. */
export const ARM_SEARCH_LOW = 0.4;
export const ARM_SEARCH_HIGH = 2.6;

/**
 * Arm–leg coordination for one arm and the leg it is paired with (issue 3, §6): the arm's
 * fundamental from its Welch peak gives the frequency ratio (arm cycles per stride, snapped to 1 or
 * 2 within 15 %); each segment's sagittal angular velocity is band-passed zero-phase (Butterworth
 * order 4, 0.7–1.3 × its own fundamental: ratio × stride frequency for the arm, stride frequency
 * for the leg), its Hilbert phase taken, and ψ = φ_arm − n·φ_leg (n = the ratio rounded, ≥ 1) is
 * summarised over steady-state samples: circular mean (degrees, (−180, 180]), mean resultant
 * length R (`couplingStrength`) and circular SD √(−2 ln R) in degrees.
 *
 * Both signals are first reduced to ≈ 12.5 Hz (or 13.5 × the stride frequency if higher, i.e.
 * ≥ 4 × the highest band edge the arm search allows) by averaging blocks of D samples: the block
 * mean has its zeros exactly at multiples of the new rate, so little folds into the gait band, it
 * shifts arm and leg alike (ψ unchanged) and it keeps the FFT work of the Hilbert step small
 * for 30-minute recordings. A block counts as steady
 * only when all its samples do. Non-finite samples are set to 0 and left out of the steady set.
 *
 * Returns `UNAVAILABLE_COUPLING` when the stride frequency is unusable, there are fewer than
 * `MIN_STEADY_STRIDES` strides' worth of steady samples, or the arm shows no rhythm.
 */
export function armLegCoupling(
  armOmegaDegS: Float64Array,
  legOmegaDegS: Float64Array,
  sampleRateHz: number,
  strideFrequencyHz: number,
  steadyMask: Uint8Array,
): ArmLegCoupling {
  assertSameLength(armOmegaDegS, legOmegaDegS, "armOmegaDegS and legOmegaDegS");
  assertSameLength(armOmegaDegS, steadyMask, "armOmegaDegS and steadyMask");
  assertPositiveFinite(sampleRateHz, "sampleRateHz");
  if (!Number.isFinite(strideFrequencyHz) || strideFrequencyHz <= 0) return { ...UNAVAILABLE_COUPLING };

  const targetHz = Math.max(12.5, 13.5 * strideFrequencyHz);
  const factor = Math.max(1, Math.floor(sampleRateHz / targetHz));
  const rateHz = sampleRateHz / factor;
  const { arm, leg, mask, steadyCount } = decimate(armOmegaDegS, legOmegaDegS, steadyMask, factor);
  if (steadyCount < (MIN_STEADY_STRIDES * rateHz) / strideFrequencyHz) return { ...UNAVAILABLE_COUPLING };

  const peak = findArmPeak(arm, rateHz, strideFrequencyHz, mask);
  if (!peak || peak.peakToMedian < MIN_PEAK_TO_MEDIAN) return { ...UNAVAILABLE_COUPLING };

  const ratio = frequencyRatio(peak.frequencyHz, strideFrequencyHz);
  const armFundamentalHz = ratio * strideFrequencyHz;
  if (BAND_HIGH_FACTOR * armFundamentalHz >= 0.45 * rateHz) return { ...UNAVAILABLE_COUPLING };

  const armBand = bandPassAroundFundamental(arm, rateHz, armFundamentalHz);
  const legBand = bandPassAroundFundamental(leg, rateHz, strideFrequencyHz);
  let sumSq = 0;
  for (let i = 0; i < armBand.length; i++) if (mask[i] === 1) sumSq += armBand[i]! * armBand[i]!;
  if (Math.sqrt(sumSq / steadyCount) < MIN_ARM_RMS_DEG_S) return { ...UNAVAILABLE_COUPLING };

  const n = Math.max(1, Math.round(ratio));
  const psi = relativePhase(hilbertPhase(armBand), hilbertPhase(legBand), n);
  const stats = circularStats(psi, mask);
  if (!stats || Number.isNaN(stats.meanRad)) return { ...UNAVAILABLE_COUPLING, frequencyRatio: ratio };
  const deg = 180 / Math.PI;
  return {
    frequencyRatio: ratio,
    meanRelativePhaseDeg: stats.meanRad * deg,
    couplingStrength: stats.resultantLength,
    circularSdDeg: stats.sdRad * deg,
  };
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
  let steadyCount = 0;
  for (let b = 0; b < blocks; b++) {
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
  return { arm, leg, mask, steadyCount };
}

/** Welch peak of the arm over steady samples: 16-stride segments, relaxed to 8 strides / half steady. */
function findArmPeak(arm: Float64Array, rateHz: number, strideHz: number, mask: Uint8Array) {
  for (const strides of [16, 8]) {
    for (const minMaskFraction of [1, 0.5]) {
      const peak = dominantFrequency(arm, rateHz, {
        minHz: ARM_SEARCH_LOW * strideHz,
        maxHz: ARM_SEARCH_HIGH * strideHz,
        segmentS: strides / strideHz,
        mask,
        minMaskFraction,
      });
      if (peak) return peak;
    }
  }
  return null;
}
