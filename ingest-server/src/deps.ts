import type { Knex } from "knex";
import type { Config } from "./config/env";
import type { Mailer } from "./mail/mailer";
import type { JobQueue } from "./queue/queue";
import type { ObjectStorage } from "./storage/object-storage";

/** Everything a router needs from the outside world; tests pass real local services here. */
export interface AppDeps {
  db: Knex;
  config: Config;
  storage: ObjectStorage;
  mailer: Mailer;
  queue: JobQueue;
}
