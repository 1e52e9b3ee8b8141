import type { CookieOptions, Request, RequestHandler, Response } from "express";
import { ipKeyGenerator, rateLimit } from "express-rate-limit";
import type { AppDeps } from "../../deps";
import {
  acceptInvitationRequest,
  acceptedResponse,
  loginRequest,
  passwordResetConfirm,
  passwordResetRequest,
  tokenResponse,
} from "../../contracts/auth";
import { ApiRouter, type RouteModule } from "../../http/api-router";
import { createAuthService, type IssuedSession } from "./auth.service";

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
  const service = createAuthService(deps);
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
      summary: "Sign in with e-mail and password; sets the refresh cookie",
      access: "public",
      before: [loginPerIp, loginPerAccount],
      request: { body: loginRequest },
      response: tokenResponse,
      handler: async ({ body }, req, res) => answer(res, await service.login(body.email, body.password, req)),
    })
    .endpoint({
      method: "post",
      path: "/refresh",
      summary: "New access token from the refresh cookie; the cookie is rotated",
      access: "public",
      response: tokenResponse,
      handler: async (_input, req, res) => {
        try {
          return answer(res, await service.refresh(cookieToken(req), req));
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
        await service.logout(cookieToken(req), req, bearerToken(req));
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
      handler: async ({ body }, req, res) => answer(res, await service.acceptInvitation(body.token, body.password, req)),
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
        await service.requestPasswordReset(body.email, req);
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
        await service.confirmPasswordReset(body.token, body.password, req);
        res.status(204).end();
      },
    });
}

export const authRoutes: RouteModule = { prefix: PREFIX, router: authRouter };
