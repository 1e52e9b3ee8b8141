import type { ArmLegCoupling, Metrics } from "@pendula/signal";

/*
 * The metric catalogue: the one description of every per-session number Pendula stores, trends,
 * flags, exports and draws. The analysis computes a value; its entry here says how to read it from
 * the analysis JSON, what it is called, in which unit, on which chart, which way is better, how
 * precisely it leaves in a research export and under which FHIR code. Pure data over signal's
 * types, so the server and the portal read the same entries.
 *
 * Units are UCUM case-sensitive codes (https://ucum.org): "/min", "s", "%", "deg", "m", "m/s", and
 * "1" for dimensionless values; `{strides}` is a UCUM annotation on a count.
 */

/** Every key the server writes to `session_metrics.metric_key`, in the order screens list them. */
export const STORED_METRIC_KEYS = [
  "cadenceStepsPerMin",
  "walkingSpeedMPerS",
  "strideLengthM",
  "strideTimeMeanS",
  "strideTimeCvPct",
  "stepTimeMeanSLeft",
  "stepTimeMeanSRight",
  "stepTimeAsymmetryPct",
  "stancePctLeft",
  "stancePctRight",
  "swingPctLeft",
  "swingPctRight",
  "swingTimeCvPctLeft",
  "swingTimeCvPctRight",
  "doubleSupportPct",
  "phaseCoordinationIndexPct",
  "gaitAsymmetryPct",
  "dfaAlpha",
  "steadyStrideCount",
  "armSwingAmplitudeDegLeft",
  "armSwingAmplitudeDegRight",
  "armSwingAsymmetryPct",
  "armLegLeftArmRightLegFrequencyRatio",
  "armLegLeftArmRightLegMeanRelativePhaseDeg",
  "armLegLeftArmRightLegCouplingStrength",
  "armLegLeftArmRightLegCircularSdDeg",
  "armLegRightArmLeftLegFrequencyRatio",
  "armLegRightArmLeftLegMeanRelativePhaseDeg",
  "armLegRightArmLeftLegCouplingStrength",
  "armLegRightArmLeftLegCircularSdDeg",
] as const;
export type MetricKey = (typeof STORED_METRIC_KEYS)[number];
/** The same list, widened so a key read from a row or a request (a string) can be searched in it. */
export const METRIC_KEYS: readonly string[] = STORED_METRIC_KEYS;

/** The analysis quantity behind a key; per-side and per-pair keys share one. */
export const BASE_METRICS = [
  "cadenceStepsPerMin",
  "walkingSpeedMPerS",
  "strideLengthM",
  "strideTimeMeanS",
  "strideTimeCvPct",
  "stepTimeMeanS",
  "stepTimeAsymmetryPct",
  "stancePct",
  "swingPct",
  "swingTimeCvPct",
  "doubleSupportPct",
  "phaseCoordinationIndexPct",
  "gaitAsymmetryPct",
  "dfaAlpha",
  "steadyStrideCount",
  "armSwingAmplitudeDeg",
  "armSwingAsymmetryPct",
  "frequencyRatio",
  "meanRelativePhaseDeg",
  "couplingStrength",
  "circularSdDeg",
] as const;
export type BaseMetric = (typeof BASE_METRICS)[number];

export type MetricSide = "left" | "right";
export type ArmLegPair = "leftArmRightLeg" | "rightArmLeftLeg";
export type CountNoun = "strides" | "steps" | "arm cycles";

/** An arm–leg pair in words, arm first ("left arm–right leg"). */
export const PAIR_WORDS: Record<ArmLegPair, string> = { leftArmRightLeg: "left arm–right leg", rightArmLeftLeg: "right arm–left leg" };

/**
 * `higher-is-better`: a rise beyond MDC is `improved`; `higher-is-worse`: a rise is `worsened`;
 * `null`: no agreed clinical direction, so no improved/worsened flag is ever given.
 */
export type MetricDirection = "higher-is-better" | "higher-is-worse" | null;

