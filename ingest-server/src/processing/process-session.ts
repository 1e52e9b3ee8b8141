import {
  ALGORITHM_VERSION,
  analyze,
  readUploadSet,
  SignalInputError,
  type Analysis,
  type AnalyzeOptions,
  type Placement,
  type SensorRecording,
  type UploadFile,
} from "@pendula/signal";
import type { WalkingAid } from "../contracts/enums";
import type { Knex } from "knex";
import type { AppDeps } from "../deps";
import { metricRows } from "../metrics/analysis-metric-rows";
import { findSession, listRawFiles, type RawFileRow } from "../sessions/sessions.repository";
import { ObjectNotFoundError } from "../storage/object-storage";
import { parsedRecordingsKey, ParsedRecordingsMismatch, readParsedRecordings } from "../uploads/parsed-recordings";
import { sagittalTraces, type SessionTrace } from "./session-traces";

export type ProcessDeps = Pick<AppDeps, "db" | "storage">;

export type ProcessOutcome = "done" | "missing";

/**
 * Loads a session's raw files from storage, reads them with the upload's own readUploadSet,
 * applies the placements recorded at upload (from the device assignments), runs analyze() and
 * writes the result — analysis, metrics, strides and chart traces — in ONE transaction that first
 * deletes whatever an earlier run wrote. A re-run, or a retry after a crash half-way, therefore
 * leaves exactly one set of rows. The row lock on walk_sessions serialises two workers that were
 * handed the same session (a reprocess racing a retry): the second simply rewrites the same set.
 *
 * Throws on failure; the worker decides between retry and `failed` (see worker.ts).
 */
export async function processSession(deps: ProcessDeps, sessionId: string): Promise<ProcessOutcome> {
  const session = await findSession(deps.db, sessionId);
  if (!session) return "missing";
  // Independent statements on separate pool connections: their round trips overlap.
  const [, files, options] = await Promise.all([
    deps.db("walk_sessions")
      .where({ id: sessionId })
      .update({ status: "processing", progress_pct: 5, attempts: deps.db.raw("attempts + 1"), updated_at: deps.db.fn.now() }),
    listRawFiles(deps.db, sessionId),
    analysisOptions(deps.db, session.patient_id, session.walking_aid),
  ]);
  if (files.length === 0) throw new Error(`session ${sessionId} has no raw files`);
  const recordings = await loadRecordings(deps, files, parsedRecordingsKey(session.patient_id, sessionId));
  await setProgress(deps.db, sessionId, 30);

  const { sagittal, ...analysis } = analyze(recordings, { ...options, sagittalSignals: true });
  await setProgress(deps.db, sessionId, 70);
  // The chart traces are the analysis' own signals; they are stored as arrays, not in the JSON.
  const traces = sagittalTraces({ sagittal });

  await writeResults(deps.db, sessionId, session.patient_id, session.recorded_at, analysis, traces);
  return "done";
}

/**
 * What the analysis is told about the person and the test: the patient's standing height (spatial
 * estimates scale with it) and the walking aid the clinician recorded for this session (with an aid
 * the arms do not swing freely, so the analysis withholds arm–leg coupling).
 */
export async function analysisOptions(
  db: Knex,
  patientId: string,
  walkingAid: WalkingAid | null,
): Promise<AnalyzeOptions> {
  const patient = await db("patients").where({ id: patientId }).first("height_cm");
  const heightCm = patient?.height_cm === null || patient?.height_cm === undefined ? undefined : Number(patient.height_cm);
  return {
    ...(heightCm !== undefined && Number.isFinite(heightCm) ? { heightCm } : {}),
    ...(walkingAid ? { walkingAid } : {}),
  };
}

async function setProgress(db: Knex, sessionId: string, pct: number): Promise<void> {
  await db("walk_sessions").where({ id: sessionId }).update({ progress_pct: pct, updated_at: db.fn.now() });
}

/**
 * Stored files → recordings, read by signal's readUploadSet exactly as the upload read them, with the
 * upload-time placements (from the device assignments; a file header's placement is not trusted)
 * and each BIDS set's acquisition time as recorded at upload.
 */
export async function loadRecordings(deps: Pick<ProcessDeps, "storage">, files: RawFileRow[], parsedKey?: string): Promise<SensorRecording[]> {
  const parsed = parsedKey === undefined ? undefined : await loadParsedRecordings(deps, files, parsedKey);
  if (parsed) return parsed;
  const input: UploadFile[] = [];
  for (const f of files) input.push({ name: f.original_name, bytes: await deps.storage.get(f.storage_key) });
  const startOf = new Map(files.map((f) => [f.original_name, new Date(f.start_utc).toISOString()]));
  const set = readUploadSet(input, { bidsStartUtc: (motionFileName) => startOf.get(motionFileName) });
  const first = set.errors[0];
  // Bad input, as the reader words it: session-job fails it at once (a retry cannot fix it).
  if (first) throw new SignalInputError(first.message, first.file, first.line, first.column);
  return withStoredPlacements(set.recordings, set.recordingFile, files);
}

function withStoredPlacements(recordings: SensorRecording[], recordingFile: number[], files: RawFileRow[]): SensorRecording[] {
  return recordings.map((r, i) => {
    const f = files[recordingFile[i]!]!;
    const placement = f.format === "bids-motion" ? (f.recording_placements?.[r.deviceSerial] ?? f.placement) : f.placement;
    return { ...r, placement: placement as Placement };
  });
}

