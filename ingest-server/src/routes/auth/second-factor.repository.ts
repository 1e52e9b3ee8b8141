import type { Knex } from "knex";

type Db = Knex | Knex.Transaction;

export interface TotpRow {
  user_id: string;
  secret_sealed: string;
  confirmed_at: Date | null;
  last_step: string | number | null;
}

export interface ChallengeRow {
  id: string;
  user_id: string;
  expires_at: Date;
  failed_attempts: number;
  used_at: Date | null;
}

/** bigint columns come back from pg as strings. */
export const lastStepOf = (row: Pick<TotpRow, "last_step">): number | null => (row.last_step === null ? null : Number(row.last_step));

export const secondFactorRepository = {
  findTotp(db: Db, userId: string): Promise<TotpRow | undefined> {
    return db("user_totp").where({ user_id: userId }).first("user_id", "secret_sealed", "confirmed_at", "last_step");
  },

  async isEnrolled(db: Db, userId: string): Promise<boolean> {
    const row = await db("user_totp").where({ user_id: userId }).whereNotNull("confirmed_at").first("user_id");
    return row !== undefined;
  },

  /** A new pending enrolment replaces an older pending one; a confirmed one is never overwritten. */
  async putPendingTotp(db: Db, userId: string, secretSealed: string): Promise<boolean> {
    const result = await db.raw(
      `INSERT INTO user_totp (user_id, secret_sealed) VALUES (?, ?)
       ON CONFLICT (user_id) DO UPDATE SET secret_sealed = EXCLUDED.secret_sealed, created_at = now(), last_step = NULL
       WHERE user_totp.confirmed_at IS NULL`,
      [userId, secretSealed],
    );
    return result.rowCount === 1;
  },

  async confirmTotp(db: Db, userId: string, step: number): Promise<boolean> {
    const n = await db("user_totp").where({ user_id: userId }).whereNull("confirmed_at").update({ confirmed_at: db.fn.now(), last_step: step });
    return n === 1;
  },

  /** The replay guard: records `step` as used, only if no later or equal step was used before. */
  async claimStep(db: Db, userId: string, step: number): Promise<boolean> {
    const n = await db("user_totp")
      .where({ user_id: userId })
      .whereNotNull("confirmed_at")
      .andWhere((q) => q.whereNull("last_step").orWhere("last_step", "<", step))
      .update({ last_step: step });
    return n === 1;
  },

  deleteTotp(db: Db, userId: string): Promise<number> {
    return db("user_totp").where({ user_id: userId }).delete();
  },

  async replaceRecoveryCodes(db: Db, userId: string, digests: string[]): Promise<void> {
    await db("recovery_codes").where({ user_id: userId }).delete();
    await db("recovery_codes").insert(digests.map((code_sha256) => ({ user_id: userId, code_sha256 })));
  },

  deleteRecoveryCodes(db: Db, userId: string): Promise<number> {
    return db("recovery_codes").where({ user_id: userId }).delete();
  },

  async useRecoveryCode(db: Db, userId: string, digest: string): Promise<boolean> {
    const n = await db("recovery_codes").where({ user_id: userId, code_sha256: digest }).whereNull("used_at").update({ used_at: db.fn.now() });
    return n === 1;
  },

  async recoveryCodesLeft(db: Db, userId: string): Promise<number> {
    const row = await db("recovery_codes").where({ user_id: userId }).whereNull("used_at").count<{ n: string }[]>({ n: "*" }).first();
    return Number(row?.n ?? 0);
  },

  insertChallenge(db: Db, userId: string, sha256: string, expiresAt: Date): Promise<unknown> {
    return db("sign_in_challenges").insert({ user_id: userId, token_sha256: sha256, expires_at: expiresAt });
  },

  findChallenge(db: Db, sha256: string): Promise<ChallengeRow | undefined> {
    return db("sign_in_challenges").where({ token_sha256: sha256 }).first("id", "user_id", "expires_at", "failed_attempts", "used_at");
  },

  async countFailure(db: Db, id: string): Promise<number> {
    const [row] = await db("sign_in_challenges").where({ id }).increment("failed_attempts", 1).returning("failed_attempts");
    return Number(row?.failed_attempts ?? 0);
  },

  async markChallengeUsed(db: Db, id: string): Promise<boolean> {
    const n = await db("sign_in_challenges").where({ id }).whereNull("used_at").update({ used_at: db.fn.now() });
    return n === 1;
  },

  /** Wrong codes for this account in challenges opened since `since` (whatever address they came from). */
  async recentFailures(db: Db, userId: string, since: Date): Promise<number> {
    const row = await db("sign_in_challenges")
      .where({ user_id: userId })
      .andWhere("created_at", ">=", since)
      .sum<{ n: string | null }[]>({ n: "failed_attempts" })
      .first();
    return Number(row?.n ?? 0);
  },

  /** Expired challenges are useless; they are dropped when a new one opens so the table stays small. */
  deleteOldChallenges(db: Db, before: Date): Promise<number> {
    return db("sign_in_challenges").where("expires_at", "<", before).delete();
  },
};