/** Which clinical question a metric answers; flags and the caseload are named by it. */
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

/** The trend charts, in page order; each metric with a chart is drawn on exactly one. */
export const METRIC_CHARTS = [
  { id: "speed", title: "Walking speed", description: "Mean speed over the steady strides of each session, in metres per second. Needs the patient's height; a walking aid changes it." },
  { id: "strideLength", title: "Stride length", description: "Mean length of a stride (two steps) over the steady strides, in metres." },
  { id: "cadence", title: "Cadence", description: "Steps per minute over the steady strides of each session." },
  { id: "variability", title: "Stride-time variability", description: "Coefficient of variation of stride time (both legs pooled)." },
  { id: "swingVariability", title: "Swing-time variability", description: "Coefficient of variation of swing time, per side, within walking bouts." },
  { id: "phases", title: "Stance and double support", description: "Stance per side and double support, as % of the stride." },
  { id: "stepAsymmetry", title: "Step-time asymmetry", description: "Difference between left and right step times relative to their mean; 0 % is symmetric." },
  { id: "pci", title: "Phase Coordination Index", description: "Left–right stepping coordination (Plotnik, Giladi & Hausdorff 2007); lower is more consistent." },
  { id: "armSwing", title: "Arm swing amplitude", description: "Sagittal range of motion of each arm per arm cycle, in degrees." },
  { id: "armSwingAsymmetry", title: "Arm swing asymmetry", description: "Left–right difference in arm swing amplitude; 0 % is symmetric. A walking aid changes arm swing." },
  { id: "armLegRatio", title: "Arm–leg frequency ratio", description: "Arm swing cycles per stride: 1 (1:1) or 2 (2:1) when locked, else the measured value." },
  { id: "armLegCoupling", title: "Arm–leg coupling strength", description: "Mean resultant length R of the n:m relative phase, 0 (none) to 1 (fully locked)." },
] as const;
export type MetricChartId = (typeof METRIC_CHARTS)[number]["id"];
export type MetricChart = (typeof METRIC_CHARTS)[number];

/**
 * How precisely a value leaves the server in a research export (JSON, CSV and FHIR alike). Full
 * precision is a fingerprint, so each value is rounded to a step no finer than a clinician would act
 * on; `why` gives the reason and, where there is one, the source ("common practice" where none).
 */
export interface ExportPrecision {
  /** The exported value is a whole multiple of this step, in the metric's unit. */
  step: number;
  /** Decimals that printing one step needs (0.05 → 2). */
  decimals: number;
  why: string;
}

/** Decimals needed to print `step` exactly (0.05 → 2, 5 → 0). */
export function decimalsOfStep(step: number): number {
  const text = String(step);
  const dot = text.indexOf(".");
  return dot < 0 ? 0 : text.length - dot - 1;
}
const precision = (step: number, why: string): ExportPrecision => ({ step, decimals: decimalsOfStep(step), why });

const TIME = "10 ms, one sample at 100 Hz; finer steps outrun the event detection (common practice)";
const PCT_PHASE = "whole percent of the gait cycle, the resolution stance and swing are reported at clinically (common practice)";
const CV = "0.1 %: healthy older adults' stride-time CV spans 1.58–2.30 % (Frenkel-Toledo et al. 2005, JNER 2:23), so a coarser step would erase the band";
const ASYM = "whole percent (common practice)";
const WHOLE_DEG = "whole degrees (common practice)";

