import type { Request } from "express";
import { audit } from "../../audit/audit";
import type { CohortDefinition } from "../../contracts/research";
import type { AppDeps } from "../../deps";
import { HttpError } from "../../http-error";
import type { AuthContext } from "../../middleware/authenticate";
import { METRIC_KEYS, metricDefinition } from "../../contracts/metric-catalog";
import { consentInForceAt, consentPeriods } from "../../research/consent-periods";
import { toCsv, type CsvCell } from "../../research/csv";
import { COUNT_STEP, EXPORT_PRECISION, exportCount, exportValue } from "../../research/export-precision";
import { observationBundle, type ResearchSessionRow } from "../../research/fhir-bundle";
import {
  ageAtEnrolment,
  ageBand,
  AGE_BANDS,
  MIN_CELL_SUBJECTS,
  projectKey,
  pseudonymousSessionRef,
  pseudonymousSubjectId,
  releaseCutoff,
  RELEASE_LAG_DAYS,
  STUDY_WEEK_BLOCK,
  STUDY_WEEK_CAP,
  studyWeekBlock,
  suppressSmallCells,
  weeksSinceEnrolment,
} from "../../research/safe-harbor";
import { readSessionMetrics } from "../../sessions/metric-rows";
import { ownProject } from "./projects.service";
import { cohortSourceRows, countingConsentEvents, type CohortSourceRow } from "./research.repository";

/**
 * Research cohorts under HIPAA Safe Harbor (45 CFR 164.514(b)(2)). What leaves this module: a
 * pseudonym per subject keyed by the research project, condition, 5-year age band (90+ grouped),
 * 4-week study blocks capped at 52, and metric values rounded to their export precision. What
 * never does: names, e-mails, birth or session dates, device serials, database ids, the clinic's
 * research_id, free text (notes, condition detail) or raw signals.
 *
 * A session is read only when research consent was in force, by the counting consent events, at
 * the time it was recorded, and only when it is older than the release lag. Every condition ×
 * age-band cell with fewer than MIN_CELL_SUBJECTS distinct subjects is withheld.
 */

/** One session of the cohort before pseudonyms are applied; the patient and session ids never leave the server. */
interface CohortRow {
  patientId: string;
  sessionId: string;
  condition: CohortSourceRow["condition"];
  ageBand: string;
  weekBlock: number;
  algorithmVersion: string | null;
}

const cellOf = (r: { condition: string; ageBand: string }) => `${r.condition}|${r.ageBand}`;

function validate(def: CohortDefinition): string[] {
  const bad = def.ageBands.filter((b) => !AGE_BANDS.includes(b));
  if (bad.length) throw new HttpError(400, "invalid_request", `unknown age band(s): ${bad.join(", ")}`, { known: AGE_BANDS });
  const unknown = def.metrics.filter((k) => !metricDefinition(k));
  if (unknown.length) throw new HttpError(400, "invalid_request", `unknown metric key(s): ${unknown.join(", ")}`, { known: METRIC_KEYS });
  return def.metrics.length ? def.metrics : [...METRIC_KEYS];
}

/** The enrolment day as UTC midnight: the week arithmetic in safe-harbor.ts works in UTC. */
const enrolledDate = (day: string) => new Date(`${day}T00:00:00Z`);

/**
 * Processed sessions inside the definition, recorded while the patient's research consent was in
 * force and before the release cutoff. The week window of the definition applies to the 4-week
 * blocks, so narrowing it cannot reveal a session's exact week.
 */
async function cohortRows(deps: AppDeps, def: CohortDefinition, now: Date): Promise<CohortRow[]> {
  const source = await cohortSourceRows(deps.db, releaseCutoff(now), def.conditions);
  if (source.length === 0) return [];
  const patientIds = [...new Set(source.map((s) => s.patient_id))];
  const byPatient = await countingConsentEvents(deps.db, patientIds);
  const periods = new Map(patientIds.map((id) => [id, consentPeriods((byPatient.get(id) ?? []).map((e) => ({ ...e, at: new Date(e.at) })))]));

  const rows: CohortRow[] = [];
  for (const r of source) {
    const recordedAt = new Date(r.recorded_at);
    if (!consentInForceAt(periods.get(r.patient_id) ?? [], recordedAt)) continue;
    const enrolled = enrolledDate(r.enrolled_on);
    const band = ageBand(Math.max(0, ageAtEnrolment(r.birth_year, enrolled)));
    const block = studyWeekBlock(Math.max(0, weeksSinceEnrolment(recordedAt, enrolled)));
    if (def.ageBands.length && !def.ageBands.includes(band)) continue;
    if (block < def.weeksSinceEnrolment.from || block > def.weeksSinceEnrolment.to) continue;
    rows.push({ patientId: r.patient_id, sessionId: r.session_id, condition: r.condition, ageBand: band, weekBlock: block, algorithmVersion: r.algorithm_version });
  }
  return rows;
}

export const SUPPRESSED_LABEL = `suppressed group (n < ${MIN_CELL_SUBJECTS})`;

