import { quantilesOfMasked } from "./quantile";

export interface InversionCheck {
  inverted: boolean;
  /** 99th percentile of ω over the mask. */
  upperDegS: number;
  /** Magnitude of the 1st percentile of ω over the mask. */
  lowerDegS: number;
}

/**
 * Shank: sagittal ω during walking has one dominant positive excursion per stride, the mid-swing
 * peak (Aminian 2002; Salarian 2004). If the largest excursions are negative instead (99th
 * percentile vs the magnitude of the 1st; docs/methods.md#upside-down-sensors, common practice) the
 * sensor is worn upside down or back to front and the signal must be negated.
 */
export function detectInvertedShank(omegaDegS: ArrayLike<number>, mask: Uint8Array): InversionCheck {
  const tails = quantilesOfMasked(omegaDegS, mask, [0.99, 0.01]);
  if (tails === null) return { inverted: false, upperDegS: 0, lowerDegS: 0 };
  const [upper, lower] = tails as [number, number];
  return { inverted: -lower > upper, upperDegS: upper, lowerDegS: -lower };
}

/**
 * Foot: the tallest excursion is the push-off (negative, toes rotating down), so the shank rule does
 * not apply. What distinguishes the sign is duration: the swing rotation (toes up, positive) is a
 * long plateau (~35–40 % of the cycle) while push-off and the heel-strike dip are brief. The foot is
 * taken as inverted when the mean length of excursions beyond −T exceeds that beyond +T, with
 * T = 20 % of the larger percentile (common practice; checked on open walking data).
 */
export function detectInvertedFoot(omegaDegS: ArrayLike<number>, mask: Uint8Array): InversionCheck {
  const tails = quantilesOfMasked(omegaDegS, mask, [0.99, 0.01]);
  if (tails === null) return { inverted: false, upperDegS: 0, lowerDegS: 0 };
  const [upper, lower] = tails as [number, number];
  const t = 0.2 * Math.max(upper, -lower);
  let posRuns = 0;
  let posLen = 0;
  let negRuns = 0;
  let negLen = 0;
  let sign = 0;
  for (let i = 0; i < omegaDegS.length; i++) {
    const v = mask[i] ? omegaDegS[i]! : 0;
    const s = v > t ? 1 : v < -t ? -1 : 0;
    if (s !== sign) {
      if (s === 1) posRuns++;
      if (s === -1) negRuns++;
      sign = s;
    }
    if (s === 1) posLen++;
    if (s === -1) negLen++;
  }
  const meanPos = posRuns > 0 ? posLen / posRuns : 0;
  const meanNeg = negRuns > 0 ? negLen / negRuns : 0;
  return { inverted: meanNeg > meanPos, upperDegS: upper, lowerDegS: -lower };
}
