/**
 * The metrics of the analysis (the analysis contract's names) and what a rise in each means clinically.
 *
 * Trend keys arrive flattened by the trends route, and per-side / per-pair metrics may be spelled
 * `stancePct.left`, `stancePctLeft`, `left_stance_pct`, `armLeg.leftArmRightLeg.couplingStrength`
 * or `leftArmRightLegCouplingStrength`: `resolveMetricKey` accepts all of these, so this module
 * does not depend on one flattening convention.
 */

export const BASE_METRICS = [
  "cadenceStepsPerMin",
  "strideTimeMeanS",
  "strideTimeCvPct",
  "stepTimeMeanS",
  "stancePct",
  "swingPct",
  "doubleSupportPct",
  "phaseCoordinationIndexPct",
  "gaitAsymmetryPct",
  "dfaAlpha",
  "steadyStrideCount",
  "frequencyRatio",
  "meanRelativePhaseDeg",
  "couplingStrength",
  "circularSdDeg",
  "walkingSpeedMPerS",
  "strideLengthM",
  "swingTimeCvPct",
  "stepTimeAsymmetryPct",
  "armSwingAmplitudeDeg",
  "armSwingAsymmetryPct",
] as const;
export type BaseMetric = (typeof BASE_METRICS)[number];

/**
 * `higher-is-better`: a rise beyond MDC is `improved`; `higher-is-worse`: a rise is `worsened`;
 * `null`: no agreed clinical direction, so no improved/worsened flag is ever given.
 */
export type MetricDirection = "higher-is-better" | "higher-is-worse" | null;

/** Which clinical question a metric answers; the trend view groups and the caseload names flags by it. */
export type MetricFamily =
  | "pace"
  | "rhythm"
  | "variability"
  | "phases"
  | "asymmetry"
  | "left-right-coordination"
  | "arm-leg-coordination"
  | "arm-swing"
  | "data-quality";

export interface MetricInfo {
  base: BaseMetric;
  family: MetricFamily;
  direction: MetricDirection;
  /**
   * An angle: baselines use the circular mean, differences are wrapped to ±180°, and a change
   * beyond the MDC is flagged `changed` (no better/worse direction).
   */
  circular?: boolean;
  /** Changes with walking speed, so each point carries the session's speed to be read beside it. */
  speedDependent?: { citation: string };
  /** Why this direction (or why none); shown in the contributor notes. */
  rationale: string;
}

