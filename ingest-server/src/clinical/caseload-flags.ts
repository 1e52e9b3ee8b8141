/**
 * Names for the flags the caseload table shows per patient: what each flag is, in words, and how
 * urgent it is to look, so the table can list them worst first and sort patients by them.
 *
 * Order (most urgent first; our ordering, common practice): a metric worse than baseline beyond its
 * MDC; a coordination event (left–right PCI rise, arm–leg coupling drop, arm–leg mode change not
 * explained by pace); an arm–leg phase shift; a value not compared for too few strides; anything
 * unrecognised; an improvement. Each flag is a
 * prompt to look at the recording and the patient, not a diagnosis.
 */
import { createHash } from "node:crypto";
import { METRICS, metricDefinition, PAIR_WORDS, type ArmLegPair } from "../contracts/metric-catalog";
import { annotateTrends, type TrendPointInput } from "./annotate-trends";
import { DEFAULT_BASELINE_SESSIONS } from "./change-flags";
import { DEFAULT_CONFIRM_SESSIONS, MODE_1_TO_1_MAX_RATIO, MODE_2_TO_1_MIN_RATIO } from "./coordination-events";
import { MIN_STEPS_FOR_VARIABILITY } from "./few-strides";
import { PHASE_GATE_ALPHA, PHASE_GATE_DEFAULT_STRIDES } from "./phase-gate";
import { MDC95_FACTOR, PUBLISHED_MDC } from "./reliability";

export type CaseloadFlagKind =
  | "worsened"
  | "left-right-coordination"
  | "coupling-drop"
  | "coordination-change"
  | "phase-shift"
  | "few-strides"
  | "other"
  | "improved";

export interface CaseloadFlagInput {
  metricKey: string;
  /** A change flag (`improved`, `worsened`, `changed`) or a coordination event kind. */
  flag: string;
}

export interface DescribedCaseloadFlag extends CaseloadFlagInput {
  kind: CaseloadFlagKind;
  /** Plain words for the table, e.g. "Cadence worse than baseline". */
  label: string;
  /** Higher = look sooner. */
  severity: number;
}

export const CASELOAD_FLAG_SEVERITY: Record<CaseloadFlagKind, number> = {
  worsened: 50,
  "left-right-coordination": 40,
  "coupling-drop": 40,
  "coordination-change": 40,
  "phase-shift": 30,
  "few-strides": 25,
  other: 20,
  improved: 10,
};

/** Spaced dashes here: the pair stands in brackets after a sentence ("… (left arm – right leg)"). */
const pairWords = (pair: ArmLegPair) => PAIR_WORDS[pair].replace("–", " – ");

/** The metric's short name: the server label without its unit in brackets, or the key. */
function metricName(metricKey: string): string {
  const label = metricDefinition(metricKey)?.label;
  return label ? label.replace(/\s*\([^)]*\)\s*$/, "") : metricKey;
}

function pairSuffix(metricKey: string): string {
  const pair = metricDefinition(metricKey)?.pair;
  return pair ? ` (${pairWords(pair)})` : "";
}

export function describeCaseloadFlag(f: CaseloadFlagInput): DescribedCaseloadFlag {
  const of = (kind: CaseloadFlagKind, label: string): DescribedCaseloadFlag => ({ ...f, kind, label, severity: CASELOAD_FLAG_SEVERITY[kind] });
  switch (f.flag) {
    case "worsened":
      return of("worsened", `${metricName(f.metricKey)} worse than baseline`);
    case "improved":
      return of("improved", `${metricName(f.metricKey)} better than baseline`);
    case "changed":
      return of("phase-shift", `Arm–leg phase shifted${pairSuffix(f.metricKey)}`);
    case "few-strides":
      return of("few-strides", `${metricName(f.metricKey)} not compared: too few strides`);
    case "pci-rise":
      return of("left-right-coordination", "Left–right coordination (PCI) worse than baseline");
    case "coupling-drop":
      return of("coupling-drop", `Arm–leg coupling weaker than baseline${pairSuffix(f.metricKey)}`);
    case "arm-leg-mode-change":
      return of("coordination-change", `Arm–leg coordination mode changed${pairSuffix(f.metricKey)}`);
    default:
      return of("other", `${metricName(f.metricKey)}: ${f.flag}`);
  }
}