export async function previewCohort(deps: AppDeps, req: Request, def: CohortDefinition, now = new Date()) {
  const keys = validate(def);
  const rows = await cohortRows(deps, def, now);
  const { cells } = suppressSmallCells(rows, cellOf, (r) => r.patientId);
  const sessionsPerCell = new Map<string, number>();
  for (const r of rows) sessionsPerCell.set(cellOf(r), (sessionsPerCell.get(cellOf(r)) ?? 0) + 1);
  const released = cells
    .filter((c) => !c.suppressed)
    .map((c) => {
      const [condition, band] = c.cell.split("|") as [CohortSourceRow["condition"], string];
      return { condition, ageBand: band, label: `${condition}, ${band}`, subjects: c.subjects, sessions: sessionsPerCell.get(c.cell) ?? 0, suppressed: false };
    });
  // Suppressed cells come last and carry no attributes, so neither their names nor their place in the sorted list tell which group it is.
  const withheld = cells
    .filter((c) => c.suppressed)
    .map(() => ({ condition: null, ageBand: null, label: SUPPRESSED_LABEL, subjects: null, sessions: null, suppressed: true }));
  await audit(deps.db, req, { action: "research.cohort_preview", resourceType: "cohort", details: { definition: def, cells: cells.length } });
  return {
    k: MIN_CELL_SUBJECTS,
    definition: def,
    metrics: keys,
    cells: [...released, ...withheld],
    totals: {
      subjects: released.reduce((n, c) => n + c.subjects, 0),
      sessions: released.reduce((n, c) => n + c.sessions, 0),
      suppressedCells: withheld.length,
    },
  };
}

const STUDY_CLOCK = { blockWeeks: STUDY_WEEK_BLOCK, capWeeks: STUDY_WEEK_CAP, releaseLagDays: RELEASE_LAG_DAYS };

/** The precision table and study clock as the export applies them, for the researcher's screen. */
export function exportRules() {
  return {
    k: MIN_CELL_SUBJECTS,
    countStep: COUNT_STEP,
    studyClock: STUDY_CLOCK,
    metrics: METRIC_KEYS.map((key) => {
      const def = metricDefinition(key)!;
      const p = EXPORT_PRECISION[key]!;
      return { key, unit: def.unit, label: def.label, step: p.step, decimals: p.decimals, why: p.why };
    }),
  };
}

export async function exportCohort(
  deps: AppDeps,
  req: Request,
  auth: AuthContext,
  projectId: string,
  def: CohortDefinition,
  format: "json" | "csv" | "fhir",
  now = new Date(),
) {
  const keys = validate(def);
  const project = await ownProject(deps, auth, projectId);
  const key = projectKey(deps.config.researchHmacKey, project.key_salt);
  const all = await cohortRows(deps, def, now);
  const { kept, cells } = suppressSmallCells(all, cellOf, (r) => r.patientId);
  const suppressedCells = cells.filter((c) => c.suppressed).length;

  const rows: ResearchSessionRow[] = kept.map((r) => ({
    subjectId: pseudonymousSubjectId(key, project.id, r.patientId),
    sessionRef: pseudonymousSessionRef(key, project.id, r.sessionId),
    condition: r.condition,
    ageBand: r.ageBand,
    weeksSinceEnrolment: r.weekBlock,
    algorithmVersion: r.algorithmVersion,
    metrics: {},
    counts: {},
  }));
  if (rows.length) {
    const bySession = await readSessionMetrics(deps.db, kept.map((r) => r.sessionId), keys);
    kept.forEach((r, i) => {
      const values = bySession.get(r.sessionId);
      const out = rows[i]!;
      // One rounding for JSON, CSV and FHIR alike (research/export-precision.ts).
      out.metrics = Object.fromEntries(keys.map((k) => [k, exportValue(k, values?.get(k)?.value ?? null)]));
      out.counts = Object.fromEntries(keys.map((k) => [k, exportCount(values?.get(k)?.n ?? null)]));
    });
  }
  await audit(deps.db, req, {
    action: "export.cohort_metrics",
    resourceType: "research_project",
    resourceId: project.id,
    details: { format, projectId: project.id, definition: def, rows: rows.length, subjects: new Set(kept.map((r) => r.patientId)).size, suppressedCells },
  });
  if (format === "fhir") return { kind: "fhir" as const, body: observationBundle(rows, keys) };
  if (format === "csv") {
    // Each metric is followed by `<key>_n`, the strides/steps/arm cycles its value rests on (nearest 5; empty when unknown).
    const header = ["subject_id", "session_ref", "condition", "age_band", "weeks_since_enrolment_block", "algorithm_version", ...keys.flatMap((k) => [k, `${k}_n`])];
    const body: CsvCell[][] = rows.map((r) => [
      r.subjectId,
      r.sessionRef,
      r.condition,
      r.ageBand,
      r.weeksSinceEnrolment,
      r.algorithmVersion,
      ...keys.flatMap((k) => [r.metrics[k], r.counts?.[k] ?? null]),
    ]);
    return { kind: "csv" as const, body: toCsv(header, body) };
  }
  return {
    kind: "json" as const,
    body: {
      k: MIN_CELL_SUBJECTS,
      project: { id: project.id, name: project.name },
      metrics: keys.map((k) => ({ key: k, unit: metricDefinition(k)!.unit, countNoun: metricDefinition(k)!.countNoun, step: EXPORT_PRECISION[k]!.step, countStep: COUNT_STEP })),
      studyClock: STUDY_CLOCK,
      rows,
      suppressedCells,
    },
  };
}
