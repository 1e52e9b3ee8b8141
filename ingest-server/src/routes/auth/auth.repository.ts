import type { Knex } from "knex";
import type { Role } from "../../contracts/enums";

export interface UserRow {
  id: string;
  email: string;
  display_name: string;
  password_hash: string | null;
  role: Role;
  status: "invited" | "active" | "disabled";
  patient_id: string | null;
  session_epoch: number;
}

export interface RefreshRow {
  id: string;
  user_id: string;
  expires_at: Date;
  revoked_at: Date | null;
  second_factor: boolean;
}

type Db = Knex | Knex.Transaction;
const USER_COLUMNS = ["id", "email", "display_name", "password_hash", "role", "status", "patient_id", "session_epoch"];

export const authRepository = {
  findUserByEmail(db: Db, email: string): Promise<UserRow | undefined> {
    return db("users").whereRaw("lower(email) = lower(?)", [email]).first(USER_COLUMNS);
  },

  findUserById(db: Db, id: string): Promise<UserRow | undefined> {
    return db("users").where({ id }).first(USER_COLUMNS);
  },

  touchLogin(db: Db, userId: string): Promise<number> {
    return db("users").where({ id: userId }).update({ last_login_at: db.fn.now() });
  },

  insertRefreshToken(db: Db, userId: string, sha256: string, expiresAt: Date, secondFactor: boolean): Promise<unknown> {
    return db("refresh_tokens").insert({ user_id: userId, token_sha256: sha256, expires_at: expiresAt, second_factor: secondFactor });
  },

  findRefreshToken(db: Db, sha256: string): Promise<RefreshRow | undefined> {
    return db("refresh_tokens").where({ token_sha256: sha256 }).first("id", "user_id", "expires_at", "revoked_at", "second_factor");
  },

  /** Revokes one token if still live; false when someone else revoked it first (a race or a replay). */
  async revokeRefreshToken(db: Db, id: string): Promise<boolean> {
    const n = await db("refresh_tokens").where({ id }).whereNull("revoked_at").update({ revoked_at: db.fn.now() });
    return n === 1;
  },

  /**
   * Rotation in one transaction: the live token `id` is revoked, may be presented once more until
   * `graceUntil`, and points at its successor. False when it was no longer live (another request
   * rotated or revoked it first); nothing is written then. The successor keeps the session's
   * second-factor standing.
   */
  rotateRefreshToken(
    db: Knex,
    id: string,
    successor: { userId: string; sha256: string; expiresAt: Date; secondFactor: boolean },
    graceUntil: Date,
  ): Promise<boolean> {
    return db.transaction(async (trx) => {
      const n = await trx("refresh_tokens").where({ id }).whereNull("revoked_at").update({ revoked_at: trx.fn.now(), grace_until: graceUntil });
      if (n !== 1) return false;
      const [next] = await trx("refresh_tokens")
        .insert({ user_id: successor.userId, token_sha256: successor.sha256, expires_at: successor.expiresAt, second_factor: successor.secondFactor })
        .returning("id");
      await trx("refresh_tokens").where({ id }).update({ replaced_by: next.id });
      return true;
    });
  },

  /**
   * Uses up the reuse grace of a rotated token: true once, while `now` is before grace_until and the
   * successor is still live. A successor ended by sign-out, password reset, an account change or
   * theft detection closes the grace, so the replaced token cannot bring a session back.
   */
  async claimReuseGrace(db: Db, id: string, now: Date): Promise<boolean> {
    const result = await db.raw(
      `UPDATE refresh_tokens t SET grace_until = NULL
        WHERE t.id = ? AND t.grace_until > ?
          AND EXISTS (SELECT 1 FROM refresh_tokens s WHERE s.id = t.replaced_by AND s.revoked_at IS NULL)`,
      [id, now],
    );
    return result.rowCount === 1;
  },

  /** Refuses one access token until it would have expired anyway (sign-out). */
  async revokeAccessToken(db: Db, jti: string, userId: string, expiresAt: Date): Promise<void> {
    await db("revoked_access_tokens").insert({ jti, user_id: userId, expires_at: expiresAt }).onConflict("jti").ignore();
  },

  revokeAllRefreshTokens(db: Db, userId: string): Promise<number> {
    return db("refresh_tokens").where({ user_id: userId }).whereNull("revoked_at").update({ revoked_at: db.fn.now() });
  },

  /**
   * Ends every session of the account: its refresh tokens are revoked and its session epoch raised,
   * so the access tokens already issued stop working at their next request (see authenticate).
   * Returns how many refresh sessions were live.
   */
  async endAllSessions(db: Db, userId: string): Promise<number> {
    const n = await db("refresh_tokens").where({ user_id: userId }).whereNull("revoked_at").update({ revoked_at: db.fn.now() });
    await db("users").where({ id: userId }).increment("session_epoch", 1);
    return n;
  },

  findInvitation(db: Db, sha256: string) {
    return db("invitations")
      .where({ token_sha256: sha256 })
      .first<{ id: string; user_id: string; expires_at: Date; accepted_at: Date | null } | undefined>("id", "user_id", "expires_at", "accepted_at");
  },

  async markInvitationAccepted(db: Db, id: string): Promise<boolean> {
    const n = await db("invitations").where({ id }).whereNull("accepted_at").update({ accepted_at: db.fn.now() });
    return n === 1;
  },

  activateWithPassword(db: Db, userId: string, hash: string): Promise<number> {
    return db("users").where({ id: userId, status: "invited" }).update({ password_hash: hash, status: "active" });
  },

  setPassword(db: Db, userId: string, hash: string): Promise<number> {
    return db("users").where({ id: userId }).update({ password_hash: hash });
  },

  insertPasswordReset(db: Db, userId: string, sha256: string, expiresAt: Date): Promise<{ id: string }[]> {
    return db("password_resets").insert({ user_id: userId, token_sha256: sha256, expires_at: expiresAt }).returning("id");
  },

  /** Older unused reset links stop working once a new one is issued. */
  expireOpenResets(db: Db, userId: string): Promise<number> {
    return db("password_resets").where({ user_id: userId }).whereNull("used_at").update({ used_at: db.fn.now() });
  },

  findPasswordReset(db: Db, sha256: string) {
    return db("password_resets")
      .where({ token_sha256: sha256 })
      .first<{ id: string; user_id: string; expires_at: Date; used_at: Date | null } | undefined>("id", "user_id", "expires_at", "used_at");
  },

  async markResetUsed(db: Db, id: string): Promise<boolean> {
    const n = await db("password_resets").where({ id }).whereNull("used_at").update({ used_at: db.fn.now() });
    return n === 1;
  },
};
