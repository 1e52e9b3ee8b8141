import type { Request } from "express";
import type { AppDeps } from "../../deps";
import type { EnrolmentStart, SecondFactorStatus } from "../../contracts/auth";
import type { AuthContext } from "../../middleware/authenticate";
import { audit } from "../../audit/audit";
import { sha256Hex } from "../../auth/opaque-token";
import { newRecoveryCodes, normalizeRecoveryCode, recoveryCodeDigest } from "../../auth/recovery-codes";
import { secondFactorRequired } from "../../auth/scopes";
import { openSecret, sealSecret } from "../../auth/secret-box";
import { matchTotp, newTotpSecret, TOTP_DIGITS, TOTP_ISSUER, TOTP_PERIOD_S, totpUri } from "../../auth/totp";
import { HttpError } from "../../http-error";
import { authRepository as users, type UserRow } from "./auth.repository";
import { issueVerified, type IssuedSession } from "./auth.service";
import { lastStepOf, secondFactorRepository as repo } from "./second-factor.repository";

const wrongCode = () => new HttpError(422, "invalid_code", "the code is not right; check your phone's time and enter the current code");

/**
 * Enrolment, recovery codes, a patient's own removal, and an administrator's reset. The secret is
 * generated here, shown once as an otpauth:// URI (the portal draws the QR code locally) and as
 * base32 text, sealed at rest, and becomes active only when a first code from the app matches.
 */

async function user(deps: AppDeps, userId: string): Promise<UserRow> {
  const { db } = deps;
  const u = await users.findUserById(db, userId);
  if (!u || u.status !== "active") throw new HttpError(401, "invalid_token", "account no longer active");
  return u;
}

/** A fresh code from the enrolled authenticator; the replay guard applies here as at sign-in. */
async function requireCurrentCode(deps: AppDeps, userId: string, code: string): Promise<void> {
  const { db, config } = deps;
  const totp = await repo.findTotp(db, userId);
  if (!totp?.confirmed_at) throw new HttpError(409, "not_enrolled", "this account has no authenticator yet");
  const step = await matchTotp(openSecret(totp.secret_sealed, config), code, lastStepOf(totp));
  if (step === null || !(await repo.claimStep(db, userId, step))) throw wrongCode();
}

export async function readSecondFactorStatus(deps: AppDeps, authCtx: AuthContext): Promise<SecondFactorStatus> {
  const { db } = deps;
  const totp = await repo.findTotp(db, authCtx.userId);
  const enrolled = Boolean(totp?.confirmed_at);
  return {
    enrolled,
    required: secondFactorRequired(authCtx.role),
    enrolledAt: totp?.confirmed_at ? totp.confirmed_at.toISOString() : null,
    recoveryCodesLeft: enrolled ? await repo.recoveryCodesLeft(db, authCtx.userId) : 0,
  };
}

export async function startEnrolment(deps: AppDeps, authCtx: AuthContext, req: Request): Promise<EnrolmentStart> {
  const { db, config } = deps;
  const u = await user(deps, authCtx.userId);
  const secret = newTotpSecret();
  if (!(await repo.putPendingTotp(db, u.id, sealSecret(secret, config)))) {
    throw new HttpError(409, "already_enrolled", "this account already has an authenticator; an administrator can reset it if the phone is lost");
  }
  await audit(db, req, { action: "second_factor.enrolment_start", resourceType: "user", resourceId: u.id });
  return { secret, otpauthUri: totpUri(u.email, secret), issuer: TOTP_ISSUER, accountLabel: u.email, digits: TOTP_DIGITS, periodS: TOTP_PERIOD_S };
}

/**
 * The first valid code activates the authenticator, hands out the recovery codes (shown once)
 * and replaces the caller's session by one that passed the second factor. Other sessions of
 * the account, which did not, end at their next refresh.
 */
