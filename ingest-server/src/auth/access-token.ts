import { randomUUID } from "node:crypto";
import { SignJWT, jwtVerify, errors as joseErrors } from "jose";
import type { Role } from "../contracts/enums";
import { ROLES } from "../contracts/enums";
import { HttpError } from "../http-error";

export const TOKEN_ISSUER = "pendula";
export const TOKEN_AUDIENCE = "pendula-api";
/** The only algorithm accepted. jose refuses `alg: none` anyway; pinning also refuses HS/RS confusion. */
export const TOKEN_ALG = "HS256";

export interface AccessClaims {
  userId: string;
  role: Role;
  scopes: string[];
  patientId: string | null;
  tokenId: string;
  /**
   * The account's session epoch when the token was issued (claim `sep`, 0 when absent). Raising the
   * epoch (password reset, refresh-token theft, second-factor reset) ends every token issued before.
   */
  sessionEpoch: number;
}

const keyCache = new Map<string, Uint8Array>();
function key(secret: string): Uint8Array {
  let k = keyCache.get(secret);
  if (!k) {
    k = new TextEncoder().encode(secret);
    keyCache.set(secret, k);
  }
  return k;
}

export async function signAccessToken(
  claims: Omit<AccessClaims, "tokenId" | "sessionEpoch"> & { tokenId?: string; sessionEpoch?: number },
  secret: string,
  ttlS: number,
): Promise<string> {
  return new SignJWT({ role: claims.role, scopes: claims.scopes, pid: claims.patientId, sep: claims.sessionEpoch ?? 0 })
    .setProtectedHeader({ alg: TOKEN_ALG, typ: "JWT" })
    .setSubject(claims.userId)
    .setJti(claims.tokenId ?? randomUUID())
    .setIssuer(TOKEN_ISSUER)
    .setAudience(TOKEN_AUDIENCE)
    .setIssuedAt()
    .setExpirationTime(Math.floor(Date.now() / 1000) + ttlS)
    .sign(key(secret));
}

export async function verifyAccessToken(token: string, secret: string): Promise<AccessClaims> {
  try {
    const { payload } = await jwtVerify(token, key(secret), {
      algorithms: [TOKEN_ALG],
      issuer: TOKEN_ISSUER,
      audience: TOKEN_AUDIENCE,
      requiredClaims: ["sub", "jti", "exp", "iat"],
    });
    const role = payload.role;
    const scopes = payload.scopes;
    const pid = payload.pid;
    const sep = payload.sep ?? 0;
    if (
      typeof payload.sub !== "string" ||
      typeof payload.jti !== "string" ||
      typeof role !== "string" ||
      !(ROLES as readonly string[]).includes(role) ||
      !Array.isArray(scopes) ||
      !scopes.every((s) => typeof s === "string") ||
      !(pid === null || typeof pid === "string") ||
      typeof sep !== "number" ||
      !Number.isSafeInteger(sep) ||
      sep < 0
    ) {
      throw new HttpError(401, "invalid_token", "access token has malformed claims");
    }
    return { userId: payload.sub, role: role as Role, scopes: scopes as string[], patientId: pid, tokenId: payload.jti, sessionEpoch: sep };
  } catch (err) {
    if (err instanceof HttpError) throw err;
    if (err instanceof joseErrors.JWTExpired) throw new HttpError(401, "token_expired", "access token expired");
    throw new HttpError(401, "invalid_token", "access token is invalid");
  }
}
