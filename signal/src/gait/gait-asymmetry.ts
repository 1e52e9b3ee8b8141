/**
 * Gait asymmetry GA = 100·|ln(SSWT / LSWT)| from the mean swing times of the two legs (Plotnik et
 * al. 2007; Yogev et al. 2007, Exp Brain Res 177:336 — formula checked against Yogev 2007). Null when either is missing or
 * not positive.
 */
export function gaitAsymmetryPct(meanSwingLeftS: number | null, meanSwingRightS: number | null): number | null {
  if (meanSwingLeftS === null || meanSwingRightS === null || !(meanSwingLeftS > 0) || !(meanSwingRightS > 0)) return null;
  const short = Math.min(meanSwingLeftS, meanSwingRightS);
  const long = Math.max(meanSwingLeftS, meanSwingRightS);
  return 100 * Math.abs(Math.log(short / long));
}
