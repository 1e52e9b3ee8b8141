import type { Request } from "express";
import { audit, auditRow } from "../../audit/audit";
import { assertPatientAccess, clinicalPatientScope } from "../../auth/patient-access";
import { annotateTrends, computeAdherence, orderCaseloadFlags } from "../../clinical";
import type { AppDeps } from "../../deps";
import { HttpError } from "../../http-error";
import type { AuthContext } from "../../middleware/authenticate";
import type { PatientUpdate } from "../../contracts/patients";
import { metricDefinition, METRIC_KEYS } from "../../contracts/metric-catalog";
import { toSummary } from "../sessions/sessions.service";
import {
  findPatient,
  readTrendContext,
  latestMetrics,
  listPatients,
  listSessions,
  sessionDates,
  sessionStats,
  updatePatientFields,
  type PatientRow,
} from "./patients.repository";
import { metricSeries, metricValues, readSessionMetrics } from "../../sessions/metric-rows";
import { readCaseloadFlags } from "../../trends/caseload-flags.repository";
import { trendRows } from "../../trends/trend-rows.repository";
import type { AnswerCache, CachedAnswer } from "../../http/answer-cache";

const SUMMARY_KEYS = ["cadenceStepsPerMin", "strideTimeCvPct", "phaseCoordinationIndexPct", "walkingSpeedMPerS", "strideLengthM"];
const ADHERENCE_WINDOW_WEEKS = 4;

const isoOrNull = (d: Date | null | undefined) => (d ? new Date(d).toISOString() : null);

function identity(p: PatientRow) {
  return {
    id: p.id,
    displayName: p.display_name,
    researchId: p.research_id,
    enrolledOn: p.enrolled_on,
    researchConsent: p.research_consent,
  };
}

/**
 * Share of the last ended weeks (at most four, the enrolment week excluded) in which the expected
 * number of tests was uploaded; null when none are expected or no week has ended yet.
 */
export function recentAdherencePct(p: PatientRow, dates: string[], now: Date): number | null {
  if (p.expected_uploads_per_week === 0) return null;
  const a = computeAdherence({ enrolledOn: p.enrolled_on, expectedPerWeek: p.expected_uploads_per_week, sessionDates: dates, now });
  const ended = a.weeks.slice(1, -1).slice(-ADHERENCE_WINDOW_WEEKS);
  if (ended.length === 0) return null;
  return Math.round((100 * ended.filter((w) => w.met).length) / ended.length);
}

/** Adherence looks at the last four ended weeks; eight weeks of dates cover them and the current one. */
const ADHERENCE_DATES_WINDOW_MS = 8 * 7 * 86_400_000;

/**
 * Clinician: own caseload with summary columns. Admin: every patient, identity columns only.
 * Each patient's flags are the ones stored when its latest session was processed
 * (caseload-flags.repository.ts), recomputed here only for a patient whose inputs changed since,
 * so the first read after a start costs what a re-read costs.
 */
export async function listPatientsFor(deps: AppDeps, req: Request, auth: AuthContext, q: string | undefined) {
  if (auth.role === "admin") {
    const rows = await listPatients(deps.db, null, q);
    await audit(deps.db, req, { action: "patient.list", resourceType: "patient", details: { count: rows.length, view: "identity" } });
    return { items: rows.map(identity) };
  }
  if (auth.role !== "clinician") throw new HttpError(403, "forbidden", "only clinicians and admins list patients");
  const rows = await listPatients(deps.db, auth.userId, q);
  const ids = rows.map((r) => r.id);
  const now = new Date();
  const [stats, dates, latest, flags] = await Promise.all([
    sessionStats(deps.db, ids),
    sessionDates(deps.db, ids, new Date(now.getTime() - ADHERENCE_DATES_WINDOW_MS)),
    latestMetrics(deps.db, ids, SUMMARY_KEYS),
    readCaseloadFlags(deps.db, rows),
  ]);
  await audit(deps.db, req, { action: "patient.list", resourceType: "patient", details: { count: rows.length, view: "caseload" } });
  return {
    items: rows.map((p) => {
      const s = stats.get(p.id);
      const l = latest.get(p.id);
      const value = (key: string) => l?.metrics.get(key)?.value ?? null;
      return {
        ...identity(p),
        birthYear: p.birth_year,
        sex: p.sex,
        condition: p.condition,
        expectedUploadsPerWeek: p.expected_uploads_per_week,
        sessionsCount: s?.sessions_count ?? 0,
        lastUploadAt: isoOrNull(s?.last_upload_at),
        lastRecordedAt: isoOrNull(s?.last_recorded_at),
        adherencePct: recentAdherencePct(p, dates.get(p.id) ?? [], now),
        // Named in words with a severity, most urgent first (clinical/caseload-flags.ts).
        flags: orderCaseloadFlags(flags.get(p.id) ?? []),
        latest: {
          sessionId: l?.sessionId ?? null,
          cadenceStepsPerMin: value("cadenceStepsPerMin"),
          strideTimeCvPct: value("strideTimeCvPct"),
          phaseCoordinationIndexPct: value("phaseCoordinationIndexPct"),
          walkingSpeedMPerS: value("walkingSpeedMPerS"),
        },
      };
    }),
  };
}

