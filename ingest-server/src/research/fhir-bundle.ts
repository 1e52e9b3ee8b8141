import { METRICS, metricDefinition } from "../contracts/metric-catalog";

/**
 * FHIR R4 export: one Bundle (type "collection") holding our local CodeSystem and one Observation
 * per walking session, each metric a component with a UCUM valueQuantity. No LOINC codes exist for
 * cadence, stride-time CV or PCI (none were confirmed), so the codes come from a local CodeSystem.
 *
 * Safe Harbor (45 CFR 164.514(b)(2)): the subject is a logical reference by pseudonymous identifier
 * only (no Patient resource, no name), there is no effective[x] date — the study week is an
 * extension — and resource ids are derived codes, never database ids.
 */
export const FHIR_BASE = "https://pendula.example/fhir";
export const METRIC_CODE_SYSTEM = `${FHIR_BASE}/CodeSystem/gait-metrics`;
export const SUBJECT_ID_SYSTEM = `${FHIR_BASE}/NamingSystem/research-subject`;
/** valueInteger: the first week of the 4-week study block (0, 4, 8 …; 52 = week 52 or later). */
export const EXT_WEEKS = `${FHIR_BASE}/StructureDefinition/weeks-since-enrolment-block`;
export const EXT_AGE_BAND = `${FHIR_BASE}/StructureDefinition/age-band`;
export const EXT_CONDITION = `${FHIR_BASE}/StructureDefinition/study-condition`;
/** On a component: how many strides/steps/arm cycles the value rests on (UCUM annotation unit). */
export const EXT_COUNT = `${FHIR_BASE}/StructureDefinition/count-behind-value`;
export const SESSION_PANEL_CODE = "walk-session-gait-panel";
const UCUM = "http://unitsofmeasure.org";

export interface ResearchSessionRow {
  subjectId: string;
  /** Pseudonymous session reference (keyed hash), never the database id. */
  sessionRef: string;
  condition: string;
  ageBand: string;
  weeksSinceEnrolment: number;
  algorithmVersion: string | null;
  metrics: Record<string, number | null>;
  /** Strides/steps/arm cycles behind each metric value (session_metrics.n); null or absent when unknown. */
  counts?: Record<string, number | null>;
}

/** UCUM's human-readable unit strings for the codes we use. */
const UNIT_DISPLAY: Record<string, string> = {
  "/min": "/min",
  s: "s",
  "%": "%",
  "1": "1",
  deg: "deg",
  m: "m",
  "m/s": "m/s",
  "{strides}": "strides",
};

/** Turns the first 32 hex digits of a derived reference into RFC 4122 layout for a urn:uuid fullUrl. */
function uuidFromHex(hex: string): string {
  const h = hex.replace(/[^0-9a-f]/g, "").padEnd(32, "0").slice(0, 32);
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-4${h.slice(13, 16)}-8${h.slice(17, 20)}-${h.slice(20, 32)}`;
}

export function metricCodeSystem(keys: readonly string[]) {
  return {
    resourceType: "CodeSystem",
    id: "gait-metrics",
    url: METRIC_CODE_SYSTEM,
    status: "active",
    content: "complete",
    caseSensitive: true,
    name: "PendulaGaitMetrics",
    title: "Pendula gait and interlimb-coordination metrics",
    concept: [
      { code: SESSION_PANEL_CODE, display: "Home walking test gait metrics" },
      ...keys.map((key) => ({ code: metricDefinition(key)?.fhirCode ?? key, display: metricDefinition(key)?.label ?? key })),
    ],
  };
}

export function sessionObservation(row: ResearchSessionRow, keys: readonly string[]) {
  const component = keys.flatMap((key) => {
    const value = row.metrics[key];
    const def = metricDefinition(key);
    if (value === null || value === undefined || !Number.isFinite(value) || !def) return [];
    const n = row.counts?.[key];
    return [
      {
        ...(typeof n === "number"
          ? { extension: [{ url: EXT_COUNT, valueQuantity: { value: n, unit: def.countNoun, system: UCUM, code: `{${def.countNoun.replace(/ /g, "_")}}` } }] }
          : {}),
        code: { coding: [{ system: METRIC_CODE_SYSTEM, code: def.fhirCode, display: def.label }] },
        valueQuantity: { value, unit: UNIT_DISPLAY[def.unit] ?? def.unit, system: UCUM, code: def.unit },
      },
    ];
  });
  return {
    resourceType: "Observation",
    id: row.sessionRef,
    meta: row.algorithmVersion ? { tag: [{ system: `${FHIR_BASE}/algorithm-version`, code: row.algorithmVersion }] } : undefined,
    extension: [
      { url: EXT_WEEKS, valueInteger: row.weeksSinceEnrolment },
      { url: EXT_AGE_BAND, valueString: row.ageBand },
      { url: EXT_CONDITION, valueString: row.condition },
    ],
    status: "final",
    category: [
      {
        coding: [
          { system: "http://terminology.hl7.org/CodeSystem/observation-category", code: "activity", display: "Activity" },
        ],
      },
    ],
    code: {
      coding: [{ system: METRIC_CODE_SYSTEM, code: SESSION_PANEL_CODE, display: "Home walking test gait metrics" }],
    },
    subject: { identifier: { system: SUBJECT_ID_SYSTEM, value: row.subjectId } },
    component,
  };
}

export function observationBundle(rows: readonly ResearchSessionRow[], keys: readonly string[] = METRICS.map((m) => m.key)) {
  const codeSystem = metricCodeSystem(keys);
  return {
    resourceType: "Bundle",
    // Bundle.total is only allowed on searchset and history bundles (invariant bdl-1), so it is absent.
    type: "collection",
    entry: [
      { fullUrl: `${METRIC_CODE_SYSTEM}`, resource: codeSystem },
      ...rows.map((row) => ({ fullUrl: `urn:uuid:${uuidFromHex(row.sessionRef)}`, resource: sessionObservation(row, keys) })),
    ],
  };
}
