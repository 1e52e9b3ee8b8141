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
}

type Db = Knex | Knex.Transaction;
const USER_COLUMNS = ["id", "email", "display_name", "password_hash", "role", "status", "patient_id"];

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

  insertRefreshToken(db: Db, userId: string, sha256: string, expiresAt: Date): Promise<unknown> {
    return db("refresh_tokens").insert({ user_id: userId, token_sha256: sha256, expires_at: expiresAt });
  },

  findRefreshToken(db: Db, sha256: string): Promise<{ id: string; user_id: string; expires_at: Date; revoked_at: Date | null } | undefined> {
    return db("refresh_tokens").where({ token_sha256: sha256 }).first("id", "user_id", "expires_at", "revoked_at");
  },

  /** Revokes one token if still live; false when someone else revoked it first (a race or a replay). */
  async revokeRefreshToken(db: Db, id: string): Promise<boolean> {
    const n = await db("refresh_tokens").where({ id }).whereNull("revoked_at").update({ revoked_at: db.fn.now() });
    return n === 1;
  },

  revokeAllRefreshTokens(db: Db, userId: string): Promise<number> {
    return db("refresh_tokens").where({ user_id: userId }).whereNull("revoked_at").update({ revoked_at: db.fn.now() });
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
