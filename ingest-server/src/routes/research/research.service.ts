import type { Request } from "express";
import { audit } from "../../audit/audit";
import type { CohortDefinition } from "../../contracts/research";
import { CONDITIONS } from "../../contracts/enums";
import type { AppDeps } from "../../deps";
import { HttpError } from "../../http-error";
import { METRIC_KEYS, metricDefinition } from "../../metrics/metric-catalog";
import { toCsv, type CsvCell } from "../../research/csv";
import { observationBundle, type ResearchSessionRow } from "../../research/fhir-bundle";
import {
  ageAtEnrolment,
  ageBand,
  AGE_BANDS,
  MIN_CELL_SUBJECTS,
  pseudonymousSubjectId,
  suppressSmallCells,
  weeksSinceEnrolment,
} from "../../research/safe-harbor";
import { createHmac } from "node:crypto";

/**
 * Research cohorts under HIPAA Safe Harbor (45 CFR 164.514(b)(2)). What leaves this module:
 * a keyed pseudonym per subject, condition, 5-year age band (90+ grouped), whole weeks since
 * enrolment and metric values. What never does: names, e-mails, birth or session dates, device
 * serials, database ids, the clinic's research_id, free text (notes, condition detail) or raw signals.
 * Only patients with research_consent are read at all, and every condition × age-band cell with
 * fewer than MIN_CELL_SUBJECTS distinct subjects is withheld.
 */
interface SourceRow {
  patient_id: string;
  session_id: string;
  condition: (typeof CONDITIONS)[number];
  birth_year: number;
  /** 'YYYY-MM-DD' (DATE columns arrive as the stored day). */
  enrolled_on: string;
  recorded_at: Date;
  algorithm_version: string | null;
}

/** Derived session reference: a keyed hash, so a row cannot be joined back to the database without the key. */
const sessionRefOf = (key: string, sessionId: string) =>
  `ses-${createHmac("sha256", key).update(`session:${sessionId}`).digest("hex").slice(0, 32)}`;

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

/** Consenting patients' processed sessions inside the definition, de-identified, before suppression. */
async function cohortRows(deps: AppDeps, def: CohortDefinition, keys: string[]): Promise<ResearchSessionRow[]> {
  const q = deps.db("walk_sessions as s")
    .join("patients as p", "p.id", "s.patient_id")
    .where("p.research_consent", true)
    .andWhere("s.status", "done")
    .select("p.id as patient_id", "s.id as session_id", "p.condition", "p.birth_year", "p.enrolled_on", "s.recorded_at", "s.algorithm_version")
    .orderBy([{ column: "p.id" }, { column: "s.recorded_at" }]);
  if (def.conditions.length) q.whereIn("p.condition", def.conditions);
  const source: SourceRow[] = await q;
  const key = deps.config.researchHmacKey;
  const rows: ResearchSessionRow[] = [];
  for (const r of source) {
    const enrolled = enrolledDate(r.enrolled_on);
    const band = ageBand(Math.max(0, ageAtEnrolment(r.birth_year, enrolled)));
    const week = weeksSinceEnrolment(new Date(r.recorded_at), enrolled);
    if (def.ageBands.length && !def.ageBands.includes(band)) continue;
    if (week < def.weeksSinceEnrolment.from || week > def.weeksSinceEnrolment.to) continue;
    rows.push({
      subjectId: pseudonymousSubjectId(key, r.patient_id),
      sessionRef: sessionRefOf(key, r.session_id),
      condition: r.condition,
      ageBand: band,
      weeksSinceEnrolment: week,
      algorithmVersion: r.algorithm_version,
      metrics: {},
    });
  }
  if (rows.length === 0) return rows;
  const metricRows = await deps.db("session_metrics as m")
    .join("patients as p", "p.id", "m.patient_id")
    .where("p.research_consent", true)
    .whereIn("m.metric_key", keys)
    .whereIn("m.session_id", source.map((s) => s.session_id))
    .select("m.session_id", "m.metric_key", "m.value", "m.n");
  const bySession = new Map<string, Record<string, number | null>>();
  const countsBySession = new Map<string, Record<string, number | null>>();
  for (const m of metricRows) {
    const v = bySession.get(m.session_id) ?? {};
    v[m.metric_key] = Number(m.value);
    bySession.set(m.session_id, v);
    const c = countsBySession.get(m.session_id) ?? {};
    c[m.metric_key] = m.n === null || m.n === undefined ? null : Number(m.n);
    countsBySession.set(m.session_id, c);
  }
  const refs = new Map(source.map((s) => [sessionRefOf(key, s.session_id), s.session_id]));
  for (const row of rows) {
    const id = refs.get(row.sessionRef)!;
    const values = bySession.get(id) ?? {};
    const counts = countsBySession.get(id) ?? {};
    row.metrics = Object.fromEntries(keys.map((k) => [k, values[k] ?? null]));
    row.counts = Object.fromEntries(keys.map((k) => [k, counts[k] ?? null]));
  }
  return rows;
}

