export type { LegEvents } from "./gait-events";
export { detectShankEvents, SHANK_EVENT_LOW_PASS_HZ, SHANK_LOBE_LOW_PASS_HZ, SHANK_SEARCH_FRACTION_OF_STRIDE } from "./detect-shank-events";
export { detectFootEvents, FOOT_EVENT_LOW_PASS_HZ } from "./detect-foot-events";
export {
  findPeaks,
  mergeSwingsWithoutStance,
  SAME_SWING_BACKWARD_ROTATION_FRACTION,
  signalRelativeThresholds,
  SALARIAN_MS_THRESHOLD_DEG_S,
  SALARIAN_MIN_PEAK_DISTANCE_S,
  SALARIAN_IC_THRESHOLD_DEG_S,
  SALARIAN_FC_THRESHOLD_DEG_S,
  SALARIAN_SEARCH_WINDOW_S,
  MS_LOW_PASS_HZ,
  MS_RELATIVE_THRESHOLD,
} from "./mid-swing-peaks";
export { buildStrides, buildSessionStrides, gateSteadyStateInPlace, MIN_STRIDE_TIME_S, MAX_STRIDE_TIME_S, TURN_MARGIN_S, type StrideContext } from "./strides";
export { steadyBand, labelSteadyState, pooledRobustSdS, HAMPEL_K, MIN_BAND_FRACTION, type SteadyBand, type SteadyLabel } from "./steady-state";
export { pooledWithinBoutCvPct, type PooledCv } from "./pooled-variability";
export { stepTimeAsymmetryPct } from "./step-asymmetry";
export { longestConsecutiveRun, type ConsecutiveRun } from "./consecutive-strides";
export { excludedStrideCounts, describeExcludedStrides } from "./excluded-strides";
export { strideMetrics, type StrideMetrics } from "./stride-metrics";
export { phaseCoordinationIndex, type PhaseCoordination } from "./phase-coordination-index";
export { gaitAsymmetryPct } from "./gait-asymmetry";
export { detrendedFluctuation, dfaAlphaOrReason, DFA_MIN_STRIDES, DFA_RECOMMENDED_STRIDES, type DfaAlphaOutcome } from "./dfa";
export { mean, standardDeviation, coefficientOfVariationPct } from "./descriptive";