export async function getPatient(deps: AppDeps, req: Request, auth: AuthContext, id: string) {
  await assertPatientAccess(deps.db, auth, id, "identity");
  const p = (await findPatient(deps.db, id))!;
  await audit(deps.db, req, { action: "patient.read", resourceType: "patient", resourceId: id, patientId: id });
  if (auth.role === "admin") return identity(p);
  return {
    ...identity(p),
    birthYear: p.birth_year,
    sex: p.sex,
    condition: p.condition,
    conditionDetail: p.condition_detail,
    expectedUploadsPerWeek: p.expected_uploads_per_week,
    heightCm: p.height_cm === null ? null : Number(p.height_cm),
  };
}

/**
 * A caseload clinician edits the patient's clinical fields (height). The change and its audit
 * event commit together; the value itself is not copied into the audit details. Sessions already
 * processed keep their results until reprocessed (the worker reads the height at processing time).
 */
export async function updatePatient(deps: AppDeps, req: Request, auth: AuthContext, id: string, body: PatientUpdate) {
  if (auth.role !== "clinician") throw new HttpError(404, "not_found", "patient not found");
  await assertPatientAccess(deps.db, auth, id, "clinical");
  await deps.db.transaction(async (trx) => {
    if (!(await updatePatientFields(trx, id, { height_cm: body.heightCm }))) throw new HttpError(404, "not_found", "patient not found");
    await audit(trx, req, { action: "patient.update", resourceType: "patient", resourceId: id, patientId: id, details: { fields: Object.keys(body) } });
  });
  return getPatient(deps, req, auth, id);
}

export async function getPatientSessions(deps: AppDeps, req: Request, auth: AuthContext, id: string, limit: number, offset: number) {
  await assertPatientAccess(deps.db, auth, id, "clinical");
  const { items, total } = await listSessions(deps.db, id, limit, offset);
  const metrics = await readSessionMetrics(deps.db, items.map((s) => s.id), SUMMARY_KEYS);
  await audit(deps.db, req, { action: "patient.read_sessions", resourceType: "patient", resourceId: id, patientId: id });
  return { items: items.map((s) => toSummary(s, metricValues(metrics.get(s.id)))), total, limit, offset };
}

function parseKeys(raw: string | undefined): string[] | null {
  if (!raw) return null;
  const keys = raw.split(",").map((k) => k.trim()).filter(Boolean);
  const unknown = keys.filter((k) => !metricDefinition(k));
  if (unknown.length) throw new HttpError(400, "invalid_request", `unknown metric key(s): ${unknown.join(", ")}`, { known: METRIC_KEYS });
  return keys;
}

/**
 * Per metric, one point per processed session, annotated by the clinical-change module (flags,
 * baseline, MDC, reference bands, coordination events, cautions). The flags support the
 * clinician's reading of a trend; they are not a diagnosis and defer to local protocols.
 */
function trendsPayload(id: string, p: Pick<PatientRow, "birth_year" | "condition" | "enrolled_on">, rows: Awaited<ReturnType<typeof trendRows>>, query: { from?: string; to?: string }) {
  // Catalogue order, so the portal's metric list is stable. The date window only hides points:
  // baselines, MDC and events always come from the whole series, so zooming never moves them.
  const grouped = metricSeries(rows);
  const annotated = annotateTrends({
    metrics: grouped,
    patient: { birthYear: p.birth_year, condition: p.condition, enrolledOn: p.enrolled_on },
    options: { ...(query.from ? { visibleFrom: query.from } : {}), ...(query.to ? { visibleTo: query.to } : {}) },
  });
  // The annotations rebuild each point; the count behind it and the session's walking aid are put back.
  const extra = new Map(grouped.flatMap((m) => m.points.map((pt) => [`${m.key}|${pt.sessionId}`, pt] as const)));
  return {
    patientId: id,
    metrics: annotated.metrics.map((m) => ({
      ...m,
      label: metricDefinition(m.key)?.label,
      countNoun: metricDefinition(m.key)?.countNoun,
      points: m.points.map((pt) => {
        const e = extra.get(`${m.key}|${pt.sessionId}`);
        return { ...pt, n: e?.n ?? null, walkingAid: e?.walkingAid ?? null };
      }),
    })),
    events: annotated.events,
    cautions: annotated.cautions,
  };
}

/**
 * The trend answer as JSON text, from the per-process cache when the patient's processed sessions
 * have not changed since it was built (see http/answer-cache.ts). Every read is access-checked and audited.
 */
export async function getTrendsJson(
  deps: AppDeps,
  req: Request,
  auth: AuthContext,
  id: string,
  query: { metrics?: string; from?: string; to?: string },
  cache: AnswerCache,
  serialize: (payload: unknown) => string,
): Promise<CachedAnswer> {
  const keys = parseKeys(query.metrics);
  const scope = clinicalPatientScope(deps.db, auth);
  const context = scope
    ? await readTrendContext(deps.db, id, scope, auditRow(req, { action: "patient.read_trends", resourceType: "patient" }))
    : undefined;
  if (!context) throw new HttpError(404, "not_found", "patient not found");
  const p = context.patient;
  const fingerprint = `${context.fingerprint}|${p.birth_year}|${p.condition}|${p.enrolled_on}`;
  const key = `${id}|${keys?.join(",") ?? "*"}|${query.from ?? ""}|${query.to ?? ""}`;
  return cache.get(key, fingerprint) ?? (await cache.set(key, fingerprint, serialize(trendsPayload(id, p, await trendRows(deps.db, id, keys), query))));
}
