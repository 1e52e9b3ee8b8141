import type { Request, RequestHandler } from "express";
import type { Knex } from "knex";
import type { Role } from "../contracts/enums";
import { verifyAccessToken } from "../auth/access-token";
import { ENROLMENT_SCOPE } from "../auth/scopes";
import { HttpError } from "../http-error";

export interface AuthContext {
  userId: string;
  role: Role;
  scopes: string[];
  patientId: string | null;
  tokenId: string;
}

/**
 * What a token limited to enrolment (a staff account without a second factor yet) may reach: who
 * am I, and the enrolment itself. Checked here rather than per route, so a route added later with
 * `access: "authenticated"` cannot be reached by accident.
 */
const ENROLMENT_PATHS: ReadonlyArray<{ method: string; path: string }> = [
  { method: "GET", path: "/api/me" },
  { method: "GET", path: "/api/auth/second-factor" },
  { method: "POST", path: "/api/auth/second-factor/enrolment" },
  { method: "POST", path: "/api/auth/second-factor/enrolment/confirm" },
];

function requestPath(req: Request): string {
  const path = (req.originalUrl.split("?")[0] ?? "").replace(/\/+$/, "");
  return path === "" ? "/" : path;
}

/**
 * Bearer access JWT → `req.auth`. The signature proves who issued the token; the one-row lookup
 * (which every request already paid for) makes disabling a user, changing their role, signing out,
 * and raising the account's session epoch (password reset, refresh-token theft, second-factor
 * reset) take effect at once instead of after the token's TTL. The lookup is by primary key and
 * the revocation check by the revoked table's primary key, so no cache is needed in front of it;
 * a cache would also delay exactly the revocations this check exists for.
 */
export function authenticate(db: Knex, jwtSecret: string): RequestHandler {
  return async (req, _res, next) => {
    const header = req.headers.authorization;
    const match = header ? /^Bearer ([A-Za-z0-9._~+/=-]+)$/.exec(header) : null;
    if (!match?.[1]) throw new HttpError(401, "unauthorized", "sign-in required (Authorization: Bearer <token>)");
    const claims = await verifyAccessToken(match[1], jwtSecret);
    const user = await db("users")
      .where({ id: claims.userId })
      .first(
        "status",
        "role",
        "session_epoch",
        db.raw("EXISTS (SELECT 1 FROM revoked_access_tokens r WHERE r.jti = ?) AS revoked", [claims.tokenId]),
      );
    if (!user || user.status !== "active" || user.role !== claims.role || user.revoked || user.session_epoch !== claims.sessionEpoch) {
      throw new HttpError(401, "invalid_token", "access token no longer valid; sign in again");
    }
    if (claims.scopes.includes(ENROLMENT_SCOPE)) {
      const path = requestPath(req);
      if (!ENROLMENT_PATHS.some((p) => p.method === req.method && p.path === path)) {
        throw new HttpError(403, "second_factor_enrolment_required", "set up your authenticator app first (Account → Second factor)");
      }
    }
    req.auth = { userId: claims.userId, role: claims.role, scopes: claims.scopes, patientId: claims.patientId, tokenId: claims.tokenId };
    next();
  };
}

/** For handlers behind `authenticate`: the auth context, or a 401 if a route was mounted wrongly. */
export function requireAuth(req: { auth?: AuthContext }): AuthContext {
  if (!req.auth) throw new HttpError(401, "unauthorized", "sign-in required");
  return req.auth;
}
