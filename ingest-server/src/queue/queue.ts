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
  pollingIntervalSeconds?: number;
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
    return this.boss.send(name, data, { ...DEFAULT_RETRY, ...options, ...(singletonKey ? { singletonKey } : {}) });
  }

  async work<T extends object>(
    name: string,
    handler: (job: QueueJob<T>) => Promise<void>,
    options: WorkOptions = {},
  ): Promise<string> {
    await this.start();
    await this.ensureQueue(name);
    return this.boss.work<T>(
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
  }

  /** State of one job (tests and the reprocess route use it). */
  async getJob(name: string, id: string): Promise<{ state: string; retryCount: number; output: unknown } | null> {
    await this.start();
    const job = await this.boss.getJobById(name, id, { includeArchive: true });
    return job ? { state: job.state, retryCount: job.retryCount, output: job.output } : null;
  }
}
