/**
 * Step-time asymmetry = 100·|ln(shorter mean step time / longer mean step time)|: the gait asymmetry
 * form of Plotnik et al. 2007 and Yogev et al. 2007 (Exp Brain Res 177:336; 100·|ln(SSWT/LSWT)| for
 * swing times), applied to the two legs' mean step times (step of leg X = IC_X − preceding
 * contralateral IC, Mobilise-D definitions). 0 = symmetric; it does not depend on which leg is
 * named first. Null when either mean is missing or not positive.
 */
export function stepTimeAsymmetryPct(meanStepLeftS: number | null, meanStepRightS: number | null): number | null {
  if (meanStepLeftS === null || meanStepRightS === null || !(meanStepLeftS > 0) || !(meanStepRightS > 0)) return null;
  return 100 * Math.abs(Math.log(Math.min(meanStepLeftS, meanStepRightS) / Math.max(meanStepLeftS, meanStepRightS)));
}
