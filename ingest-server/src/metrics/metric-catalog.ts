import type { ArmLegCoupling, Metrics } from "@pendula/signal";

/**
 * Every per-session number the server stores, trends and exports. Keys are the signal metric names
 * (per-side and arm–leg values flattened with a suffix) so a key means the same thing in the
 * analysis JSON, session_metrics.metric_key, the trend API, the CSV columns and the FHIR codes.
 *
 * Units are UCUM case-sensitive codes (https://ucum.org): "/min", "s", "%", "deg", and "1" for
 * dimensionless values. `{strides}` is a UCUM annotation on a count.
 */
export interface MetricDefinition {
  key: string;
  unit: string;
  /** Short English label for tables, CSV headers and FHIR `display`. */
  label: string;
  read(metrics: Metrics): number | null;
}

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

export const METRICS: readonly MetricDefinition[] = [
  { key: "cadenceStepsPerMin", unit: "/min", label: "Cadence (steps/min)", read: (m) => m.cadenceStepsPerMin },
  { key: "strideTimeMeanS", unit: "s", label: "Stride time, mean", read: (m) => m.strideTimeMeanS },
  { key: "strideTimeCvPct", unit: "%", label: "Stride time variability (CV)", read: (m) => m.strideTimeCvPct },
  { key: "stepTimeMeanSLeft", unit: "s", label: "Step time, left", read: (m) => m.stepTimeMeanS.left },
  { key: "stepTimeMeanSRight", unit: "s", label: "Step time, right", read: (m) => m.stepTimeMeanS.right },
  { key: "stancePctLeft", unit: "%", label: "Stance, left", read: (m) => m.stancePct.left },
  { key: "stancePctRight", unit: "%", label: "Stance, right", read: (m) => m.stancePct.right },
  { key: "swingPctLeft", unit: "%", label: "Swing, left", read: (m) => m.swingPct.left },
  { key: "swingPctRight", unit: "%", label: "Swing, right", read: (m) => m.swingPct.right },
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
  ...PAIRS.flatMap(({ pair, prefix, label }) =>
    COUPLING_FIELDS.map(({ field, suffix, unit, label: fieldLabel }) => ({
      key: `${prefix}${suffix}`,
      unit,
      label: `${label} ${fieldLabel}`,
      read: (m: Metrics) => m.armLeg[pair][field],
    })),
  ),
];

export const METRIC_KEYS = METRICS.map((m) => m.key);
const BY_KEY = new Map(METRICS.map((m) => [m.key, m]));

export function metricDefinition(key: string): MetricDefinition | undefined {
  return BY_KEY.get(key);
}

export interface MetricValue {
  key: string;
  value: number;
  unit: string;
}

/** Flattens an analysis' metrics to long-format rows; null and non-finite values are left out, not stored as 0. */
export function metricRows(metrics: Metrics): MetricValue[] {
  const rows: MetricValue[] = [];
  for (const def of METRICS) {
    const value = def.read(metrics);
    if (typeof value === "number" && Number.isFinite(value)) rows.push({ key: def.key, value, unit: def.unit });
  }
  return rows;
}
