/**
 * The clinical e-mail jobs on the shared PostgreSQL queue (pg-boss).
 *
 * - `clinical-weekly-reminders`: cron Thursday 09:00 UTC — patients behind for the current ISO week.
 * - `clinical-weekly-digest`: cron Monday 07:00 UTC — counts for the ISO week that just ended.
 * - `clinical-change` (QUEUES.clinicalChange): one job per processed session, enqueued by the
 *   worker through `enqueueChangeAlerts(deps, sessionId)`.
 *
 * Every send goes through Mailer.send with an idempotency key, and the outbound_emails unique key
 * makes a retried or duplicated job send nothing twice; a job that fails half-way is simply run
 * again and skips what already went out.
 */
import PgBoss from "pg-boss";
import type { Knex } from "knex";
import type { Mailer } from "../../mail/mailer";
import { QUEUES, type JobQueue } from "../../queue/queue";
import { annotateTrends } from "../annotate-trends";
import { isoWeekLabel, isoWeekStart } from "../iso-week";
import {
  activeClinicians,
  caseloadPatientIds,
  cliniciansOf,
  patientTrendData,
  reminderCandidates,
  sessionRef,
  sessionsInWeek,
  type WeekRange,
} from "./repository";
import {
  alertReasons,
  digestCounts,
  selectChangeAlerts,
  selectDigest,
  selectReminders,
  type DigestPatient,
  type PlannedMail,
} from "./select-recipients";

export const CLINICAL_QUEUES = {
  changeAlerts: QUEUES.clinicalChange,
  weeklyReminders: "clinical-weekly-reminders",
  weeklyDigest: "clinical-weekly-digest",
} as const;

export const CLINICAL_SCHEDULES = [
  { name: CLINICAL_QUEUES.weeklyReminders, cron: "0 9 * * 4", tz: "UTC" },
  { name: CLINICAL_QUEUES.weeklyDigest, cron: "0 7 * * 1", tz: "UTC" },
] as const;

export interface ClinicalDeps {
  db: Knex;
  mailer: Mailer;
  queue: JobQueue;
  config: { publicUrl: string; databaseUrl: string; queueSchema: string };
}

export interface SendReport {
  planned: number;
  sent: number;
}

const WEEK_MS = 7 * 24 * 3600 * 1000;

function weekOf(now: Date): WeekRange {
  const start = isoWeekStart(now);
  return { start, end: new Date(start.getTime() + WEEK_MS) };
}

async function sendAll(mailer: Mailer, planned: readonly PlannedMail[]): Promise<SendReport> {
  let sent = 0;
  for (const m of planned) if ((await mailer.send(m)).sent) sent++;
  return { planned: planned.length, sent };
}

export async function sendWeeklyReminders(deps: ClinicalDeps, now: Date = new Date()): Promise<SendReport> {
  const week = weekOf(now);
  const candidates = await reminderCandidates(deps.db, week);
  return sendAll(deps.mailer, selectReminders(candidates, isoWeekLabel(now), deps.config.publicUrl));
}

/** Alerts the patient's clinicians when this session worsened beyond MDC or carries a coordination event. */
export async function sendChangeAlerts(deps: ClinicalDeps, sessionId: string): Promise<SendReport> {
  const ref = await sessionRef(deps.db, sessionId);
  if (!ref) return { planned: 0, sent: 0 };
  const data = await patientTrendData(deps.db, ref.patientId, { sessionId });
  if (!data) return { planned: 0, sent: 0 };
  const trends = annotateTrends({ metrics: data.metrics, patient: data.patient });
  const reasons = alertReasons(trends, sessionId);
  const clinicians = await cliniciansOf(deps.db, ref.patientId);
  return sendAll(deps.mailer, selectChangeAlerts(reasons, clinicians, ref, deps.config.publicUrl));
}

/** Digest for the ISO week before the one holding `now` (the job runs on Monday morning). */
export async function sendWeeklyDigests(deps: ClinicalDeps, now: Date = new Date()): Promise<SendReport> {
  const lastWeekDay = new Date(isoWeekStart(now).getTime() - 1);
  const week = weekOf(lastWeekDay);
  const label = isoWeekLabel(lastWeekDay);
  const planned: PlannedMail[] = [];
  const perPatient = new Map<string, DigestPatient>();
  for (const clinician of await activeClinicians(deps.db)) {
    const patients: DigestPatient[] = [];
    for (const patientId of await caseloadPatientIds(deps.db, clinician.userId)) {
      let summary = perPatient.get(patientId);
      if (!summary) {
        summary = await summarisePatientWeek(deps.db, patientId, week);
        perPatient.set(patientId, summary);
      }
      patients.push(summary);
    }
    const mail = selectDigest(clinician, digestCounts(label, patients), deps.config.publicUrl);
    if (mail) planned.push(mail);
  }
  return sendAll(deps.mailer, planned);
}

async function summarisePatientWeek(db: Knex, patientId: string, week: WeekRange): Promise<DigestPatient> {
  const sessionIds = await sessionsInWeek(db, patientId, week);
  const data = await patientTrendData(db, patientId, new Date(week.end.getTime() - 1).toISOString());
  const toReview = new Set<string>();
  if (data) {
    const trends = annotateTrends({ metrics: data.metrics, patient: data.patient });
    for (const id of sessionIds) {
      const r = alertReasons(trends, id);
      if (r.worsenedMetrics.length > 0 || r.eventKinds.length > 0) toReview.add(id);
    }
  }
  return { expectedPerWeek: data?.patient.expectedPerWeek ?? 0, sessionIds, sessionIdsToReview: [...toReview] };
}

/**
 * Called by the session worker after a session is processed. One queued job per session
 * (singletonKey), so a reprocess while the first alert job still waits adds nothing.
 */
export async function enqueueChangeAlerts(deps: Pick<ClinicalDeps, "queue">, sessionId: string): Promise<string | null> {
  return deps.queue.send(CLINICAL_QUEUES.changeAlerts, { sessionId }, { singletonKey: `alert:${sessionId}` });
}

/** Registers the three handlers on this process's queue (call from the worker process). */
export async function workClinicalJobs(deps: ClinicalDeps): Promise<void> {
  await deps.queue.work<{ sessionId: string }>(CLINICAL_QUEUES.changeAlerts, async (job) => {
    await sendChangeAlerts(deps, job.data.sessionId);
  });
  await deps.queue.work(CLINICAL_QUEUES.weeklyReminders, async () => {
    await sendWeeklyReminders(deps);
  });
  await deps.queue.work(CLINICAL_QUEUES.weeklyDigest, async () => {
    await sendWeeklyDigests(deps);
  });
}

/**
 * Writes the cron schedules (idempotent: pg-boss keeps one schedule row per queue name). The
 * JobQueue wrapper has no schedule(), so a short-lived pg-boss instance on the same schema does it;
 * every running pg-boss instance with scheduling on (the default) then fires them, once per tick
 * across all workers.
 */
export async function ensureClinicalSchedules(config: ClinicalDeps["config"]): Promise<void> {
  const boss = new PgBoss({ connectionString: config.databaseUrl, schema: config.queueSchema, supervise: false, schedule: false, max: 1 });
  boss.on("error", (err) => console.error("[clinical schedules]", err));
  await boss.start();
  try {
    for (const s of CLINICAL_SCHEDULES) {
      await boss.createQueue(s.name, { name: s.name });
      await boss.schedule(s.name, s.cron, {}, { tz: s.tz });
    }
  } finally {
    await boss.stop({ graceful: false, wait: true });
  }
}