export const METRIC_INFO: Record<BaseMetric, MetricInfo> = {
  cadenceStepsPerMin: {
    base: "cadenceStepsPerMin",
    family: "rhythm",
    direction: "higher-is-better",
    rationale: "Slow cadence is typical of impaired gait; walking-rehabilitation goals aim to raise it.",
  },
  strideTimeCvPct: {
    base: "strideTimeCvPct",
    family: "variability",
    direction: "higher-is-worse",
    speedDependent: { citation: "stride-time variability falls as speed rises: Frenkel-Toledo et al. 2005, J NeuroEng Rehabil 2:23" },
    rationale: "Higher stride-to-stride variability (PD 2.24 % vs controls 1.94 %, Frenkel-Toledo 2005).",
  },
  phaseCoordinationIndexPct: {
    base: "phaseCoordinationIndexPct",
    family: "left-right-coordination",
    direction: "higher-is-worse",
    speedDependent: { citation: "PCI rises as walking speed falls: Gimmon et al. 2018, J Aging Phys Act 26:382" },
    rationale: "Higher PCI = less consistent and less accurate left-right anti-phase (Plotnik 2007: PD > elderly > young).",
  },
  gaitAsymmetryPct: {
    base: "gaitAsymmetryPct",
    family: "asymmetry",
    direction: "higher-is-worse",
    rationale:
      "GA = 100·|ln(short swing / long swing)| (formula confirmed against Yogev et al. 2007, Exp Brain Res 177:336); 0 % is symmetric swing times, larger values are more asymmetric.",
  },
  doubleSupportPct: {
    base: "doubleSupportPct",
    family: "phases",
    direction: "higher-is-worse",
    rationale: "More time on both feet is a cautious, less stable pattern (DS rises with age, textbook-level sources).",
  },
  strideTimeMeanS: {
    base: "strideTimeMeanS",
    family: "rhythm",
    direction: null,
    rationale: "Carried by cadence; flagging both would double-count one change.",
  },
  stepTimeMeanS: {
    base: "stepTimeMeanS",
    family: "rhythm",
    direction: null,
    rationale: "Per-side timing; its meaning depends on the paretic side, so asymmetry carries the direction.",
  },
  stancePct: {
    base: "stancePct",
    family: "phases",
    direction: null,
    rationale: "Per side; a rise can be better on one side and worse on the other (e.g. after stroke).",
  },
  swingPct: { base: "swingPct", family: "phases", direction: null, rationale: "Complement of stance; same reason." },
  dfaAlpha: {
    base: "dfaAlpha",
    family: "variability",
    direction: null,
    rationale: "Long-range correlation; both directions away from typical values are discussed, no agreed direction.",
  },
  steadyStrideCount: {
    base: "steadyStrideCount",
    family: "data-quality",
    direction: null,
    rationale: "A data-quality count, not a gait outcome.",
  },
  frequencyRatio: {
    base: "frequencyRatio",
    family: "arm-leg-coordination",
    direction: null,
    rationale: "A mode (1:1 or 2:1), reported as coordination events instead of flags.",
  },
  meanRelativePhaseDeg: {
    base: "meanRelativePhaseDeg",
    family: "arm-leg-coordination",
    direction: null,
    circular: true,
    rationale:
      "An angle with no better or worse direction; a shift beyond its MDC is shown as a change. Compared only when the coupling strength R of the same session shows a real phase relation.",
  },
  couplingStrength: {
    base: "couplingStrength",
    family: "arm-leg-coordination",
    direction: null,
    rationale: "Reported as a coordination event when it drops below its baseline band, not as a flag.",
  },
  circularSdDeg: {
    base: "circularSdDeg",
    family: "arm-leg-coordination",
    direction: null,
    rationale: "Spread of the relative phase; no agreed clinical direction for arm-leg coupling.",
  },
  walkingSpeedMPerS: {
    base: "walkingSpeedMPerS",
    family: "pace",
    direction: "higher-is-better",
    rationale:
      "Walking speed is the usual outcome of walking rehabilitation; published MDC95 values exist for stroke (Hosoi et al. 2023) and Parkinson's disease (Combs et al. 2014).",
  },
  strideLengthM: {
    base: "strideLengthM",
    family: "pace",
    direction: "higher-is-better",
    rationale: "Short strides are typical of impaired gait (small shuffling steps in Parkinson's disease, Hass et al. 2014); walking speed is stride length × stride frequency.",
  },
  swingTimeCvPct: {
    base: "swingTimeCvPct",
    family: "variability",
    direction: "higher-is-worse",
    rationale: "Swing-time variability is raised in Parkinson's disease and, unlike stride-time variability, does not fall with speed (Frenkel-Toledo et al. 2005).",
  },
  stepTimeAsymmetryPct: {
    base: "stepTimeAsymmetryPct",
    family: "asymmetry",
    direction: "higher-is-worse",
    rationale: "0 % is equal left and right step times; larger values are more asymmetric.",
  },
  armSwingAmplitudeDeg: {
    base: "armSwingAmplitudeDeg",
    family: "arm-swing",
    direction: null,
    rationale: "Per arm; arm swing depends on walking-aid use (Tester et al. 2011, incomplete SCI), so a change has no single clinical direction.",
  },
  armSwingAsymmetryPct: {
    base: "armSwingAsymmetryPct",
    family: "arm-swing",
    direction: "higher-is-worse",
    rationale: "0 % is equal left and right arm swing; larger values are more asymmetric.",
  },
};

export type ArmLegPair = "leftArmRightLeg" | "rightArmLeftLeg";

export interface ResolvedMetric {
  base: BaseMetric;
  side: "left" | "right" | null;
  pair: ArmLegPair | null;
  info: MetricInfo;
}

const compact = (s: string) => s.toLowerCase().replace(/[^a-z0-9]/g, "");

// Longest first so that no base name is matched inside a longer one.
const BY_LENGTH = [...BASE_METRICS].sort((a, b) => b.length - a.length);
const ARM_LEG_BASES = new Set<BaseMetric>(["frequencyRatio", "meanRelativePhaseDeg", "couplingStrength", "circularSdDeg"]);
const PER_SIDE_BASES = new Set<BaseMetric>(["stepTimeMeanS", "stancePct", "swingPct", "swingTimeCvPct", "armSwingAmplitudeDeg"]);

/** Maps a trend key to its base metric and qualifier; `null` for a key this module does not know. */
export function resolveMetricKey(key: string): ResolvedMetric | null {
  const c = compact(key);
  const base = BY_LENGTH.find((b) => c.includes(compact(b)));
  if (!base) return null;
  const rest = c.replace(compact(base), "");
  let pair: ArmLegPair | null = null;
  let side: "left" | "right" | null = null;
  if (ARM_LEG_BASES.has(base)) {
    if (rest.includes("leftarmrightleg")) pair = "leftArmRightLeg";
    else if (rest.includes("rightarmleftleg")) pair = "rightArmLeftLeg";
  } else if (PER_SIDE_BASES.has(base)) {
    if (rest.includes("left")) side = "left";
    else if (rest.includes("right")) side = "right";
  }
  return { base, side, pair, info: METRIC_INFO[base] };
}
