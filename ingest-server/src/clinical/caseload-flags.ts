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
import { metricDefinition } from "../metrics/metric-catalog";
import { resolveMetricKey, type ArmLegPair } from "./metric-catalog";

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

const PAIR_WORDS: Record<ArmLegPair, string> = {
  leftArmRightLeg: "left arm – right leg",
  rightArmLeftLeg: "right arm – left leg",
};

/** The metric's short name: the server label without its unit in brackets, or the key. */
function metricName(metricKey: string): string {
  const label = metricDefinition(metricKey)?.label;
  return label ? label.replace(/\s*\([^)]*\)\s*$/, "") : metricKey;
}

function pairWords(metricKey: string): string {
  const pair = resolveMetricKey(metricKey)?.pair;
  return pair ? ` (${PAIR_WORDS[pair]})` : "";
}

export function describeCaseloadFlag(f: CaseloadFlagInput): DescribedCaseloadFlag {
  const of = (kind: CaseloadFlagKind, label: string): DescribedCaseloadFlag => ({ ...f, kind, label, severity: CASELOAD_FLAG_SEVERITY[kind] });
  switch (f.flag) {
    case "worsened":
      return of("worsened", `${metricName(f.metricKey)} worse than baseline`);
    case "improved":
      return of("improved", `${metricName(f.metricKey)} better than baseline`);
    case "changed":
      return of("phase-shift", `Arm–leg phase shifted${pairWords(f.metricKey)}`);
    case "few-strides":
      return of("few-strides", `${metricName(f.metricKey)} not compared: too few strides`);
    case "pci-rise":
      return of("left-right-coordination", "Left–right coordination (PCI) worse than baseline");
    case "coupling-drop":
      return of("coupling-drop", `Arm–leg coupling weaker than baseline${pairWords(f.metricKey)}`);
    case "arm-leg-mode-change":
      return of("coordination-change", `Arm–leg coordination mode changed${pairWords(f.metricKey)}`);
    default:
      return of("other", `${metricName(f.metricKey)}: ${f.flag}`);
  }
}

/** The flags described, most urgent first (ties by label, so the order is stable). */
export function orderCaseloadFlags(flags: readonly CaseloadFlagInput[]): DescribedCaseloadFlag[] {
  return flags.map(describeCaseloadFlag).sort((a, b) => b.severity - a.severity || a.label.localeCompare(b.label));
}
