import type { Request } from "express";
import type { AppDeps } from "../../deps";
import type { SecondFactorChallenge, SecondFactorLoginRequest, TokenResponse } from "../../contracts/auth";
import { audit } from "../../audit/audit";
import { signAccessToken, verifyAccessToken } from "../../auth/access-token";
import { newOpaqueToken, sha256Hex } from "../../auth/opaque-token";
import { decoyHash, hashPassword, verifyPassword } from "../../auth/passwords";
import { normalizeRecoveryCode, recoveryCodeDigest } from "../../auth/recovery-codes";
import { ENROLMENT_SCOPE, scopesFor, secondFactorRequired } from "../../auth/scopes";
import { openSecret } from "../../auth/secret-box";
import { matchTotp } from "../../auth/totp";
import { HttpError } from "../../http-error";
import { authRepository as repo, type UserRow } from "./auth.repository";
import { lastStepOf, secondFactorRepository as factors } from "./second-factor.repository";

export interface IssuedSession {
  body: TokenResponse;
  refreshToken: string;
  refreshExpiresAt: Date;
}

/** Sign-in's first step ends either in a session or, for an account with an authenticator, in a challenge. */
export type SignInOutcome = { kind: "session"; session: IssuedSession } | { kind: "challenge"; body: SecondFactorChallenge };

const DAY_MS = 86_400_000;

/** An audit event a user causes on their own account (sign-in steps, refresh, password reset). */
function auditOwn(
  db: Parameters<typeof audit>[0],
  req: Request,
  user: Pick<UserRow, "id" | "role">,
  action: string,
  details?: Record<string, unknown>,
): Promise<void> {
  return audit(db, req, { action, resourceType: "user", resourceId: user.id, actorId: user.id, actorRole: user.role, details });
}
/**
 * How long a just-rotated refresh token may be presented once more (see refresh). A window of a few
 * seconds to half a minute is common practice for rotating refresh tokens: long enough for tabs
 * loading together on a slow connection, short enough that a copied token is soon useless.
 */
export const REFRESH_REUSE_GRACE_S = 20;
/** Time to type the code after the password (common practice: a few minutes). */
export const CHALLENGE_TTL_S = 300;
/** Wrong codes one challenge tolerates before the password has to be entered again. */
export const CHALLENGE_MAX_FAILURES = 5;
/**
 * Wrong codes one account tolerates per sign-in rate window, across challenges and addresses
 * (RFC 6238 section 5.1 and RFC 4226 section 7.3 ask for throttling). With 3 codes valid at a
 * time out of 10^6, 10 guesses per 15 minutes give a guesser about 3·10^-5 per window.
 */
export const ACCOUNT_MAX_CODE_FAILURES = 10;

const badCredentials = () => new HttpError(401, "invalid_credentials", "e-mail or password is wrong");
const badRefresh = () => new HttpError(401, "invalid_refresh", "session expired; sign in again");
const badChallenge = () => new HttpError(401, "challenge_expired", "this sign-in step has expired; enter your e-mail and password again");

function newRefresh(deps: AppDeps) {
  const { config } = deps;
  return { ...newOpaqueToken(), expiresAt: new Date(Date.now() + config.refreshTtlDays * DAY_MS) };
}

/**
 * A session that passed the second factor carries the role's scopes. One that did not carries
 * them only when the role does not require a second factor; a staff account's carries just the
 * enrolment scope.
 */
function standing(user: UserRow, secondFactor: boolean): TokenResponse["secondFactor"] {
  if (secondFactor) return "verified";
  return secondFactorRequired(user.role) ? "enrolment_required" : "not_enrolled";
}

/** The answer for a session whose refresh token is already stored. */
async function answer(deps: AppDeps, user: UserRow, refresh: ReturnType<typeof newRefresh>, secondFactor: boolean): Promise<IssuedSession> {
  const { config } = deps;
  const state = standing(user, secondFactor);
  const accessToken = await signAccessToken(
    {
      userId: user.id,
      role: user.role,
      scopes: state === "enrolment_required" ? [ENROLMENT_SCOPE] : scopesFor(user.role),
      patientId: user.patient_id,
      sessionEpoch: user.session_epoch,
    },
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
      secondFactor: state,
    },
    refreshToken: refresh.token,
    refreshExpiresAt: refresh.expiresAt,
  };
}

async function issue(deps: AppDeps, user: UserRow, secondFactor: boolean): Promise<IssuedSession> {
  const { db } = deps;
  const refresh = newRefresh(deps);
  await repo.insertRefreshToken(db, user.id, refresh.sha256, refresh.expiresAt, secondFactor);
  return answer(deps, user, refresh, secondFactor);
}

async function activeUser(deps: AppDeps, userId: string): Promise<UserRow> {
  const { db } = deps;
  const user = await repo.findUserById(db, userId);
  if (!user || user.status !== "active") throw badRefresh();
  return user;
}