export async function previewCohort(deps: AppDeps, req: Request, def: CohortDefinition) {
  const keys = validate(def);
  const rows = await cohortRows(deps, def, keys);
  const { cells } = suppressSmallCells(rows, cellOf, (r) => r.subjectId);
  const sessionsPerCell = new Map<string, number>();
  for (const r of rows) sessionsPerCell.set(cellOf(r), (sessionsPerCell.get(cellOf(r)) ?? 0) + 1);
  const shown = cells.map((c) => {
    const [condition, band] = c.cell.split("|") as [SourceRow["condition"], string];
    return {
      condition,
      ageBand: band,
      subjects: c.suppressed ? null : c.subjects,
      sessions: c.suppressed ? null : (sessionsPerCell.get(c.cell) ?? 0),
      suppressed: c.suppressed,
    };
  });
  const visible = shown.filter((c) => !c.suppressed);
  await audit(deps.db, req, { action: "research.cohort_preview", resourceType: "cohort", details: { definition: def, cells: cells.length } });
  return {
    k: MIN_CELL_SUBJECTS,
    definition: def,
    metrics: keys,
    cells: shown,
    totals: {
      subjects: visible.reduce((n, c) => n + (c.subjects ?? 0), 0),
      sessions: visible.reduce((n, c) => n + (c.sessions ?? 0), 0),
      suppressedCells: shown.length - visible.length,
    },
  };
}

export async function exportCohort(deps: AppDeps, req: Request, def: CohortDefinition, format: "json" | "csv" | "fhir") {
  const keys = validate(def);
  const all = await cohortRows(deps, def, keys);
  const { kept, cells } = suppressSmallCells(all, cellOf, (r) => r.subjectId);
  const suppressedCells = cells.filter((c) => c.suppressed).length;
  await audit(deps.db, req, {
    action: "export.cohort_metrics",
    resourceType: "cohort",
    details: { format, definition: def, rows: kept.length, subjects: new Set(kept.map((r) => r.subjectId)).size, suppressedCells },
  });
  if (format === "fhir") return { kind: "fhir" as const, body: observationBundle(kept, keys) };
  if (format === "csv") {
    // Each metric is followed by `<key>_n`, the strides/steps/arm cycles its value rests on (empty when unknown).
    const header = ["subject_id", "session_ref", "condition", "age_band", "weeks_since_enrolment", "algorithm_version", ...keys.flatMap((k) => [k, `${k}_n`])];
    const rows: CsvCell[][] = kept.map((r) => [
      r.subjectId,
      r.sessionRef,
      r.condition,
      r.ageBand,
      r.weeksSinceEnrolment,
      r.algorithmVersion,
      ...keys.flatMap((k) => [r.metrics[k], r.counts?.[k] ?? null]),
    ]);
    return { kind: "csv" as const, body: toCsv(header, rows) };
  }
  return {
    kind: "json" as const,
    body: {
      k: MIN_CELL_SUBJECTS,
      metrics: keys.map((k) => ({ key: k, unit: metricDefinition(k)!.unit, countNoun: metricDefinition(k)!.countNoun })),
      rows: kept,
      suppressedCells,
    },
  };
}