/**
 * The recordings the upload's parse thread stored (uploads/parsed-recordings.ts): the same arrays
 * readUploadSet gave at upload, so analysis input is bit-identical to parsing the originals, for a
 * download of about two thirds of the text's size and no parsing. Undefined — read the originals —
 * when the session has none (stored before they existed) or they belong to other files or another
 * version; any other storage error is thrown, so the job is retried.
 */
async function loadParsedRecordings(deps: Pick<ProcessDeps, "storage">, files: RawFileRow[], key: string): Promise<SensorRecording[] | undefined> {
  // The uploaded files are the record: with one of them gone the session must fail as it would
  // without this cache, not be analysed from a copy nobody could reprocess from.
  // The checks run beside the download, not before it.
  const [present, bytes] = await Promise.all([
    Promise.all(files.map((f) => deps.storage.exists(f.storage_key))),
    deps.storage.get(key).catch((err: unknown) => {
      if (err instanceof ObjectNotFoundError) return undefined;
      throw err;
    }),
  ]);
  if (present.includes(false) || bytes === undefined) return undefined;
  try {
    const { recordings, recordingFile } = readParsedRecordings(bytes, files.map((f) => f.sha256));
    if (recordingFile.some((i) => files[i] === undefined)) throw new ParsedRecordingsMismatch("a recording names a file the session does not have");
    return withStoredPlacements(recordings, recordingFile, files);
  } catch (err) {
    if (!(err instanceof ParsedRecordingsMismatch)) throw err;
    console.error(`[worker] ${key} not used (${err.message}); reading the uploaded files`);
    return undefined;
  }
}

async function writeResults(
  db: Knex,
  sessionId: string,
  patientId: string,
  recordedAt: Date,
  analysis: Analysis,
  traces: SessionTrace[],
): Promise<void> {
  await db.transaction(async (trx) => {
    await trx("walk_sessions").where({ id: sessionId }).forUpdate().first("id");
    await trx("session_metrics").where({ session_id: sessionId }).delete();
    await trx("strides").where({ session_id: sessionId }).delete();
    await trx("session_traces").where({ session_id: sessionId }).delete();

    const metrics = metricRows(analysis.metrics);
    if (metrics.length > 0) {
      await trx("session_metrics").insert(
        metrics.map((m) => ({ session_id: sessionId, patient_id: patientId, recorded_at: recordedAt, metric_key: m.key, value: m.value, unit: m.unit, n: m.n })),
      );
    }
    // One statement with one array per column (a 30-minute session has over 3000 strides): the
    // values travel as the same text as row-by-row parameters would, so what is stored is the same,
    // but PostgreSQL parses twelve arrays instead of some 40 000 parameters (bench:e2e: 140–480 ms
    // in four 1000-row inserts).
    const strides = analysis.strides;
    if (strides.length > 0) {
      await trx.raw(
        `INSERT INTO strides (session_id, ordinal, side, ic_s, next_ic_s, fc_s, stride_time_s, stance_pct, swing_pct, double_support_pct, steady, excluded_reason)
         SELECT ?::uuid, * FROM unnest(?::int[], ?::text[], ?::float8[], ?::float8[], ?::float8[], ?::float8[], ?::float8[], ?::float8[], ?::float8[], ?::bool[], ?::text[])`,
        [
          sessionId,
          strides.map((_, ordinal) => ordinal),
          strides.map((s) => s.side),
          strides.map((s) => s.icS),
          strides.map((s) => s.nextIcS),
          strides.map((s) => s.fcS),
          strides.map((s) => s.strideTimeS),
          strides.map((s) => s.stancePct),
          strides.map((s) => s.swingPct),
          strides.map((s) => s.doubleSupportPct),
          strides.map((s) => s.steady),
          strides.map((s) => s.excludedReason ?? null),
        ] as Knex.Value[],
      );
    }
    for (const t of traces) {
      await trx("session_traces").insert({
        session_id: sessionId,
        placement: t.placement,
        sample_rate_hz: t.sampleRateHz,
        start_s: t.startS,
        sample_count: t.samples.length,
        samples: Buffer.from(t.samples.buffer, t.samples.byteOffset, t.samples.byteLength),
      });
    }
    await trx("walk_sessions")
      .where({ id: sessionId })
      .update({
        status: "done",
        progress_pct: 100,
        analysis: JSON.stringify(analysis),
        algorithm_version: analysis.algorithm?.version ?? ALGORITHM_VERSION,
        duration_s: analysis.session.durationS,
        error: null,
        processed_at: trx.fn.now(),
        updated_at: trx.fn.now(),
      });
  });
}

/** After the last attempt: the session shows `failed` with the reason, raw files untouched. */
export async function markFailed(db: Knex, sessionId: string, message: string): Promise<void> {
  await db("walk_sessions")
    .where({ id: sessionId })
    .update({ status: "failed", error: message.slice(0, 2000), updated_at: db.fn.now() });
}

/** Between attempts: queued again, with the last error visible while a retry is pending. */
export async function markRetrying(db: Knex, sessionId: string, message: string): Promise<void> {
  await db("walk_sessions")
    .where({ id: sessionId })
    .update({ status: "queued", progress_pct: 0, error: `retrying after: ${message}`.slice(0, 2000), updated_at: db.fn.now() });
}