/** The flags described, most urgent first (ties by label, so the order is stable). */
export function orderCaseloadFlags(flags: readonly CaseloadFlagInput[]): DescribedCaseloadFlag[] {
  return flags.map(describeCaseloadFlag).sort((a, b) => b.severity - a.severity || a.label.localeCompare(b.label));
}

/** Metrics whose change flags and coordination events the caseload table summarises. */
export const CASELOAD_FLAG_KEYS: readonly string[] = [
  "walkingSpeedMPerS",
  "cadenceStepsPerMin",
  "strideTimeCvPct",
  "doubleSupportPct",
  "phaseCoordinationIndexPct",
  "gaitAsymmetryPct",
  "armLegLeftArmRightLegFrequencyRatio",
  "armLegRightArmLeftLegFrequencyRatio",
  "armLegLeftArmRightLegCouplingStrength",
  "armLegRightArmLeftLegCouplingStrength",
];

/**
 * Raise when the flag rules' code changes (change-flags, coordination-events, few-strides,
 * phase-gate, annotate-trends or latestSessionFlags below): stored caseload flags carry the
 * version they were computed under, and rows of another version are recomputed.
 */
const CASELOAD_FLAG_RULES_REVISION = 1;

/**
 * The rules' version: the revision above and a digest of the tables and constants the rules read
 * (published MDCs, metric directions, baseline and confirmation lengths, locking-mode and gate
 * limits, the summarised metrics), so editing a table recomputes every stored flag by itself.
 */
export const CASELOAD_FLAG_RULES_VERSION = `${CASELOAD_FLAG_RULES_REVISION}.${createHash("sha256")
  .update(
    JSON.stringify({
      PUBLISHED_MDC,
      // What the rules read from the catalogue: each key's base, direction, and angle and speed handling.
      METRICS: METRICS.map((m) => [m.key, m.base, m.direction, m.circular ?? false, m.speedDependent?.citation ?? null]),
      MDC95_FACTOR,
      DEFAULT_BASELINE_SESSIONS,
      DEFAULT_CONFIRM_SESSIONS,
      MODE_1_TO_1_MAX_RATIO,
      MODE_2_TO_1_MIN_RATIO,
      MIN_STEPS_FOR_VARIABILITY,
      PHASE_GATE_ALPHA,
      PHASE_GATE_DEFAULT_STRIDES,
      CASELOAD_FLAG_KEYS,
      CASELOAD_FLAG_SEVERITY,
    }),
  )
  .digest("hex")
  .slice(0, 12)}`;

export interface FlagSeries {
  key: string;
  unit: string;
  points: TrendPointInput[];
}

/**
 * The flags open on a patient's latest processed session: metrics beyond MDC (improved or
 * worsened), variability not compared for too few strides, and coordination events raised by that
 * session — the trend page's rules over the same series, so the caseload never disagrees with it.
 * Unordered and undescribed (describeCaseloadFlag names them on read). A prompt to look, not a diagnosis.
 */
export function latestSessionFlags(
  metrics: readonly FlagSeries[],
  patient: { birthYear: number; condition: string; enrolledOn: string },
): { latestSessionId: string | null; flags: CaseloadFlagInput[] } {
  let latest: { sessionId: string; recordedAt: string } | null = null;
  for (const m of metrics) for (const p of m.points) if (!latest || p.recordedAt > latest.recordedAt) latest = p;
  if (!latest) return { latestSessionId: null, flags: [] };
  const latestSessionId = latest.sessionId;
  const annotated = annotateTrends({ metrics: [...metrics], patient });
  const flags: CaseloadFlagInput[] = [];
  for (const m of annotated.metrics) {
    const last = m.points.at(-1);
    if (!last || last.sessionId !== latestSessionId) continue;
    if (last.flag === "improved" || last.flag === "worsened") flags.push({ metricKey: m.key, flag: last.flag });
    // A variability value from too few strides was not compared: say so rather than stay silent.
    else if (last.excludedReason === "few-strides") flags.push({ metricKey: m.key, flag: "few-strides" });
  }
  for (const e of annotated.events) if (e.sessionId === latestSessionId) flags.push({ metricKey: e.metricKey, flag: e.kind });
  return { latestSessionId, flags };
}
