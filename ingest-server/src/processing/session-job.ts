import { SignalInputError } from "@pendula/signal";
import type { AppDeps } from "../deps";
import { QUEUES, type QueueJob } from "../queue/queue";
import type { ProcessSessionJob } from "../sessions/process-session-job";
import { enqueueChangeAlerts } from "../clinical/notifications";
import { refreshCaseloadFlags } from "../trends/caseload-flags.repository";
import { markFailed, markRetrying, processSession } from "./process-session";

/** Short, clinician-readable reason; the full error goes to the worker log. */
export function failureText(err: unknown): string {
  if (err instanceof SignalInputError) return `the recording could not be analysed: ${err.message}`;
  if (err instanceof Error) return `processing failed: ${err.message}`;
  return `processing failed: ${String(err)}`;
}

/**
 * One attempt of a process-session job. On failure the session shows the error at once; it stays
 * `queued` while pg-boss has retries left (with backoff) and becomes `failed` on the last attempt.
 * Bad input (SignalInputError) cannot improve on retry, so it fails immediately and the job ends
 * without burning retries. The raw files are never touched: reprocess starts again from them.
 */
export async function handleProcessSessionJob(deps: Pick<AppDeps, "db" | "storage" | "queue">, job: QueueJob<ProcessSessionJob>): Promise<void> {
  const { sessionId } = job.data;
  let outcome;
  try {
    outcome = await processSession(deps, sessionId);
  } catch (err) {
    const text = failureText(err);
    const last = job.retryCount >= job.retryLimit || err instanceof SignalInputError;
    console.error(`[worker] session ${sessionId} attempt ${job.retryCount + 1}/${job.retryLimit + 1} failed`, err);
    if (last) {
      await markFailed(deps.db, sessionId, text);
      // A reprocessed session that failed has left the patient's processed series.
      await storeFlagsOf(deps, sessionId);
      return;
    }
    await markRetrying(deps.db, sessionId, text);
    throw err;
  }
  if (outcome !== "done") return;
  await storeFlagsOf(deps, sessionId);
  // Alerts are a separate job: a mail-server outage must not turn a processed session into a failed one.
  try {
    await enqueueChangeAlerts(deps, sessionId);
  } catch (err) {
    console.error(`[worker] session ${sessionId}: could not enqueue change alerts`, err);
  }
}

/**
 * Stores the caseload flags of the session's patient as they stand now. Right after the commit
 * that marked the session processed, so the first caseload read after it (or after a restart)
 * reads them instead of recomputing. A failure here costs only that: the caseload read sees the
 * stale fingerprint and recomputes the row, so it never fails the job.
 */
async function storeFlagsOf(deps: Pick<AppDeps, "db">, sessionId: string): Promise<void> {
  try {
    const row: { patient_id: string } | undefined = await deps.db("walk_sessions").where({ id: sessionId }).first("patient_id");
    if (row) await refreshCaseloadFlags(deps.db, [row.patient_id]);
  } catch (err) {
    console.error(`[worker] session ${sessionId}: could not store caseload flags (the caseload will recompute them)`, err);
  }
}

/**
 * Sessions left `queued` or `processing` for longer than `olderThanS` without a job that will
 * finish them — the server died between commit and enqueue, or a job expired — are sent again.
 * Safe to run on every worker at once: the send is a singleton per session and processing is idempotent.
 */
export const MAX_ATTEMPTS_BEFORE_GIVING_UP = 10;

export async function requeueStaleSessions(deps: Pick<AppDeps, "db" | "queue">, olderThanS = 20 * 60): Promise<number> {
  // A session that keeps killing its worker (e.g. out of memory) must not loop for ever.
  await deps.db("walk_sessions")
    .whereIn("status", ["queued", "processing"])
    .andWhere("attempts", ">=", MAX_ATTEMPTS_BEFORE_GIVING_UP)
    .update({ status: "failed", error: "processing did not finish after repeated attempts; contact support", updated_at: deps.db.fn.now() });
  const stale = await deps.db("walk_sessions")
    .whereIn("status", ["queued", "processing"])
    .andWhere("updated_at", "<", deps.db.raw("now() - (? || ' seconds')::interval", [String(olderThanS)]))
    .select("id")
    .limit(500);
  for (const row of stale) await deps.queue.send(QUEUES.processSession, { sessionId: row.id }, { singletonKey: row.id });
  return stale.length;
}
