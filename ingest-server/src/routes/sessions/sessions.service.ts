import type { Request } from "express";
import { audit, auditRow } from "../../audit/audit";
import { assertPatientAccess, clinicalPatientScope } from "../../auth/patient-access";
import type { SessionDetail, SessionSummary, SessionUpdate, SignalResponse } from "../../contracts/sessions";
import type { AppDeps } from "../../deps";
import { HttpError } from "../../http-error";
import type { AuthContext } from "../../middleware/authenticate";
import { metricDefinition } from "../../contracts/metric-catalog";
import { minMaxDecimate } from "../../processing/min-max-decimate";
import { metricValues, readSessionMetrics, type StoredMetric } from "../../sessions/metric-rows";
import { enqueueProcessing } from "../../sessions/process-session-job";
import type { AnswerCache, CachedAnswer } from "../../http/answer-cache";
import {
  findSession,
  listRawFiles,
  listTraces,
  markQueued,
  readSessionHead,
  sessionAnalysis,
  setWalkingAid,
  type SessionHead,
} from "../../sessions/sessions.repository";

const notFound = () => new HttpError(404, "not_found", "session not found");

/** The session if the caller may read it clinically; the same 404 whether it is missing or out of scope. */
export async function loadSessionFor(deps: AppDeps, auth: AuthContext, id: string): Promise<SessionHead> {
  const session = await findSession(deps.db, id);
  if (!session) throw notFound();
  try {
    await assertPatientAccess(deps.db, auth, session.patient_id, "clinical");
  } catch (err) {
    if (err instanceof HttpError && err.status === 404) throw notFound();
    throw err;
  }
  return session;
}

const iso = (d: Date | string) => new Date(d).toISOString();

export function toSummary(s: SessionHead, metrics: Record<string, number> = {}): SessionSummary {
  return {
    id: s.id,
    patientId: s.patient_id,
    status: s.status,
    progressPct: s.progress_pct,
    recordedAt: iso(s.recorded_at),
    uploadedAt: iso(s.created_at),
    durationS: s.duration_s,
    algorithmVersion: s.algorithm_version,
    ...(s.error ? { error: s.error } : {}),
    cadenceStepsPerMin: metrics.cadenceStepsPerMin ?? null,
    strideTimeCvPct: metrics.strideTimeCvPct ?? null,
    phaseCoordinationIndexPct: metrics.phaseCoordinationIndexPct ?? null,
    walkingSpeedMPerS: metrics.walkingSpeedMPerS ?? null,
    strideLengthM: metrics.strideLengthM ?? null,
    walkingAid: s.walking_aid ?? null,
  };
}

/**
 * The session answer as JSON text, from the per-process cache while the session row is unchanged
 * (every processing step and status change sets updated_at; files never change after upload).
 * Access check and audit row are one statement, so a repeated read is one round trip after
 * authentication. The status poll of a session being processed misses the cache each time its
 * progress moves, and then the answer is small (no analysis yet).
 */
export async function getSessionJson(
  deps: AppDeps,
  req: Request,
  auth: AuthContext,
  id: string,
  cache: AnswerCache,
  serialize: (payload: SessionDetail) => string,
): Promise<CachedAnswer> {
  const scope = clinicalPatientScope(deps.db, auth);
  const s = scope ? await readSessionHead(deps.db, id, scope, auditRow(req, { action: "session.read", resourceType: "session" })) : undefined;
  if (!s) throw notFound();
  const fingerprint = [
    new Date(s.updated_at).toISOString(),
    s.status,
    s.progress_pct,
    s.processed_at ? new Date(s.processed_at).toISOString() : "",
    s.algorithm_version ?? "",
    s.walking_aid ?? "",
  ].join("|");
  const hit = cache.get(id, fingerprint);
  if (hit) return hit;
  const [files, stored, analysis] = await Promise.all([
    listRawFiles(deps.db, id),
    readSessionMetrics(deps.db, [id]).then((m) => m.get(id) ?? new Map<string, StoredMetric>()),
    s.status === "done" ? sessionAnalysis(deps.db, id) : Promise.resolve(null),
  ]);
  const metrics = metricValues(stored);
  const metricCounts = Object.fromEntries(
    [...stored]
      .filter(([, m]) => m.n !== null)
      .map(([key, m]) => [key, { n: m.n!, countNoun: metricDefinition(key)?.countNoun ?? "strides" }]),
  );
  const detail: SessionDetail = {
    ...toSummary(s, metrics),
    files: files.map((f) => ({
      placement: f.placement as SessionDetail["files"][number]["placement"],
      deviceSerial: f.device_serial,
      sizeBytes: Number(f.size_bytes),
      format: f.format,
      originalName: f.original_name,
    })),
    ...(analysis ? { analysis: analysis as SessionDetail["analysis"] } : {}),
    metricCounts,
  };
  return cache.set(id, fingerprint, serialize(detail));
}

