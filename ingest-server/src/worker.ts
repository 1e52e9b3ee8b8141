import { ensureClinicalSchedules, workClinicalJobs } from "./clinical/notifications";
import { loadConfigOrExit } from "./config/env";
import { startModeRefusal } from "./config/start-mode";
import { handleProcessSessionJob, requeueStaleSessions } from "./processing/session-job";
import { QUEUES } from "./queue/queue";
import type { ProcessSessionJob } from "./routes/sessions/upload.service";
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

await deps.queue.work<ProcessSessionJob>(QUEUES.processSession, (job) => handleProcessSessionJob(deps, job));
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
