import type { Request } from "express";
import type { AppDeps } from "../../deps";
import type { TokenResponse } from "../../contracts/auth";
import { audit } from "../../audit/audit";
import { signAccessToken, verifyAccessToken } from "../../auth/access-token";
import { newOpaqueToken, sha256Hex } from "../../auth/opaque-token";
import { decoyHash, hashPassword, verifyPassword } from "../../auth/passwords";
import { scopesFor } from "../../auth/scopes";
import { HttpError } from "../../http-error";
import { authRepository as repo, type UserRow } from "./auth.repository";

export interface IssuedSession {
  body: TokenResponse;
  refreshToken: string;
  refreshExpiresAt: Date;
}

const DAY_MS = 86_400_000;
/**
 * How long a just-rotated refresh token may be presented once more (see refresh). A window of a few
 * seconds to half a minute is common practice for rotating refresh tokens: long enough for tabs
 * loading together on a slow connection, short enough that a copied token is soon useless.
 */
export const REFRESH_REUSE_GRACE_S = 20;
const badCredentials = () => new HttpError(401, "invalid_credentials", "e-mail or password is wrong");
const badRefresh = () => new HttpError(401, "invalid_refresh", "session expired; sign in again");

export function createAuthService({ db, config, mailer }: AppDeps) {
  function newRefresh() {
    return { ...newOpaqueToken(), expiresAt: new Date(Date.now() + config.refreshTtlDays * DAY_MS) };
  }

  /** The answer for a session whose refresh token is already stored. */
  async function answer(user: UserRow, refresh: ReturnType<typeof newRefresh>): Promise<IssuedSession> {
    const accessToken = await signAccessToken(
      { userId: user.id, role: user.role, scopes: scopesFor(user.role), patientId: user.patient_id },
      config.jwtSecret,
      config.accessTokenTtlS,
    );
    return {
      body: {
        accessToken,
        tokenType: "Bearer",
        expiresIn: config.accessTokenTtlS,
        user: {
          id: user.id,
          role: user.role,
          displayName: user.display_name,
          ...(user.patient_id ? { patientId: user.patient_id } : {}),
        },
      },
      refreshToken: refresh.token,
      refreshExpiresAt: refresh.expiresAt,
    };
  }

  async function issue(user: UserRow): Promise<IssuedSession> {
    const refresh = newRefresh();
    await repo.insertRefreshToken(db, user.id, refresh.sha256, refresh.expiresAt);
    return answer(user, refresh);
  }

  async function activeUser(userId: string): Promise<UserRow> {
    const user = await repo.findUserById(db, userId);
    if (!user || user.status !== "active") throw badRefresh();
    return user;
  }

  return {
    async login(email: string, password: string, req: Request): Promise<IssuedSession> {
      const user = await repo.findUserByEmail(db, email);
      // Compare against a decoy when there is no usable hash so timing does not reveal accounts.
      const ok = await verifyPassword(password, user?.password_hash ?? (await decoyHash(config.bcryptCost)));
      if (!user || !ok || !user.password_hash || user.status !== "active") {
        await audit(db, req, {
          action: "auth.login_failed",
          resourceType: "user",
          resourceId: user?.id ?? null,
          actorId: user?.id ?? null,
          actorRole: user?.role ?? null,
          details: { reason: !user ? "unknown_email" : user.status !== "active" ? `status_${user.status}` : "wrong_password" },
        });
        throw badCredentials();
      }
      await repo.touchLogin(db, user.id);
      await audit(db, req, { action: "auth.login", resourceType: "user", resourceId: user.id, actorId: user.id, actorRole: user.role });
      return issue(user);
    },

    /**
     * Rotation: each refresh token works once. Presenting a revoked one means it was copied, so every
     * session of that user is revoked (the thief and the owner both have to sign in again).
     * Exception, the reuse grace: browser tabs loading at once all present the cookie they share, and
     * all but the first find it just rotated. A token replaced less than REFRESH_REUSE_GRACE_S ago,
     * whose successor is still live, is therefore accepted once more and gets a session of its own
     * (its successor's token is stored only as a digest, so it cannot be handed out again).
     */
    async refresh(token: string | undefined, req: Request): Promise<IssuedSession> {
      if (!token) throw badRefresh();
      const row = await repo.findRefreshToken(db, sha256Hex(token));
      if (!row) throw badRefresh();
      if (!row.revoked_at) {
        if (row.expires_at.getTime() <= Date.now()) throw badRefresh();
        const user = await activeUser(row.user_id);
        const next = newRefresh();
        const graceUntil = new Date(Date.now() + REFRESH_REUSE_GRACE_S * 1000);
        if (await repo.rotateRefreshToken(db, row.id, { userId: user.id, sha256: next.sha256, expiresAt: next.expiresAt }, graceUntil)) {
          return answer(user, next);
        }
      }
      if (await repo.claimReuseGrace(db, row.id, new Date())) {
        const user = await activeUser(row.user_id);
        await audit(db, req, { action: "auth.refresh_grace", resourceType: "user", resourceId: user.id, actorId: user.id, actorRole: user.role });
        return issue(user);
      }
      // It was live when read, so this request raced another one holding the same cookie (a sign-out,
      // or a third tab after the grace was used): refused, but not taken for a copy.
      if (!row.revoked_at) throw badRefresh();
      const n = await repo.revokeAllRefreshTokens(db, row.user_id);
      await audit(db, req, {
        action: "auth.refresh_reuse",
        resourceType: "user",
        resourceId: row.user_id,
        actorId: row.user_id,
        details: { revokedSessions: n },
      });
      throw badRefresh();
    },

    async logout(token: string | undefined, req: Request, accessToken?: string): Promise<void> {
      // The access token presented with the sign-out stops working now, not in up to 15 minutes.
      if (accessToken) {
        const claims = await verifyAccessToken(accessToken, config.jwtSecret).catch(() => null);
        if (claims) {
          await db("revoked_access_tokens")
            .insert({ jti: claims.tokenId, user_id: claims.userId, expires_at: new Date(Date.now() + config.accessTokenTtlS * 1000) })
            .onConflict("jti")
            .ignore();
        }
      }
      if (!token) return;
      const row = await repo.findRefreshToken(db, sha256Hex(token));
      if (!row || row.revoked_at) return;
      await repo.revokeRefreshToken(db, row.id);
      await audit(db, req, { action: "auth.logout", resourceType: "user", resourceId: row.user_id, actorId: row.user_id });
    },

    async acceptInvitation(token: string, password: string, req: Request): Promise<IssuedSession> {
      const invitation = await repo.findInvitation(db, sha256Hex(token));
      if (!invitation) throw new HttpError(400, "invalid_token", "this invitation link is not valid");
      if (invitation.accepted_at) throw new HttpError(410, "invitation_used", "this invitation was already used; sign in instead");
      if (invitation.expires_at.getTime() <= Date.now()) {
        throw new HttpError(410, "invitation_expired", "this invitation has expired; ask for a new one");
      }
      const hash = await hashPassword(password, config.bcryptCost);
      const user = await db.transaction(async (trx) => {
        // Both conditional updates must win, so two tabs accepting at once activate the account once.
        if (!(await repo.markInvitationAccepted(trx, invitation.id))) {
          throw new HttpError(410, "invitation_used", "this invitation was already used; sign in instead");
        }
        if ((await repo.activateWithPassword(trx, invitation.user_id, hash)) !== 1) {
          throw new HttpError(409, "account_not_invited", "this account is not waiting for an invitation");
        }
        await audit(trx, req, {
          action: "invitation.accept",
          resourceType: "invitation",
          resourceId: invitation.id,
          actorId: invitation.user_id,
        });
        return repo.findUserById(trx, invitation.user_id);
      });
      if (!user) throw new HttpError(409, "account_not_invited", "this account no longer exists");
      await repo.touchLogin(db, user.id);
      return issue(user);
    },

    /** Always succeeds from the caller's view: whether the address has an account is not revealed. */
    async requestPasswordReset(email: string, req: Request): Promise<void> {
      const user = await repo.findUserByEmail(db, email);
      if (!user || user.status !== "active") {
        await audit(db, req, { action: "auth.password_reset_request", resourceType: "user", details: { matched: false } });
        return;
      }
      const reset = newOpaqueToken();
      const expiresAt = new Date(Date.now() + config.passwordResetTtlMin * 60_000);
      const id = await db.transaction(async (trx) => {
        await repo.expireOpenResets(trx, user.id);
        const [row] = await repo.insertPasswordReset(trx, user.id, reset.sha256, expiresAt);
        await audit(trx, req, {
          action: "auth.password_reset_request",
          resourceType: "user",
          resourceId: user.id,
          actorId: user.id,
          actorRole: user.role,
          details: { matched: true },
        });
        return row!.id;
      });
      const link = `${config.publicUrl}/reset-password?token=${reset.token}`;
      // Sent without awaiting so the answer takes as long whether or not the account exists.
      void mailer
        .send({
          to: user.email,
          kind: "password_reset",
          idempotencyKey: `password-reset:${id}`,
          subject: "Reset your Pendula password",
          text:
            `Hello ${user.display_name},\n\nSomeone asked to reset the password of your Pendula account. ` +
            `Open this link within ${config.passwordResetTtlMin} minutes to choose a new one:\n\n${link}\n\n` +
            `If it was not you, ignore this message; your password stays as it is.\n`,
        })
        .catch((err: unknown) => console.error("[mail] password reset not sent:", err));
    },

    async confirmPasswordReset(token: string, password: string, req: Request): Promise<void> {
      const reset = await repo.findPasswordReset(db, sha256Hex(token));
      if (!reset) throw new HttpError(400, "invalid_token", "this reset link is not valid");
      if (reset.used_at) throw new HttpError(410, "reset_used", "this reset link was already used or replaced by a newer one");
      if (reset.expires_at.getTime() <= Date.now()) throw new HttpError(410, "reset_expired", "this reset link has expired");
      const hash = await hashPassword(password, config.bcryptCost);
      await db.transaction(async (trx) => {
        if (!(await repo.markResetUsed(trx, reset.id))) {
          throw new HttpError(410, "reset_used", "this reset link was already used");
        }
        const user = await repo.findUserById(trx, reset.user_id);
        if (!user || user.status !== "active") throw new HttpError(410, "reset_expired", "this account cannot be reset");
        await repo.setPassword(trx, user.id, hash);
        // A new password ends every existing session.
        await repo.revokeAllRefreshTokens(trx, user.id);
        await audit(trx, req, {
          action: "auth.password_reset",
          resourceType: "user",
          resourceId: user.id,
          actorId: user.id,
          actorRole: user.role,
        });
      });
    },
  };
}

export type AuthService = ReturnType<typeof createAuthService>;