export async function getSessionSignal(
  deps: AppDeps,
  req: Request,
  auth: AuthContext,
  id: string,
  query: { placement?: string; from?: number; to?: number; maxPoints: number },
): Promise<SignalResponse> {
  const s = await loadSessionFor(deps, auth, id);
  if (s.status !== "done") throw new HttpError(409, "not_processed", `session is ${s.status}; the signal is available once processing is done`);
  const rows = await listTraces(deps.db, id, query.placement);
  if (query.placement && rows.length === 0) throw new HttpError(404, "not_found", `no ${query.placement} trace in this session`);
  const duration = s.duration_s ?? Math.max(0, ...rows.map((r) => (r.sample_count - 1) / r.sample_rate_hz));
  const fromS = query.from ?? 0;
  const toS = query.to ?? duration;
  if (toS < fromS) throw new HttpError(400, "invalid_request", "`to` must not be before `from`");
  await audit(deps.db, req, { action: "session.read_signal", resourceType: "session", resourceId: id, patientId: s.patient_id });
  return {
    sessionId: id,
    unit: "deg/s",
    quantity: "sagittal angular velocity",
    fromS,
    toS,
    traces: rows.map((r) => {
      const buf: Buffer = r.samples;
      // Copy into an aligned buffer: a pg Buffer may start at any byte offset of its pool.
      const samples = new Float32Array(new Uint8Array(buf).buffer, 0, r.sample_count);
      const inWindow = Math.floor((toS - fromS) * r.sample_rate_hz) + 1;
      const out = minMaxDecimate(samples, r.sample_rate_hz, r.start_s, fromS, toS, query.maxPoints);
      return {
        placement: r.placement as SignalResponse["traces"][number]["placement"],
        sampleRateHz: r.sample_rate_hz,
        decimated: inWindow > query.maxPoints,
        timeS: out.timeS.map((t) => Math.round(t * 1e4) / 1e4),
        value: out.value.map((v) => Math.round(v * 100) / 100),
      };
    }),
  };
}

/**
 * The caseload clinician records the walking aid used in a session. The change and its audit event
 * commit together; updated_at moves, so cached session and trend answers are rebuilt. The stored
 * analysis is not re-run here (reprocess does that when the aid should inform the analysis).
 */
export async function updateSession(deps: AppDeps, req: Request, auth: AuthContext, id: string, body: SessionUpdate) {
  if (auth.role !== "clinician") throw notFound();
  const s = await loadSessionFor(deps, auth, id);
  await deps.db.transaction(async (trx) => {
    await setWalkingAid(trx, id, body.walkingAid);
    await audit(trx, req, {
      action: "session.update",
      resourceType: "session",
      resourceId: id,
      patientId: s.patient_id,
      details: { walkingAid: { from: s.walking_aid ?? null, to: body.walkingAid } },
    });
  });
  return { id, walkingAid: body.walkingAid };
}

/** Re-queues a session from its stored raw files (clinician of the caseload, or an admin). */
export async function reprocessSession(deps: AppDeps, req: Request, auth: AuthContext, id: string) {
  let session: SessionHead | undefined;
  if (auth.role === "admin") {
    session = await findSession(deps.db, id);
    if (!session) throw notFound();
  } else {
    session = await loadSessionFor(deps, auth, id);
  }
  await markQueued(deps.db, id);
  await enqueueProcessing(deps, id);
  await audit(deps.db, req, { action: "session.reprocess", resourceType: "session", resourceId: id, patientId: session.patient_id });
  return { id, status: "queued" as const };
}
