import PgBoss from "pg-boss";
import { createDb, ensureAppRole, grantAppRole, roleFromUrl } from "@pendula/db";
import { ensureClinicalSchedules } from "../clinical/notifications";
import { DEFAULT_RETRY, QUEUE_POLICIES, QUEUES } from "../queue/queue";

export interface PrepareDatabaseOptions {
  /** The tables' owner (the cluster's superuser in `npm start`): runs every DDL statement. */
  migrationUrl: string;
  /** What the server and workers connect with; its user becomes the application role. */
  appUrl: string;
  queueSchema: string;
  log?: (line: string) => void;
}

/**
 * Run after the migrations, as their role. The server and workers then need no DDL at all:
 * - the queue's schema is installed (or upgraded) by pg-boss here, and every queue the product
 *   uses is created here, because pg-boss 10 adds a table partition per new queue;
 * - the application role from `appUrl` exists with exactly its password and the row privileges it
 *   needs on the app's tables and the queue's (db/src/app-role.ts).
 * When both URLs name the same user (throwaway test clusters) only the queue part runs.
 */
export async function prepareDatabase(options: PrepareDatabaseOptions): Promise<void> {
  const log = options.log ?? ((line: string) => console.error(line));
  const boss = new PgBoss({ connectionString: options.migrationUrl, schema: options.queueSchema, supervise: false, schedule: false, max: 1 });
  boss.on("error", (err) => log(`[prepare-database] queue: ${String(err)}`));
  await boss.start();
  try {
    // Same options as PgBossQueue.ensureQueue, so the first creator's settings are the intended ones.
    for (const name of Object.values(QUEUES)) {
      await boss.createQueue(name, { name, policy: QUEUE_POLICIES[name] ?? "standard", ...DEFAULT_RETRY });
    }
  } finally {
    await boss.stop({ graceful: false, wait: true });
  }
  await ensureClinicalSchedules({ databaseUrl: options.migrationUrl, queueSchema: options.queueSchema, publicUrl: "" });

  const app = roleFromUrl(options.appUrl);
  const admin = createDb(options.migrationUrl);
  try {
    const { rows } = await admin.raw(
      "SELECT current_user AS name, rolsuper OR rolcreaterole AS manages_roles FROM pg_roles WHERE rolname = current_user",
    );
    const me = rows[0] as { name: string; manages_roles: boolean };
    if (!app || app.name === me.name) {
      log(`[prepare-database] the application connects as ${me.name}, the migration role: no separate role to prepare`);
      return;
    }
    if (me.manages_roles) await ensureAppRole(admin, app);
    else log(`[prepare-database] ${me.name} cannot manage roles: ${app.name} must exist already (created by your DBA)`);
    await grantAppRole(admin, app.name, ["public", options.queueSchema]);
    log(`[prepare-database] role ${app.name}: rows of the app's tables and the queue, no DDL`);
  } finally {
    await admin.destroy();
  }
}
