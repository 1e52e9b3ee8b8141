import type { CookieOptions, Request, RequestHandler, Response } from "express";
import { ipKeyGenerator, rateLimit } from "express-rate-limit";
import type { AppDeps } from "../../deps";
import {
  acceptInvitationRequest,
  acceptedResponse,
  codeRequest,
  enrolmentConfirmed,
  enrolmentStart,
  loginRequest,
  loginResponse,
  passwordResetConfirm,
  passwordResetRequest,
  recoveryCodesResponse,
  secondFactorLoginRequest,
  secondFactorResetRequest,
  secondFactorResetResponse,
  secondFactorStatus,
  tokenResponse,
} from "../../contracts/auth";
import { idParams } from "../../contracts/common";
import { ApiRouter, type RouteModule } from "../../http/api-router";
import { acceptInvitation, completeSecondFactor, confirmPasswordReset, login, logout, refreshSession, requestPasswordReset, type IssuedSession } from "./auth.service";
import {
  confirmEnrolment,
  regenerateRecoveryCodes,
  removeOwnSecondFactor,
  resetSecondFactor,
  readSecondFactorStatus,
  startEnrolment,
} from "./second-factor.service";

export const REFRESH_COOKIE = "pendula_refresh";
const PREFIX = "/api/auth";

function limiter(max: number, windowS: number, key: (req: Request) => string, skipSuccessfulRequests: boolean): RequestHandler {
  return rateLimit({
    windowMs: windowS * 1000,
    limit: max,
    standardHeaders: "draft-7",
    legacyHeaders: false,
    skipSuccessfulRequests,
    keyGenerator: (req) => key(req),
    handler: (_req, res, _next, options) => {
      res.status(options.statusCode).json({
        error: { code: "rate_limited", message: `too many attempts; try again in ${Math.ceil(windowS / 60)} minutes` },
      });
    },
  });
}

const ip = (req: Request) => ipKeyGenerator(req.ip ?? "unknown");
const bodyEmail = (req: Request) => {
  const e = (req.body as { email?: unknown } | undefined)?.email;
  return typeof e === "string" ? e.trim().toLowerCase().slice(0, 254) : "";
};

