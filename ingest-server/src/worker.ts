import { ensureClinicalSchedules, workClinicalJobs } from "./clinical/notifications";
import { loadConfigOrExit } from "./config/env";
import { startModeRefusal } from "./config/start-mode";
import { handleProcessSessionJob, requeueStaleSessions } from "./processing/session-job";
import { QUEUES } from "./queue/queue";
import { refreshStaleCaseloadFlags } from "./trends/caseload-flags.repository";
import type { ProcessSessionJob } from "./sessions/process-session-job";
import { createRuntime } from "./runtime";

/**
 * `npm run worker`: processes uploaded sessions from the PostgreSQL-backed queue. Start as many as
 * you like on as many machines as you like against the same DATABASE_URL: pg-boss hands each job to
 * exactly one of them, a job whose worker died is retried after it expires, and processSession is
 * idempotent, so a retried job leaves one set of results.
 */
const config = loadConfigOrExit();

const runtime = createRuntime(config, { application: "pendula-worker" });
const { deps } = runtime;
const refusal = await startModeRefusal(config, deps.db);
if (refusal) {
  console.error(refusal);
  await runtime.close();
  process.exit(1);
}
const SWEEP_INTERVAL_MS = 5 * 60 * 1000;

// One session at a time per process: one fetch loop, one job per fetch, so a worker never holds
// more than one session's arrays (a 30-minute four-sensor session peaks near 300 MB). Scale by
// starting more processes, up to the cores available.
// The arrays are out of reach once a job returns, but the engine frees them only at its next full
// collection, which under a burst can come after the next session has allocated its own: the one
// worker of a 40-session burst peaked at 386 MB against 313 MB one session at a time. So a full
// collection ends each job when Node exposes one (scripts/lib/product.sh and `npm run worker` start
// the worker with --expose-gc); it costs a few milliseconds against the session's seconds.
const collectGarbage = (globalThis as { gc?: () => void }).gc;
await deps.queue.work<ProcessSessionJob>(
  QUEUES.processSession,
  async (job) => {
    try {
      return await handleProcessSessionJob(deps, job);
    } finally {
      collectGarbage?.();
    }
  },
  { batchSize: 1, pollingIntervalSeconds: 2 },
);
// Weekly reminders and digests (cron in the same queue) and per-session change alerts.
await ensureClinicalSchedules(config);
await workClinicalJobs(deps);
const sweep = async () => {
  try {
    const n = await requeueStaleSessions(deps);
    if (n > 0) console.error(`[worker] re-enqueued ${n} stale session(s)`);
  } catch (err) {
    console.error("[worker] stale-session sweep failed", err);
  }
};
await sweep();
const timer = setInterval(sweep, SWEEP_INTERVAL_MS);
// Stored caseload flags of another rules version (or never stored: a database from before the
// table) are recomputed now, in the background, so the caseload's first read does not do it.
// One worker at a time (advisory lock); the others skip, and a read recomputes any row left over.
void (async () => {
  try {
    const n = await deps.db.transaction(async (trx) => {
      const got = await trx.raw("SELECT pg_try_advisory_xact_lock(hashtext('pendula.caseload_flags.refresh')) AS got");
      return got.rows[0]?.got ? refreshStaleCaseloadFlags(deps.db) : 0;
    });
    if (n > 0) console.log(`[worker] caseload flags recomputed for ${n} patient(s)`);
  } catch (err) {
    console.error("[worker] caseload flag refresh failed; the caseload will recompute stale rows on read", err);
  }
})();
console.log(`worker ready: ${QUEUES.processSession}`);

let stopping = false;
async function shutdown(signal: string): Promise<void> {
  if (stopping) return;
  stopping = true;
  console.error(`${signal}: worker stopping after the current job`);
  clearInterval(timer);
  const force = setTimeout(() => process.exit(1), 15_000);
  force.unref();
  await runtime.close();
  process.exit(0);
}
process.on("SIGINT", () => void shutdown("SIGINT"));
process.on("SIGTERM", () => void shutdown("SIGTERM"));
