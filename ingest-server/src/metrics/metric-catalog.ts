import type { ArmLegCoupling, Metrics } from "@pendula/signal";

/**
 * Every per-session number the server stores, trends and exports. Keys are the signal metric names
 * (per-side and arm–leg values flattened with a suffix) so a key means the same thing in the
 * analysis JSON, session_metrics.metric_key, the trend API, the CSV columns and the FHIR codes.
 *
 * Units are UCUM case-sensitive codes (https://ucum.org): "/min", "s", "%", "deg", "m", "m/s", and
 * "1" for dimensionless values. `{strides}` is a UCUM annotation on a count.
 */
export interface MetricDefinition {
  key: string;
  unit: string;
  /** Short English label for tables, CSV headers and FHIR `display`. */
  label: string;
  read(metrics: Metrics): number | null;
  /**
   * Keys of `Metrics.counts` that hold how many strides/steps this value rests on, tried in order
   * (the flattened key first, then the analysis field it comes from).
   */
  countKeys: readonly string[];
  /** What the count counts, shown beside it ("n = 42 strides"). */
  countNoun: CountNoun;
}

export type CountNoun = "strides" | "steps" | "arm cycles";

type CouplingField = Exclude<keyof ArmLegCoupling, "reason">;
const COUPLING_FIELDS: Array<{ field: CouplingField; suffix: string; unit: string; label: string }> = [
  { field: "frequencyRatio", suffix: "FrequencyRatio", unit: "1", label: "frequency ratio (arm cycles per stride)" },
  { field: "meanRelativePhaseDeg", suffix: "MeanRelativePhaseDeg", unit: "deg", label: "mean relative phase" },
  { field: "couplingStrength", suffix: "CouplingStrength", unit: "1", label: "coupling strength (R)" },
  { field: "circularSdDeg", suffix: "CircularSdDeg", unit: "deg", label: "relative phase circular SD" },
];

const PAIRS = [
  { pair: "leftArmRightLeg", prefix: "armLegLeftArmRightLeg", label: "Left arm–right leg" },
  { pair: "rightArmLeftLeg", prefix: "armLegRightArmLeftLeg", label: "Right arm–left leg" },
] as const;

type Def = Omit<MetricDefinition, "countKeys" | "countNoun"> & Partial<Pick<MetricDefinition, "countKeys" | "countNoun">>;

/** A value of one side of a per-side field: counts may be kept per side (`stancePct.left`) or for the field. */
const side = (key: string, field: string, s: "left" | "right", rest: Omit<Def, "key" | "countKeys">): Def => ({
  key,
  countKeys: [key, `${field}.${s}`, `${field}${s === "left" ? "Left" : "Right"}`, field],
  ...rest,
});

const armSide = (s: "left" | "right"): Def => ({
  key: `armSwingAmplitudeDeg${s === "left" ? "Left" : "Right"}`,
  unit: "deg",
  label: `Arm swing amplitude, ${s}`,
  read: (m) => m.armSwing?.[s].amplitudeDeg ?? null,
  countKeys: [`armSwingAmplitudeDeg${s === "left" ? "Left" : "Right"}`, `armSwing.${s}`, "armSwing"],
  countNoun: "arm cycles",
});

