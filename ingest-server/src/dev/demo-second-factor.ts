import type { Knex } from "knex";
import { DEMO_STAFF, DEMO_TOTP_SECRET } from "../../../db/seeds/demo-scenario";
import { sealSecret } from "../auth/secret-box";
import { isDemoMode, type Config } from "../config/env";

/**
 * Gives the demo staff accounts their published authenticator secret, so a visitor can still sign
 * in as staff (staff roles need a second factor). Demo mode only: anywhere else a published secret
 * would be a hole, so this refuses.
 */
export async function enrolDemoStaff(db: Knex, config: Config): Promise<number> {
  if (!isDemoMode(config)) throw new Error("the demo authenticator secret is only seeded in demo mode (PENDULA_MODE=demo)");
  const users = await db("users")
    .whereRaw("lower(email) = ANY(?)", [DEMO_STAFF.map((s) => s.email.toLowerCase())])
    .select("id");
  for (const u of users) {
    await db("user_totp")
      .insert({ user_id: u.id, secret_sealed: sealSecret(DEMO_TOTP_SECRET, config), confirmed_at: db.fn.now() })
      .onConflict("user_id")
      .ignore();
  }
  return users.length;
}
