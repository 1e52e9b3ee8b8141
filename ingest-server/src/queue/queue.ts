import { randomUUID } from "node:crypto";
import PgBoss from "pg-boss";

/** Queue names: one constant per kind of job, shared by producers and workers. */
export const QUEUES = {
  processSession: "process-session",
  sendEmail: "send-email",
  clinicalChange: "clinical-change",
} as const;
export type QueueName = (typeof QUEUES)[keyof typeof QUEUES];

/**
 * pg-boss 10 decides deduplication per queue. `stately`: per singletonKey at most one job waiting
 * (created or retry) and one active, so "reprocess" clicked twice queues one job while the first
 * still runs. Queues not listed are `standard` (no deduplication; singletonKey has no effect there).
 */
export const QUEUE_POLICIES: Partial<Record<string, "standard" | "stately">> = {
  [QUEUES.processSession]: "stately",
};

export interface SendOptions {
  /** On a `stately` queue (QUEUE_POLICIES): one waiting and one active job per key. */
  singletonKey?: string;
  retryLimit?: number;
  /** Seconds before the first retry. */
  retryDelay?: number;
  /** Exponential backoff from retryDelay. */
  retryBackoff?: boolean;
}

export interface QueueJob<T> {
  id: string;
  name: string;
  data: T;
  /** 0 on the first attempt. */
  retryCount: number;
  retryLimit: number;
}

export interface WorkOptions {
  /** Jobs fetched and handled one after another per poll (default 1). */
  batchSize?: number;
  /**
   * How often an idle worker looks for jobs (default 2 s). A job sent through this class also
   * wakes idle workers at once (NOTIFY_CHANNEL), so this is the fallback, not the pick-up delay.
   */
  pollingIntervalSeconds?: number;
}

/**
 * After each send, `pg_notify(NOTIFY_CHANNEL, <queue name>)`; every process working that queue
 * listens and wakes its idle worker, so a job is picked up in milliseconds instead of after up to
 * one polling interval. A lost notification (listener reconnecting) only falls back to polling.
 */
export const NOTIFY_CHANNEL = "pendula_job_sent";

/** The part of pg's pooled client the listener uses (pg-boss's own pool hands it out). */
interface ListenClient {
  query(sql: string): Promise<unknown>;
  on(event: "notification", listener: (msg: { channel: string; payload?: string }) => void): unknown;
  on(event: "error", listener: (err: Error) => void): unknown;
  release(err?: Error | boolean): void;
}

export interface JobQueue {
  /** Resolves with the job id, or null when a singletonKey job is already waiting. */
  send(name: string, data: object, options?: SendOptions): Promise<string | null>;
  /**
   * Runs `handler` for each job. A thrown error fails the attempt; pg-boss retries it until
   * retryLimit and then marks it failed (and moves it to `<name>-dead` when that queue exists).
   */
  work<T extends object>(name: string, handler: (job: QueueJob<T>) => Promise<void>, options?: WorkOptions): Promise<string>;
  start(): Promise<void>;
  stop(): Promise<void>;
}

export const DEFAULT_RETRY: Required<Omit<SendOptions, "singletonKey">> = { retryLimit: 3, retryDelay: 5, retryBackoff: true };

/**
 * pg-boss in its own schema of the application database. Any number of processes on any machines
 * may call work() on the same queue: pg-boss hands each job to one of them (SELECT … FOR UPDATE SKIP
 * LOCKED), so workers scale by just starting more of them.
 */
export class PgBossQueue implements JobQueue {
  private readonly boss: PgBoss;
  private readonly created = new Map<string, Promise<void>>();
  private started = false;
  private starting: Promise<void> | undefined;

  private readonly policies: Partial<Record<string, "standard" | "stately">>;
  /** Worker ids per queue name, woken by the listener. */
  private readonly workers = new Map<string, string[]>();
  private listener: Promise<ListenClient | undefined> | undefined;

  constructor(
    connectionString: string,
    options: {
      schema?: string;
      max?: number;
      application?: string;
      policies?: Partial<Record<string, "standard" | "stately">>;
      /** Seconds an active job may run before it counts as crashed and is retried (default 15 min). */
      expireInSeconds?: number;
      /** How often expired jobs are looked for (default 120 s). */
      maintenanceIntervalSeconds?: number;
    } = {},
  ) {
    this.policies = { ...QUEUE_POLICIES, ...options.policies };
    this.boss = new PgBoss({
      connectionString,
      schema: options.schema ?? "pgboss",
      max: options.max ?? 4,
      application_name: options.application ?? "pendula",
      // Jobs still active after this long are treated as crashed and retried.
      expireInSeconds: options.expireInSeconds ?? 15 * 60,
      maintenanceIntervalSeconds: options.maintenanceIntervalSeconds ?? 120,
      ...DEFAULT_RETRY,
    });
    this.boss.on("error", (err) => console.error("[queue]", err));
  }