export async function confirmEnrolment(
  deps: AppDeps,
  authCtx: AuthContext,
  code: string,
  refreshToken: string | undefined,
  req: Request,
): Promise<{ recoveryCodes: string[]; session: IssuedSession }> {
  const { db, config } = deps;
  const u = await user(deps, authCtx.userId);
  const totp = await repo.findTotp(db, u.id);
  if (!totp) throw new HttpError(409, "no_enrolment", "start the enrolment first: no authenticator is waiting for a code");
  if (totp.confirmed_at) throw new HttpError(409, "already_enrolled", "this account already has an authenticator");
  const step = await matchTotp(openSecret(totp.secret_sealed, config), code, null);
  if (step === null) {
    await audit(db, req, { action: "second_factor.enrolment_failed", resourceType: "user", resourceId: u.id });
    throw wrongCode();
  }
  const codes = newRecoveryCodes();
  await db.transaction(async (trx) => {
    if (!(await repo.confirmTotp(trx, u.id, step))) throw new HttpError(409, "already_enrolled", "this account already has an authenticator");
    await repo.replaceRecoveryCodes(trx, u.id, codes.map((c) => recoveryCodeDigest(normalizeRecoveryCode(c) ?? c)));
    if (refreshToken) {
      const row = await users.findRefreshToken(trx, sha256Hex(refreshToken));
      if (row && row.user_id === u.id) await users.revokeRefreshToken(trx, row.id);
    }
    await audit(trx, req, { action: "second_factor.enrolled", resourceType: "user", resourceId: u.id, details: { recoveryCodes: codes.length } });
  });
  return { recoveryCodes: codes, session: await issueVerified(deps, u) };
}

export async function regenerateRecoveryCodes(deps: AppDeps, authCtx: AuthContext, code: string, req: Request): Promise<string[]> {
  const { db } = deps;
  await requireCurrentCode(deps, authCtx.userId, code);
  const codes = newRecoveryCodes();
  await db.transaction(async (trx) => {
    await repo.replaceRecoveryCodes(trx, authCtx.userId, codes.map((c) => recoveryCodeDigest(normalizeRecoveryCode(c) ?? c)));
    await audit(trx, req, { action: "second_factor.recovery_codes_regenerated", resourceType: "user", resourceId: authCtx.userId });
  });
  return codes;
}

/** Patients may remove their own; staff roles cannot (an administrator resets instead). */
export async function removeOwnSecondFactor(deps: AppDeps, authCtx: AuthContext, code: string, req: Request): Promise<void> {
  const { db } = deps;
  if (secondFactorRequired(authCtx.role)) {
    throw new HttpError(403, "second_factor_required", "staff accounts must keep a second factor; an administrator can reset it");
  }
  await requireCurrentCode(deps, authCtx.userId, code);
  await db.transaction(async (trx) => {
    await repo.deleteTotp(trx, authCtx.userId);
    await repo.deleteRecoveryCodes(trx, authCtx.userId);
    await audit(trx, req, { action: "second_factor.removed", resourceType: "user", resourceId: authCtx.userId });
  });
}

/**
 * An administrator removes someone else's authenticator (a lost phone), with a reason for the
 * audit log. The account's sessions end too: a lost phone may be a stolen one.
 */
export async function resetSecondFactor(deps: AppDeps, authCtx: AuthContext, userId: string, reason: string, req: Request): Promise<{ userId: string; enrolled: false; endedSessions: number }> {
  const { db } = deps;
  if (userId === authCtx.userId) {
    throw new HttpError(409, "own_second_factor", "ask another administrator to reset your own second factor");
  }
  const target = await users.findUserById(db, userId);
  if (!target) throw new HttpError(404, "not_found", "no such user");
  const endedSessions = await db.transaction(async (trx) => {
    // Nothing to reset: refused, so the person's sessions are not ended for nothing.
    if ((await repo.deleteTotp(trx, userId)) === 0) {
      throw new HttpError(409, "not_enrolled", "this account has no authenticator app to reset");
    }
    await repo.deleteRecoveryCodes(trx, userId);
    const n = await users.endAllSessions(trx, userId);
    await audit(trx, req, {
      action: "second_factor.reset",
      resourceType: "user",
      resourceId: userId,
      details: { reason, endedSessions: n },
    });
    return n;
  });
  return { userId, enrolled: false, endedSessions };
}