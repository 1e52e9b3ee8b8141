import { createDb } from "@pendula/db";
import type { Config } from "./config/env";
import type { AppDeps } from "./deps";
import { SmtpMailer } from "./mail/mailer";
import { PgBossQueue } from "./queue/queue";
import { S3ObjectStorage } from "./storage/object-storage";

export interface Runtime {
  deps: AppDeps;
  close(): Promise<void>;
}

/** Real adapters from a Config, shared by server.ts, worker.ts and the test harness. */
export function createRuntime(config: Config, options: { application?: string } = {}): Runtime {
  const db = createDb(config.databaseUrl);
  const storage = S3ObjectStorage.fromConfig(config.s3);
  const mailer = new SmtpMailer(db, config.smtp);
  const queue = new PgBossQueue(config.databaseUrl, {
    schema: config.queueSchema,
    application: options.application,
    expireInSeconds: config.queue.expireS,
    maintenanceIntervalSeconds: config.queue.maintenanceS,
  });
  return {
    deps: { db, config, storage, mailer, queue },
    async close() {
      await queue.stop();
      mailer.close();
      storage.destroy();
      await db.destroy();
    },
  };
}