  async start(): Promise<void> {
    // One shared start: concurrent first sends (a burst of uploads after boot) must all wait for
    // pg-boss to create its schema; pg-boss itself returns at once to a second caller while starting.
    this.starting ??= this.boss.start().then(
      () => {
        this.started = true;
      },
      (err: unknown) => {
        this.starting = undefined;
        throw err;
      },
    );
    await this.starting;
  }

  async stop(): Promise<void> {
    if (this.starting) await this.starting.catch(() => undefined);
    if (!this.started) return;
    this.started = false;
    this.starting = undefined;
    const listener = await this.listener?.catch(() => undefined);
    this.listener = undefined;
    listener?.release(true);
    await this.boss.stop({ graceful: true, wait: true, timeout: 10_000 });
  }

  /** pg-boss 10 needs a queue to exist before send/work; creating it is idempotent. */
  private async ensureQueue(name: string): Promise<void> {
    // Shared per name, like start(): concurrent senders wait for the one createQueue.
    let created = this.created.get(name);
    if (!created) {
      created = this.boss.createQueue(name, { name, policy: this.policies[name] ?? "standard", ...DEFAULT_RETRY });
      this.created.set(name, created);
      created.catch(() => this.created.delete(name));
    }
    await created;
  }

  async send(name: string, data: object, options: SendOptions = {}): Promise<string | null> {
    await this.start();
    await this.ensureQueue(name);
    // On a stately queue every key-less job would share the empty key; give each its own.
    const singletonKey = options.singletonKey ?? (this.policies[name] === "stately" ? randomUUID() : undefined);
    const id = await this.boss.send(name, data, { ...DEFAULT_RETRY, ...options, ...(singletonKey ? { singletonKey } : {}) });
    if (id) {
      // The job is committed; waking workers is best effort (they poll anyway).
      await this.boss
        .getDb()
        .executeSql("SELECT pg_notify($1, $2)", [NOTIFY_CHANNEL, name])
        .catch((err: unknown) => console.error("[queue] notify failed; workers will poll", err));
    }
    return id;
  }

  /**
   * One connection per process, held from pg-boss's pool, LISTENing on NOTIFY_CHANNEL. When the
   * pool is not reachable (another pg-boss layout) or the connection fails, workers just poll.
   */
  private listen(): Promise<ListenClient | undefined> {
    this.listener ??= (async () => {
      const pool = (this.boss.getDb() as { pool?: { connect(): Promise<ListenClient> } }).pool;
      if (!pool) return undefined;
      const client = await pool.connect();
      client.on("notification", (msg) => {
        if (msg.channel !== NOTIFY_CHANNEL || !msg.payload) return;
        for (const id of this.workers.get(msg.payload) ?? []) this.boss.notifyWorker(id);
      });
      client.on("error", (err) => {
        console.error("[queue] job listener lost; polling until it reconnects", err);
        this.listener = undefined;
        client.release(err);
        if (this.started) setTimeout(() => void this.listen().catch(() => undefined), 1000).unref();
      });
      await client.query(`LISTEN ${NOTIFY_CHANNEL}`);
      return client;
    })().catch((err: unknown) => {
      console.error("[queue] cannot listen for sent jobs; polling only", err);
      this.listener = undefined;
      return undefined;
    });
    return this.listener;
  }

  async work<T extends object>(
    name: string,
    handler: (job: QueueJob<T>) => Promise<void>,
    options: WorkOptions = {},
  ): Promise<string> {
    await this.start();
    await this.ensureQueue(name);
    const id = await this.boss.work<T>(
      name,
      { includeMetadata: true, batchSize: options.batchSize ?? 1, pollingIntervalSeconds: options.pollingIntervalSeconds ?? 2 },
      async (jobs) => {
        // pg-boss settles a fetched batch as a whole: with batchSize > 1 one failing job fails its
        // neighbours too, which is why the default is 1.
        for (const job of jobs) {
          await handler({ id: job.id, name: job.name, data: job.data, retryCount: job.retryCount, retryLimit: job.retryLimit });
        }
      },
    );
    this.workers.set(name, [...(this.workers.get(name) ?? []), id]);
    await this.listen();
    return id;
  }

  /** State of one job (tests and the reprocess route use it). */
  async getJob(name: string, id: string): Promise<{ state: string; retryCount: number; output: unknown } | null> {
    await this.start();
    const job = await this.boss.getJobById(name, id, { includeArchive: true });
    return job ? { state: job.state, retryCount: job.retryCount, output: job.output } : null;
  }
}
