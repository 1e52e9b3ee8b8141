import type { RequestHandler } from "express";
import type { Knex } from "knex";
import type { Role } from "../contracts/enums";
import { verifyAccessToken } from "../auth/access-token";
import { HttpError } from "../http-error";

export interface AuthContext {
  userId: string;
  role: Role;
  scopes: string[];
  patientId: string | null;
  tokenId: string;
}

/**
 * Bearer access JWT → `req.auth`. The signature proves who issued the token; the one-row lookup
 * makes disabling a user, changing their role or signing out take effect at once instead of after
 * the token's TTL.
 */
export function authenticate(db: Knex, jwtSecret: string): RequestHandler {
  return async (req, _res, next) => {
    const header = req.headers.authorization;
    const match = header ? /^Bearer ([A-Za-z0-9._~+/=-]+)$/.exec(header) : null;
    if (!match?.[1]) throw new HttpError(401, "unauthorized", "sign-in required (Authorization: Bearer <token>)");
    const claims = await verifyAccessToken(match[1], jwtSecret);
    const user = await db("users")
      .where({ id: claims.userId })
      .first("status", "role", db.raw("EXISTS (SELECT 1 FROM revoked_access_tokens r WHERE r.jti = ?) AS revoked", [claims.tokenId]));
    if (!user || user.status !== "active" || user.role !== claims.role || user.revoked) {
      throw new HttpError(401, "invalid_token", "access token no longer valid; sign in again");
    }
    req.auth = claims;
    next();
  };
}

/** For handlers behind `authenticate`: the auth context, or a 401 if a route was mounted wrongly. */
export function requireAuth(req: { auth?: AuthContext }): AuthContext {
  if (!req.auth) throw new HttpError(401, "unauthorized", "sign-in required");
  return req.auth;
}