/** The code's check, without side effects beyond the replay guard and the recovery code's use. */
async function checkCode(
  deps: AppDeps,
  user: UserRow,
  input: Pick<SecondFactorLoginRequest, "method" | "code">,
): Promise<{ ok: true } | { ok: false; reason: "wrong_code" | "code_reused" | "not_enrolled" }> {
  const { db, config } = deps;
  if (input.method === "recovery_code") {
    const normalized = normalizeRecoveryCode(input.code);
    if (normalized && (await factors.useRecoveryCode(db, user.id, recoveryCodeDigest(normalized)))) return { ok: true };
    return { ok: false, reason: "wrong_code" };
  }
  const totp = await factors.findTotp(db, user.id);
  if (!totp?.confirmed_at) return { ok: false, reason: "not_enrolled" };
  const secret = openSecret(totp.secret_sealed, config);
  const last = lastStepOf(totp);
  const step = await matchTotp(secret, input.code, last);
  if (step !== null && (await factors.claimStep(db, user.id, step))) return { ok: true };
  // Valid but not new: say so, so the person waits for the next code instead of retyping this one.
  if (last !== null && (await matchTotp(secret, input.code, null)) !== null) return { ok: false, reason: "code_reused" };
  return { ok: false, reason: "wrong_code" };
}

export async function login(deps: AppDeps, email: string, password: string, req: Request): Promise<SignInOutcome> {
  const { db, config } = deps;
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
  if (await factors.isEnrolled(db, user.id)) {
    const challenge = newOpaqueToken();
    await factors.deleteOldChallenges(db, new Date(Date.now() - config.loginRateLimit.windowS * 1000 - CHALLENGE_TTL_S * 1000));
    await factors.insertChallenge(db, user.id, challenge.sha256, new Date(Date.now() + CHALLENGE_TTL_S * 1000));
    await auditOwn(db, req, user, "auth.login_password_ok");
    return {
      kind: "challenge",
      body: { secondFactorRequired: true, challenge: challenge.token, expiresIn: CHALLENGE_TTL_S, methods: ["totp", "recovery_code"] },
    };
  }
  await repo.touchLogin(db, user.id);
  await auditOwn(db, req, user, "auth.login", { secondFactor: secondFactorRequired(user.role) ? "enrolment_required" : "none" });
  return { kind: "session", session: await issue(deps, user, false) };
}

/**
 * Sign-in's second step: the challenge from the password step and a code from the authenticator
 * (or a recovery code). A challenge works once, for CHALLENGE_TTL_S, and dies after
 * CHALLENGE_MAX_FAILURES wrong codes; the account refuses codes after ACCOUNT_MAX_CODE_FAILURES
 * wrong ones within the sign-in rate window, whichever challenge they came through.
 */
export async function completeSecondFactor(deps: AppDeps, input: SecondFactorLoginRequest, req: Request): Promise<IssuedSession> {
  const { db, config } = deps;
  const challenge = await factors.findChallenge(db, sha256Hex(input.challenge));
  if (!challenge || challenge.used_at || challenge.expires_at.getTime() <= Date.now() || challenge.failed_attempts >= CHALLENGE_MAX_FAILURES) {
    throw badChallenge();
  }
  const user = await repo.findUserById(db, challenge.user_id);
  if (!user || user.status !== "active") throw badChallenge();
  const since = new Date(Date.now() - config.loginRateLimit.windowS * 1000);
  if ((await factors.recentFailures(db, user.id, since)) >= ACCOUNT_MAX_CODE_FAILURES) {
    await auditOwn(db, req, user, "auth.second_factor_failed", { method: input.method, reason: "account_throttled" });
    throw new HttpError(429, "rate_limited", `too many wrong codes for this account; try again in ${Math.ceil(config.loginRateLimit.windowS / 60)} minutes`);
  }
  const result = await checkCode(deps, user, input);
  if (!result.ok) {
    const failures = await factors.countFailure(db, challenge.id);
    await auditOwn(db, req, user, "auth.second_factor_failed", { method: input.method, reason: result.reason });
    const attemptsLeft = Math.max(0, CHALLENGE_MAX_FAILURES - failures);
    if (result.reason === "code_reused") {
      throw new HttpError(401, "code_reused", "this code was already used; wait for the next one in your app", { attemptsLeft });
    }
    throw new HttpError(
      401,
      "invalid_code",
      input.method === "totp" ? "the code is not right; check your phone's time and try the current code" : "this recovery code is not valid or was already used",
      { attemptsLeft },
    );
  }
  if (!(await factors.markChallengeUsed(db, challenge.id))) throw badChallenge();
  await repo.touchLogin(db, user.id);
  await auditOwn(db, req, user, "auth.login", {
    secondFactor: input.method,
    ...(input.method === "recovery_code" ? { recoveryCodesLeft: await factors.recoveryCodesLeft(db, user.id) } : {}),
  });
  return issue(deps, user, true);
}