/** What one analysis quantity means, shared by all of its stored keys. */
export interface BaseMetricInfo {
  base: BaseMetric;
  /** The quantity's short name, without side or pair ("Stance", "Coupling strength R"). */
  name: string;
  unit: string;
  /** The unit as printed beside a value ("steps/min", "°"); "" for a plain number. */
  unitText: string;
  /** Decimals a value is shown with on a session's summary and in tables (common practice). */
  decimals: number;
  family: MetricFamily;
  direction: MetricDirection;
  /** The trend chart the metric is drawn on; null when it has none (read on the session page). */
  chart: MetricChartId | null;
  /** What its count counts ("n = 42 strides"). */
  countNoun: CountNoun;
  exportPrecision: ExportPrecision;
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

type BaseDef = Omit<BaseMetricInfo, "base" | "countNoun" | "unitText"> & { countNoun?: CountNoun; unitText?: string };

const UNIT_TEXT: Record<string, string> = { "/min": "steps/min", deg: "°", "1": "", "{strides}": "" };

const BASE_DEFS: { [B in BaseMetric]: BaseDef } = {
  cadenceStepsPerMin: {
    name: "Cadence",
    unit: "/min",
    decimals: 1,
    family: "rhythm",
    direction: "higher-is-better",
    chart: "cadence",
    exportPrecision: precision(1, "whole steps per minute (common practice)"),
    rationale: "Slow cadence is typical of impaired gait; walking-rehabilitation goals aim to raise it.",
  },
  walkingSpeedMPerS: {
    name: "Walking speed",
    unit: "m/s",
    decimals: 2,
    family: "pace",
    direction: "higher-is-better",
    chart: "speed",
    exportPrecision: precision(0.05, "0.05 m/s, the smallest published MDC in our table (stroke, slow walkers: Hosoi et al. 2023, Front Neurol 14:1219505)"),
    rationale:
      "Walking speed is the usual outcome of walking rehabilitation; published MDC95 values exist for stroke (Hosoi et al. 2023) and Parkinson's disease (Combs et al. 2014).",
  },
  strideLengthM: {
    name: "Stride length",
    unit: "m",
    decimals: 2,
    family: "pace",
    direction: "higher-is-better",
    chart: "strideLength",
    exportPrecision: precision(0.05, "5 cm, the stride-length counterpart of 0.05 m/s at about one stride per second (common practice)"),
    rationale: "Short strides are typical of impaired gait (small shuffling steps in Parkinson's disease, Hass et al. 2014); walking speed is stride length × stride frequency.",
  },
  strideTimeMeanS: {
    name: "Stride time (mean)",
    unit: "s",
    decimals: 3,
    family: "rhythm",
    direction: null,
    chart: null,
    exportPrecision: precision(0.01, TIME),
    rationale: "Carried by cadence; flagging both would double-count one change.",
  },
  strideTimeCvPct: {
    name: "Stride-time CV",
    unit: "%",
    decimals: 2,
    family: "variability",
    direction: "higher-is-worse",
    chart: "variability",
    exportPrecision: precision(0.1, CV),
    speedDependent: { citation: "stride-time variability falls as speed rises: Frenkel-Toledo et al. 2005, J NeuroEng Rehabil 2:23" },
    rationale: "Higher stride-to-stride variability (PD 2.24 % vs controls 1.94 %, Frenkel-Toledo 2005).",
  },
  stepTimeMeanS: {
    name: "Step time",
    unit: "s",
    decimals: 3,
    family: "rhythm",
    direction: null,
    chart: null,
    countNoun: "steps",
    exportPrecision: precision(0.01, TIME),
    rationale: "Per-side timing; its meaning depends on the paretic side, so asymmetry carries the direction.",
  },
  stepTimeAsymmetryPct: {
    name: "Step-time asymmetry",
    unit: "%",
    decimals: 1,
    family: "asymmetry",
    direction: "higher-is-worse",
    chart: "stepAsymmetry",
    countNoun: "steps",
    exportPrecision: precision(1, ASYM),
    rationale: "0 % is equal left and right step times; larger values are more asymmetric.",
  },
  stancePct: {
    name: "Stance",
    unit: "%",
    decimals: 1,
    family: "phases",
    direction: null,
    chart: "phases",
    exportPrecision: precision(1, PCT_PHASE),
    rationale: "Per side; a rise can be better on one side and worse on the other (e.g. after stroke).",
  },
  swingPct: {
    name: "Swing",
    unit: "%",
    decimals: 1,
    family: "phases",
    direction: null,
    // The complement of stance, which the phases chart already draws.
    chart: null,
    exportPrecision: precision(1, PCT_PHASE),
    rationale: "Complement of stance; same reason.",
  },
  swingTimeCvPct: {
    name: "Swing-time CV",
    unit: "%",
    decimals: 2,
    family: "variability",
    direction: "higher-is-worse",
    chart: "swingVariability",
    exportPrecision: precision(0.1, CV),
    rationale: "Swing-time variability is raised in Parkinson's disease and, unlike stride-time variability, does not fall with speed (Frenkel-Toledo et al. 2005).",
  },
  doubleSupportPct: {
    name: "Double support",
    unit: "%",
    decimals: 1,
    family: "phases",
    direction: "higher-is-worse",
    chart: "phases",
    exportPrecision: precision(1, PCT_PHASE),
    rationale: "More time on both feet is a cautious, less stable pattern (DS rises with age, textbook-level sources).",
  },
  phaseCoordinationIndexPct: {
    name: "PCI",
    unit: "%",
    decimals: 1,
    family: "left-right-coordination",
    direction: "higher-is-worse",
    chart: "pci",
    exportPrecision: precision(
      1,
      "whole percent: healthy 40–74-year-olds span 2.05–4.27 % (Zadik et al. 2022, Gait & Posture 96:87) and stroke 17.2–21.8 % (Meijer et al. 2011, JNER 8:23), so 1 % keeps both groups apart",
    ),
    speedDependent: { citation: "PCI rises as walking speed falls: Gimmon et al. 2018, J Aging Phys Act 26:382" },
    rationale: "Higher PCI = less consistent and less accurate left-right anti-phase (Plotnik 2007: PD > elderly > young).",
  },
  gaitAsymmetryPct: {
    name: "Gait asymmetry (swing)",
    unit: "%",
    decimals: 1,
    family: "asymmetry",
    direction: "higher-is-worse",
    chart: null,
    exportPrecision: precision(1, ASYM),
    rationale:
      "GA = 100·|ln(short swing / long swing)| (formula confirmed against Yogev et al. 2007, Exp Brain Res 177:336); 0 % is symmetric swing times, larger values are more asymmetric.",
  },
  dfaAlpha: {
    name: "DFA alpha",
    unit: "1",
    decimals: 2,
    family: "variability",
    direction: null,
    chart: null,
    exportPrecision: precision(0.01, "0.01: healthy young adults span 0.72–1.02 (Hausdorff et al. 1997, J Appl Physiol 82:262)"),
    rationale: "Long-range correlation; both directions away from typical values are discussed, no agreed direction.",
  },
  steadyStrideCount: {
    name: "Steady strides",
    unit: "{strides}",
    decimals: 0,
    family: "data-quality",
    direction: null,
    chart: null,
    exportPrecision: precision(5, "counts to the nearest 5, like every count behind a value (common practice)"),
    rationale: "A data-quality count, not a gait outcome.",
  },
  armSwingAmplitudeDeg: {
    name: "Arm swing",
    unit: "deg",
    decimals: 1,
    family: "arm-swing",
    direction: null,
    chart: "armSwing",
    countNoun: "arm cycles",
    exportPrecision: precision(1, WHOLE_DEG),
    rationale: "Per arm; arm swing depends on walking-aid use (Tester et al. 2011, incomplete SCI), so a change has no single clinical direction.",
  },
  armSwingAsymmetryPct: {
    name: "Arm swing asymmetry",
    unit: "%",
    decimals: 1,
    family: "arm-swing",
    direction: "higher-is-worse",
    chart: "armSwingAsymmetry",
    countNoun: "arm cycles",
    exportPrecision: precision(1, ASYM),
    rationale: "0 % is equal left and right arm swing; larger values are more asymmetric.",
  },
  frequencyRatio: {
    name: "Frequency ratio",
    unit: "1",
    decimals: 2,
    family: "arm-leg-coordination",
    direction: null,
    chart: "armLegRatio",
    exportPrecision: precision(0.05, "0.05 of an arm cycle per stride tells 1:1 from 2:1 and the states between (common practice)"),
    rationale: "A mode (1:1 or 2:1), reported as coordination events instead of flags.",
  },
  meanRelativePhaseDeg: {
    name: "Mean relative phase",
    unit: "deg",
    decimals: 0,
    family: "arm-leg-coordination",
    direction: null,
    // Never drawn alone: the trend summary lists it under its pair's coupling strength R.
    chart: null,
    circular: true,
    exportPrecision: precision(5, "5°, coarser than the relative-phase circular SD of steady walkers, so rounding does not hide a mode change (common practice)"),
    rationale:
      "An angle with no better or worse direction; a shift beyond its MDC is shown as a change. Compared only when the coupling strength R of the same session shows a real phase relation.",
  },
  couplingStrength: {
    name: "Coupling strength R",
    unit: "1",
    decimals: 2,
    family: "arm-leg-coordination",
    direction: null,
    chart: "armLegCoupling",
    exportPrecision: precision(0.05, "0.05 of the coupling strength R (0–1) (common practice)"),
    rationale: "Reported as a coordination event when it drops below its baseline band, not as a flag.",
  },
  circularSdDeg: {
    name: "Circular SD",
    unit: "deg",
    decimals: 0,
    family: "arm-leg-coordination",
    direction: null,
    chart: null,
    exportPrecision: precision(1, WHOLE_DEG),
    rationale: "Spread of the relative phase; no agreed clinical direction for arm-leg coupling.",
  },
};

export const BASE_METRIC_INFO: { readonly [B in BaseMetric]: BaseMetricInfo } = Object.fromEntries(
  BASE_METRICS.map((base) => {
    const d = BASE_DEFS[base];
    return [base, { ...d, base, countNoun: d.countNoun ?? "strides", unitText: d.unitText ?? UNIT_TEXT[d.unit] ?? d.unit }];
  }),
) as { [B in BaseMetric]: BaseMetricInfo };

/** One stored key: its base quantity's meaning plus what is particular to the key. */
export interface MetricDefinition extends BaseMetricInfo {
  key: MetricKey;
  side: MetricSide | null;
  pair: ArmLegPair | null;
  /** The clinician-facing name: trend charts, tables, the cohort builder, CSV headers, FHIR `display`. */
  label: string;
  /** A compact name for narrow columns: the quantity's name and its side or pair ("Stance, left"). */
  shortLabel: string;
  /** Everyday words for the patient's own screens; null when the patient is not shown the metric. */
  patientLabel: string | null;
  /** Reads the value from the analysis JSON; null when the analysis did not compute it. */
  read(metrics: Metrics): number | null;
  /**
   * Keys of `Metrics.counts` that hold how many strides/steps this value rests on, tried in order
   * (the flattened key first, then the analysis field it comes from).
   */
  countKeys: readonly string[];
  /** The code of the value in the FHIR export's metric CodeSystem and the research export's column name. */
  fhirCode: string;
}

interface KeyDef {
  base: BaseMetric;
  side?: MetricSide;
  pair?: ArmLegPair;
  label: string;
  patientLabel?: string;
  read(metrics: Metrics): number | null;
  /** Count keys after the key itself. */
  countKeys?: readonly string[];
}

const Sided = { left: "Left", right: "Right" } as const;
/** A value of one side of a per-side field: counts may be kept per side (`stancePct.left`) or for the field. */
const sideCounts = (field: string, s: MetricSide) => [`${field}.${s}`, `${field}${Sided[s]}`, field];

type CouplingField = Exclude<keyof ArmLegCoupling, "reason">;
const coupling = (pair: ArmLegPair, base: BaseMetric & CouplingField, label: string): KeyDef => ({
  base,
  pair,
  label,
  read: (m) => m.armLeg[pair][base],
  countKeys: [`armLeg.${pair}`, `armLeg.${pair}.${base}`],
});

const KEY_DEFS: { [K in MetricKey]: KeyDef } = {
  cadenceStepsPerMin: { base: "cadenceStepsPerMin", label: "Cadence (steps/min)", patientLabel: "Steps per minute", read: (m) => m.cadenceStepsPerMin },
  walkingSpeedMPerS: { base: "walkingSpeedMPerS", label: "Walking speed", patientLabel: "Walking speed", read: (m) => m.walkingSpeedMPerS },
  strideLengthM: { base: "strideLengthM", label: "Stride length", read: (m) => m.strideLengthM },
  strideTimeMeanS: { base: "strideTimeMeanS", label: "Stride time, mean", read: (m) => m.strideTimeMeanS },
  strideTimeCvPct: { base: "strideTimeCvPct", label: "Stride-time variability (CV)", read: (m) => m.strideTimeCvPct },
  stepTimeMeanSLeft: { base: "stepTimeMeanS", side: "left", label: "Step time, left", read: (m) => m.stepTimeMeanS.left, countKeys: sideCounts("stepTimeMeanS", "left") },
  stepTimeMeanSRight: { base: "stepTimeMeanS", side: "right", label: "Step time, right", read: (m) => m.stepTimeMeanS.right, countKeys: sideCounts("stepTimeMeanS", "right") },
  stepTimeAsymmetryPct: { base: "stepTimeAsymmetryPct", label: "Step-time asymmetry", read: (m) => m.stepTimeAsymmetryPct },
  stancePctLeft: { base: "stancePct", side: "left", label: "Stance, left", read: (m) => m.stancePct.left, countKeys: sideCounts("stancePct", "left") },
  stancePctRight: { base: "stancePct", side: "right", label: "Stance, right", read: (m) => m.stancePct.right, countKeys: sideCounts("stancePct", "right") },
  swingPctLeft: { base: "swingPct", side: "left", label: "Swing, left", read: (m) => m.swingPct.left, countKeys: sideCounts("swingPct", "left") },
  swingPctRight: { base: "swingPct", side: "right", label: "Swing, right", read: (m) => m.swingPct.right, countKeys: sideCounts("swingPct", "right") },
  swingTimeCvPctLeft: {
    base: "swingTimeCvPct",
    side: "left",
    label: "Swing-time variability (CV), left",
    read: (m) => m.swingTimeCvPct.left,
    countKeys: sideCounts("swingTimeCvPct", "left"),
  },
  swingTimeCvPctRight: {
    base: "swingTimeCvPct",
    side: "right",
    label: "Swing-time variability (CV), right",
    read: (m) => m.swingTimeCvPct.right,
    countKeys: sideCounts("swingTimeCvPct", "right"),
  },
  doubleSupportPct: { base: "doubleSupportPct", label: "Double support", read: (m) => m.doubleSupportPct },
  phaseCoordinationIndexPct: { base: "phaseCoordinationIndexPct", label: "Phase Coordination Index", read: (m) => m.phaseCoordinationIndexPct },
  gaitAsymmetryPct: { base: "gaitAsymmetryPct", label: "Gait asymmetry (swing)", read: (m) => m.gaitAsymmetryPct },
  dfaAlpha: { base: "dfaAlpha", label: "Stride-time DFA alpha", read: (m) => m.dfaAlpha },
  steadyStrideCount: { base: "steadyStrideCount", label: "Steady-state strides", read: (m) => m.steadyStrideCount },
  armSwingAmplitudeDegLeft: {
    base: "armSwingAmplitudeDeg",
    side: "left",
    label: "Arm swing amplitude, left",
    read: (m) => m.armSwing?.left.amplitudeDeg ?? null,
    countKeys: ["armSwing.left", "armSwing"],
  },
  armSwingAmplitudeDegRight: {
    base: "armSwingAmplitudeDeg",
    side: "right",
    label: "Arm swing amplitude, right",
    read: (m) => m.armSwing?.right.amplitudeDeg ?? null,
    countKeys: ["armSwing.right", "armSwing"],
  },
  armSwingAsymmetryPct: { base: "armSwingAsymmetryPct", label: "Arm swing asymmetry", read: (m) => m.armSwing?.asymmetryPct ?? null, countKeys: ["armSwing"] },
  armLegLeftArmRightLegFrequencyRatio: coupling("leftArmRightLeg", "frequencyRatio", "Left arm–right leg frequency ratio (arm cycles per stride)"),
  armLegLeftArmRightLegMeanRelativePhaseDeg: coupling("leftArmRightLeg", "meanRelativePhaseDeg", "Left arm–right leg mean relative phase"),
  armLegLeftArmRightLegCouplingStrength: coupling("leftArmRightLeg", "couplingStrength", "Left arm–right leg coupling strength (R)"),
  armLegLeftArmRightLegCircularSdDeg: coupling("leftArmRightLeg", "circularSdDeg", "Left arm–right leg relative phase circular SD"),
  armLegRightArmLeftLegFrequencyRatio: coupling("rightArmLeftLeg", "frequencyRatio", "Right arm–left leg frequency ratio (arm cycles per stride)"),
  armLegRightArmLeftLegMeanRelativePhaseDeg: coupling("rightArmLeftLeg", "meanRelativePhaseDeg", "Right arm–left leg mean relative phase"),
  armLegRightArmLeftLegCouplingStrength: coupling("rightArmLeftLeg", "couplingStrength", "Right arm–left leg coupling strength (R)"),
  armLegRightArmLeftLegCircularSdDeg: coupling("rightArmLeftLeg", "circularSdDeg", "Right arm–left leg relative phase circular SD"),
};

export const METRICS: readonly MetricDefinition[] = STORED_METRIC_KEYS.map((key) => {
  const d = KEY_DEFS[key];
  const info = BASE_METRIC_INFO[d.base];
  return {
    ...info,
    key,
    side: d.side ?? null,
    pair: d.pair ?? null,
    label: d.label,
    shortLabel: d.side ? `${info.name}, ${d.side}` : d.pair ? `${info.name}, ${PAIR_WORDS[d.pair]}` : info.name,
    patientLabel: d.patientLabel ?? null,
    read: d.read,
    countKeys: [key, ...(d.countKeys ?? [])],
    fhirCode: key,
  };
});

const BY_KEY = new Map<string, MetricDefinition>(METRICS.map((m) => [m.key, m]));

export function isMetricKey(key: string): key is MetricKey {
  return BY_KEY.has(key);
}

/** The entry of a stored key; undefined for any other string (no alternative spellings are accepted). */
export function metricDefinition(key: string): MetricDefinition | undefined {
  return BY_KEY.get(key);
}

/** The entries drawn on one trend chart, in catalogue order. */
export function metricsOfChart(chart: MetricChartId): MetricDefinition[] {
  return METRICS.filter((m) => m.chart === chart);
}

/** The label with its printed unit, for lists where no value stands beside it ("Walking speed (m/s)", "Gait asymmetry (swing, %)"). */
export function labelWithUnit(def: Pick<MetricDefinition, "label" | "unitText">): string {
  if (def.unitText === "" || def.label.endsWith(`(${def.unitText})`)) return def.label;
  return def.label.endsWith(")") ? `${def.label.slice(0, -1)}, ${def.unitText})` : `${def.label} (${def.unitText})`;
}

/** A value as the session summary and tables print it: the entry's decimals and unit ("98.4 steps/min", "31.5°"). */
export function formatMetricValue(def: Pick<MetricDefinition, "decimals" | "unitText">, value: number | null | undefined): string {
  if (typeof value !== "number" || !Number.isFinite(value)) return "—";
  const unit = def.unitText === "" ? "" : def.unitText === "°" ? "°" : ` ${def.unitText}`;
  return `${value.toFixed(def.decimals)}${unit}`;
}