export function authRouter(deps: AppDeps): ApiRouter {
  const { config } = deps;
  const { max, windowS } = config.loginRateLimit;
  // Failed sign-ins count per address + e-mail (one guessed account), and per address overall
  // (one client spraying many accounts).
  const loginPerAccount = limiter(max, windowS, (req) => `${ip(req)}|${bodyEmail(req)}`, true);
  const loginPerIp = limiter(max * 5, windowS, ip, true);
  // Guessing invitation or reset tokens is hopeless (256 bits), but failures are still capped.
  const tokenFailures = limiter(max * 2, windowS, ip, true);
  // Reset requests send mail, so every request counts (per address and per e-mail).
  const resetRequestsPerIp = limiter(max * 2, windowS, ip, false);
  const resetRequestsPerEmail = limiter(Math.max(3, Math.ceil(max / 2)), windowS, bodyEmail, false);
  // Wrong second-factor codes per address; the service also caps them per account and per challenge.
  const codeFailuresPerIp = limiter(max * 2, windowS, ip, true);
  // Code checks of a signed-in person (enrolment, new recovery codes, removal), per account.
  const codeChecksPerUser = limiter(max, windowS, (req) => req.auth?.userId ?? ip(req), true);

  const cookieBase: CookieOptions = { httpOnly: true, sameSite: "strict", secure: config.secureCookies, path: PREFIX };
  const answer = (res: Response, s: IssuedSession) => {
    res.cookie(REFRESH_COOKIE, s.refreshToken, { ...cookieBase, expires: s.refreshExpiresAt });
    return s.body;
  };
  const bearerToken = (req: Request): string | undefined => /^Bearer (\S+)$/.exec(req.headers.authorization ?? "")?.[1];
  const cookieToken = (req: Request): string | undefined => {
    const v = (req.cookies as Record<string, unknown> | undefined)?.[REFRESH_COOKIE];
    return typeof v === "string" && v.length > 0 ? v : undefined;
  };

  return new ApiRouter(PREFIX, deps)
    .endpoint({
      method: "post",
      path: "/login",
      summary:
        "Sign in with e-mail and password; sets the refresh cookie, or answers a second-factor challenge for an account with an authenticator",
      access: "public",
      before: [loginPerIp, loginPerAccount],
      request: { body: loginRequest },
      response: loginResponse,
      handler: async ({ body }, req, res) => {
        const outcome = await login(deps, body.email, body.password, req);
        return outcome.kind === "session" ? answer(res, outcome.session) : outcome.body;
      },
    })
    .endpoint({
      method: "post",
      path: "/login/second-factor",
      summary: "Second sign-in step: the challenge and a code from the authenticator app (or a recovery code); sets the refresh cookie",
      access: "public",
      before: [codeFailuresPerIp],
      request: { body: secondFactorLoginRequest },
      response: tokenResponse,
      handler: async ({ body }, req, res) => answer(res, await completeSecondFactor(deps, body, req)),
    })
    .endpoint({
      method: "get",
      path: "/second-factor",
      summary: "Whether the signed-in account has an authenticator, whether its role requires one, recovery codes left",
      access: "authenticated",
      response: secondFactorStatus,
      handler: ({ auth }) => readSecondFactorStatus(deps, auth),
    })
    .endpoint({
      method: "post",
      path: "/second-factor/enrolment",
      summary: "Start (or restart) enrolment: a new secret as otpauth:// URI and base32 text, active only once confirmed",
      access: "authenticated",
      response: enrolmentStart,
      handler: ({ auth }, req) => startEnrolment(deps, auth, req),
    })
    .endpoint({
      method: "post",
      path: "/second-factor/enrolment/confirm",
      summary: "Confirm enrolment with a first code; returns the recovery codes (once) and a session that passed the second factor",
      access: "authenticated",
      before: [codeChecksPerUser],
      request: { body: codeRequest },
      response: enrolmentConfirmed,
      handler: async ({ auth, body }, req, res) => {
        const { recoveryCodes, session } = await confirmEnrolment(deps, auth, body.code, cookieToken(req), req);
        return { recoveryCodes, session: answer(res, session) };
      },
    })
    .endpoint({
      method: "post",
      path: "/second-factor/recovery-codes",
      summary: "Replace the recovery codes (a current code is required); the old ones stop working",
      access: "authenticated",
      before: [codeChecksPerUser],
      request: { body: codeRequest },
      response: recoveryCodesResponse,
      handler: async ({ auth, body }, req) => ({ recoveryCodes: await regenerateRecoveryCodes(deps, auth, body.code, req) }),
    })
    .endpoint({
      method: "post",
      path: "/second-factor/remove",
      summary: "Remove one's own authenticator (patients only; a current code is required)",
      access: "authenticated",
      before: [codeChecksPerUser],
      status: 204,
      request: { body: codeRequest },
      handler: async ({ auth, body }, req, res) => {
        await removeOwnSecondFactor(deps, auth, body.code, req);
        res.status(204).end();
      },
    })
    .endpoint({
      method: "post",
      path: "/second-factor/users/:id/reset",
      summary: "Administrator: remove a user's authenticator and recovery codes and end their sessions, with a reason for the audit log",
      access: { scopes: ["users:write"] },
      request: { params: idParams, body: secondFactorResetRequest },
      response: secondFactorResetResponse,
      handler: ({ auth, params, body }, req) => resetSecondFactor(deps, auth, params.id, body.reason, req),
    })
    .endpoint({
      method: "post",
      path: "/refresh",
      summary: "New access token from the refresh cookie; the cookie is rotated",
      access: "public",
      response: tokenResponse,
      handler: async (_input, req, res) => {
        try {
          return answer(res, await refreshSession(deps, cookieToken(req), req));
        } catch (err) {
          res.clearCookie(REFRESH_COOKIE, cookieBase);
          throw err;
        }
      },
    })
    .endpoint({
      method: "post",
      path: "/logout",
      summary: "Revoke the refresh cookie's session",
      access: "public",
      status: 204,
      handler: async (_input, req, res) => {
        await logout(deps, cookieToken(req), req, bearerToken(req));
        res.clearCookie(REFRESH_COOKIE, cookieBase);
        res.status(204).end();
      },
    })
    .endpoint({
      method: "post",
      path: "/invitations/accept",
      summary: "Set the password of an invited account (once) and sign in",
      access: "public",
      before: [tokenFailures],
      request: { body: acceptInvitationRequest },
      response: tokenResponse,
      handler: async ({ body }, req, res) => answer(res, await acceptInvitation(deps, body.token, body.password, req)),
    })
    .endpoint({
      method: "post",
      path: "/password-reset/request",
      summary: "E-mail a reset link if the address has an account (always 202)",
      access: "public",
      before: [resetRequestsPerIp, resetRequestsPerEmail],
      status: 202,
      request: { body: passwordResetRequest },
      response: acceptedResponse,
      handler: async ({ body }, req) => {
        await requestPasswordReset(deps, body.email, req);
        return { status: "accepted" as const, message: "if the address has an account, a reset link is on its way" };
      },
    })
    .endpoint({
      method: "post",
      path: "/password-reset/confirm",
      summary: "Choose a new password with a reset token; ends every other session",
      access: "public",
      before: [tokenFailures],
      status: 204,
      request: { body: passwordResetConfirm },
      handler: async ({ body }, req, res) => {
        await confirmPasswordReset(deps, body.token, body.password, req);
        res.status(204).end();
      },
    });
}

export const authRoutes: RouteModule = { prefix: PREFIX, router: authRouter };
