import type { RequestHandler } from "express";
import { hasAnyScope, type Scope } from "../auth/scopes";
import { HttpError } from "../http-error";

/** Passes when the token carries at least one of `anyOf`; runs after `authenticate`. */
export function requireScope(...anyOf: Scope[]): RequestHandler {
  return (req, _res, next) => {
    if (!req.auth) throw new HttpError(401, "unauthorized", "sign-in required");
    if (!hasAnyScope(req.auth.scopes, anyOf)) {
      throw new HttpError(403, "forbidden", `requires one of the scopes: ${anyOf.join(", ")}`);
    }
    next();
  };
}
