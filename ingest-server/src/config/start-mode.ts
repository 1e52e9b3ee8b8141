import type { Knex } from "knex";
import { isDemoMode, type Config } from "./env";

/** Printed by every demo-mode process at start, and by `npm start`. */
export const DEMO_MODE_BANNER =
  "DEMO MODE — demo accounts with a published password, captured mail at /api/dev/mailbox; not for patient data";

/**
 * Accounts of the invented demo scenario: flagged by the seed (users.is_demo) or, for databases
 * seeded before that flag, on the scenario's own e-mail domain.
 */
export async function countDemoAccounts(db: Knex): Promise<number> {
  const row = await db("users")
    .where({ is_demo: true })
    .orWhereRaw("lower(email) LIKE ?", ["%@demo.pendula.test"])
    .count<{ n: string }[]>({ n: "*" })
    .first();
  return Number(row?.n ?? 0);
}

/**
 * What a process may do in its mode, decided before it serves anything: demo mode announces itself;
 * production refuses to run while any demo account exists (its password is in the README).
 * Returns the refusal, or null when the process may go on.
 */
export async function startModeRefusal(config: Pick<Config, "mode">, db: Knex, log: (line: string) => void = console.error): Promise<string | null> {
  if (isDemoMode(config)) {
    log(`[pendula] ${DEMO_MODE_BANNER}`);
    return null;
  }
  const demo = await countDemoAccounts(db);
  if (demo === 0) return null;
  return (
    `[pendula] refusing a production start: ${demo} demo account(s) with the published demo password exist in this ` +
    "database; use a database without the demo scenario (or start with PENDULA_MODE=demo for a demonstration)"
  );
}
