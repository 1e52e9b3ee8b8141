/**
 * Steady-state band of one walking bout's stride times, and which strides fall outside it.
 *
 * Outlier rule: the Hampel identifier — median ± k·1.4826·MAD (Hampel 1974, J Am Stat Assoc 69:383;
 * Leys et al. 2013, J Exp Soc Psychol 49:764, who call k = 3 "very conservative" and advise against
 * mean ± SD because the outliers inflate the SD they are judged by). The centre is the bout's own
 * median, so two bouts at different paces are each judged against their own pace.
 *
 * Acceleration and deceleration: gait before the steady-state level is reached is not steady-state
 * gait (Lindemann et al. 2008, Gait Posture 27:91: frail older adults reach steady speed after
 * 1.4 m, 89 % after 2.5 m; exclude the start). Operationalised here without speed: the leading and
 * trailing runs of a bout's strides (time order, both legs) that lie outside the band are the
 * acceleration and deceleration phases ("unsteady"); a stride outside the band between steady ones
 * is an isolated outlier ("out-of-range"). A treadmill belt that takes 10–20 s to reach speed, or a
 * patient's first metres from standing, both show up as such a leading run.
 */

/** Hampel threshold in robust SDs (Leys et al. 2013: 3 = very conservative, 2.5 = moderate). */
export const HAMPEL_K = 3;
/** MAD → SD for normally distributed data (1/Φ⁻¹(3/4)). */
export const MAD_TO_SD = 1.4826;
/**
 * The band is never narrower than ± this fraction of the median: 3 × 1.94 %, i.e. three times the
 * stride-time CV of healthy older adults (Frenkel-Toledo et al. 2005, J NeuroEng Rehabil 2:23,
 * Table 2). A very regular walker (MAD near 0, or a few quantised event times) then keeps strides
 * that differ by no more than healthy stride-to-stride variation.
 */
export const MIN_BAND_FRACTION = 3 * 0.0194;

export type SteadyLabel = "steady" | "unsteady" | "out-of-range";

export interface SteadyBand {
  medianS: number;
  halfWidthS: number;
}

/** Median of a list (null when empty); the list is not modified. */
export function median(values: readonly number[]): number | null {
  if (values.length === 0) return null;
  const s = [...values].sort((a, b) => a - b);
  const h = s.length >> 1;
  return s.length % 2 === 1 ? s[h]! : (s[h - 1]! + s[h]!) / 2;
}

/**
 * Robust SD (1.4826·MAD) of stride times pooled WITHIN bouts: each value's absolute deviation from
 * its own bout's median, so a change of pace between bouts does not widen the band. Null when
 * there are no values.
 */
export function pooledRobustSdS(bouts: readonly (readonly number[])[]): number | null {
  const dev: number[] = [];
  for (const b of bouts) {
    const m = median(b);
    if (m === null) continue;
    for (const v of b) dev.push(Math.abs(v - m));
  }
  const mad = median(dev);
  return mad === null ? null : MAD_TO_SD * mad;
}

/** The band of one bout: its median ± max(HAMPEL_K·robustSd, MIN_BAND_FRACTION·median). */
export function steadyBand(boutStrideTimesS: readonly number[], robustSdS: number): SteadyBand | null {
  const m = median(boutStrideTimesS);
  if (m === null) return null;
  return { medianS: m, halfWidthS: Math.max(HAMPEL_K * robustSdS, MIN_BAND_FRACTION * m) };
}

/**
 * Labels one bout's stride times (in time order) against its band: leading and trailing runs
 * outside the band are "unsteady", other strides outside it "out-of-range", the rest "steady".
 */
export function labelSteadyState(strideTimesS: readonly number[], band: SteadyBand): SteadyLabel[] {
  const inside = strideTimesS.map((t) => Math.abs(t - band.medianS) <= band.halfWidthS);
  const labels: SteadyLabel[] = inside.map((ok) => (ok ? "steady" : "out-of-range"));
  for (let i = 0; i < inside.length && !inside[i]; i++) labels[i] = "unsteady";
  for (let i = inside.length - 1; i >= 0 && !inside[i]; i--) labels[i] = "unsteady";
  return labels;
}