const DEFS: readonly Def[] = [
  { key: "cadenceStepsPerMin", unit: "/min", label: "Cadence (steps/min)", read: (m) => m.cadenceStepsPerMin },
  { key: "walkingSpeedMPerS", unit: "m/s", label: "Walking speed", read: (m) => m.walkingSpeedMPerS },
  { key: "strideLengthM", unit: "m", label: "Stride length", read: (m) => m.strideLengthM },
  { key: "strideTimeMeanS", unit: "s", label: "Stride time, mean", read: (m) => m.strideTimeMeanS },
  { key: "strideTimeCvPct", unit: "%", label: "Stride time variability (CV)", read: (m) => m.strideTimeCvPct },
  side("stepTimeMeanSLeft", "stepTimeMeanS", "left", { unit: "s", label: "Step time, left", read: (m) => m.stepTimeMeanS.left, countNoun: "steps" }),
  side("stepTimeMeanSRight", "stepTimeMeanS", "right", { unit: "s", label: "Step time, right", read: (m) => m.stepTimeMeanS.right, countNoun: "steps" }),
  { key: "stepTimeAsymmetryPct", unit: "%", label: "Step-time asymmetry", read: (m) => m.stepTimeAsymmetryPct, countNoun: "steps" },
  side("stancePctLeft", "stancePct", "left", { unit: "%", label: "Stance, left", read: (m) => m.stancePct.left }),
  side("stancePctRight", "stancePct", "right", { unit: "%", label: "Stance, right", read: (m) => m.stancePct.right }),
  side("swingPctLeft", "swingPct", "left", { unit: "%", label: "Swing, left", read: (m) => m.swingPct.left }),
  side("swingPctRight", "swingPct", "right", { unit: "%", label: "Swing, right", read: (m) => m.swingPct.right }),
  side("swingTimeCvPctLeft", "swingTimeCvPct", "left", { unit: "%", label: "Swing-time variability (CV), left", read: (m) => m.swingTimeCvPct.left }),
  side("swingTimeCvPctRight", "swingTimeCvPct", "right", { unit: "%", label: "Swing-time variability (CV), right", read: (m) => m.swingTimeCvPct.right }),
  { key: "doubleSupportPct", unit: "%", label: "Double support", read: (m) => m.doubleSupportPct },
  {
    key: "phaseCoordinationIndexPct",
    unit: "%",
    label: "Phase Coordination Index",
    read: (m) => m.phaseCoordinationIndexPct,
  },
  { key: "gaitAsymmetryPct", unit: "%", label: "Gait asymmetry (swing)", read: (m) => m.gaitAsymmetryPct },
  { key: "dfaAlpha", unit: "1", label: "Stride-time DFA alpha", read: (m) => m.dfaAlpha },
  { key: "steadyStrideCount", unit: "{strides}", label: "Steady-state strides", read: (m) => m.steadyStrideCount },
  armSide("left"),
  armSide("right"),
  {
    key: "armSwingAsymmetryPct",
    unit: "%",
    label: "Arm swing asymmetry",
    read: (m) => m.armSwing?.asymmetryPct ?? null,
    countKeys: ["armSwingAsymmetryPct", "armSwing"],
    countNoun: "arm cycles",
  },
  ...PAIRS.flatMap(({ pair, prefix, label }) =>
    COUPLING_FIELDS.map(({ field, suffix, unit, label: fieldLabel }) => ({
      key: `${prefix}${suffix}`,
      unit,
      label: `${label} ${fieldLabel}`,
      read: (m: Metrics) => m.armLeg[pair][field],
      countKeys: [`${prefix}${suffix}`, `armLeg.${pair}`, `armLeg.${pair}.${field}`],
    })),
  ),
];

export const METRICS: readonly MetricDefinition[] = DEFS.map((d) => ({ countKeys: [d.key], countNoun: "strides", ...d }));

export const METRIC_KEYS = METRICS.map((m) => m.key);
const BY_KEY = new Map(METRICS.map((m) => [m.key, m]));

export function metricDefinition(key: string): MetricDefinition | undefined {
  return BY_KEY.get(key);
}

export interface MetricValue {
  key: string;
  value: number;
  unit: string;
  /** Strides/steps the value rests on (from `Metrics.counts`); null when the analysis gave none. */
  n: number | null;
}

/** The count behind one metric: the first of its count keys the analysis filled with a whole number ≥ 0. */
export function metricCount(def: MetricDefinition, metrics: Pick<Metrics, "counts">): number | null {
  const counts = metrics.counts ?? {};
  for (const k of def.countKeys) {
    const n = counts[k];
    if (typeof n === "number" && Number.isInteger(n) && n >= 0) return n;
  }
  return null;
}

/** Flattens an analysis' metrics to long-format rows; null and non-finite values are left out, not stored as 0. */
export function metricRows(metrics: Metrics): MetricValue[] {
  const rows: MetricValue[] = [];
  for (const def of METRICS) {
    const value = def.read(metrics);
    if (typeof value === "number" && Number.isFinite(value)) rows.push({ key: def.key, value, unit: def.unit, n: metricCount(def, metrics) });
  }
  return rows;
}