/** A session for an account that just proved its second factor (enrolment confirmed). */
export function issueVerified(deps: AppDeps, user: UserRow): Promise<IssuedSession> {
  return issue(deps, user, true);
}

/**
 * Rotation: each refresh token works once. Presenting a revoked one means it was copied, so every
 * session of that user is revoked (the thief and the owner both have to sign in again).
 * Exception, the reuse grace: browser tabs loading at once all present the cookie they share, and
 * all but the first find it just rotated. A token replaced less than REFRESH_REUSE_GRACE_S ago,
 * whose successor is still live, is therefore accepted once more and gets a session of its own
 * (its successor's token is stored only as a digest, so it cannot be handed out again).
 */
export async function refreshSession(deps: AppDeps, token: string | undefined, req: Request): Promise<IssuedSession> {
  const { db } = deps;
  /**
   * A session from before the account got an authenticator (a second tab, another device) did
   * not pass the second factor; it ends here instead of carrying on without one.
   */
  const refuseStaleStanding = async (row: { id: string; user_id: string; second_factor: boolean }) => {
    if (!row.second_factor && (await factors.isEnrolled(db, row.user_id))) {
      await repo.revokeRefreshToken(db, row.id);
      throw badRefresh();
    }
  };
  if (!token) throw badRefresh();
  const row = await repo.findRefreshToken(db, sha256Hex(token));
  if (!row) throw badRefresh();
  if (!row.revoked_at) {
    if (row.expires_at.getTime() <= Date.now()) throw badRefresh();
    const user = await activeUser(deps, row.user_id);
    await refuseStaleStanding(row);
    const next = newRefresh(deps);
    const graceUntil = new Date(Date.now() + REFRESH_REUSE_GRACE_S * 1000);
    const successor = { userId: user.id, sha256: next.sha256, expiresAt: next.expiresAt, secondFactor: row.second_factor };
    if (await repo.rotateRefreshToken(db, row.id, successor, graceUntil)) {
      return answer(deps, user, next, row.second_factor);
    }
  }
  if (await repo.claimReuseGrace(db, row.id, new Date())) {
    const user = await activeUser(deps, row.user_id);
    await refuseStaleStanding(row);
    await auditOwn(db, req, user, "auth.refresh_grace");
    return issue(deps, user, row.second_factor);
  }
  // It was live when read, so this request raced another one holding the same cookie (a sign-out,
  // or a third tab after the grace was used): refused, but not taken for a copy.
  if (!row.revoked_at) throw badRefresh();
  // A copied cookie: the access tokens already handed out (to the owner and maybe the copier)
  // end with the refresh sessions.
  const n = await repo.endAllSessions(db, row.user_id);
  await audit(db, req, {
    action: "auth.refresh_reuse",
    resourceType: "user",
    resourceId: row.user_id,
    actorId: row.user_id,
    details: { revokedSessions: n },
  });
  throw badRefresh();
}

export async function logout(deps: AppDeps, token: string | undefined, req: Request, accessToken?: string): Promise<void> {
  const { db, config } = deps;
  // The access token presented with the sign-out stops working now, not in up to 15 minutes.
  if (accessToken) {
    const claims = await verifyAccessToken(accessToken, config.jwtSecret).catch(() => null);
    if (claims) {
      await repo.revokeAccessToken(db, claims.tokenId, claims.userId, new Date(Date.now() + config.accessTokenTtlS * 1000));
    }
  }
  if (!token) return;
  const row = await repo.findRefreshToken(db, sha256Hex(token));
  if (!row || row.revoked_at) return;
  await repo.revokeRefreshToken(db, row.id);
  await audit(db, req, { action: "auth.logout", resourceType: "user", resourceId: row.user_id, actorId: row.user_id });
}

export async function acceptInvitation(deps: AppDeps, token: string, password: string, req: Request): Promise<IssuedSession> {
  const { db, config } = deps;
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
  return issue(deps, user, false);
}

/** Always succeeds from the caller's view: whether the address has an account is not revealed. */
export async function requestPasswordReset(deps: AppDeps, email: string, req: Request): Promise<void> {
  const { db, config, mailer } = deps;
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
    await auditOwn(trx, req, user, "auth.password_reset_request", { matched: true });
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
}

export async function confirmPasswordReset(deps: AppDeps, token: string, password: string, req: Request): Promise<void> {
  const { db, config } = deps;
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
    // A new password ends every existing session, access tokens included.
    await repo.endAllSessions(trx, user.id);
    await auditOwn(trx, req, user, "auth.password_reset");
  });
}
