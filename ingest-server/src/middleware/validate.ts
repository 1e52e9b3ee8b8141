import type { RequestHandler } from "express";
import type { z } from "zod";
import { HttpError } from "../http-error";

export interface RequestSchemas {
  body?: z.ZodType;
  query?: z.ZodType;
  params?: z.ZodType;
}

export interface ValidInput {
  body: unknown;
  query: unknown;
  params: unknown;
}

/**
 * Parses body, query and params with zod and keeps the results in `req.valid` (Express 5 makes
 * `req.query` a read-only getter, so parsed values cannot replace it). A failure throws the
 * ZodError, which the error handler turns into a 400 with the tree of problems.
 */
export function validate(schemas: RequestSchemas): RequestHandler {
  return (req, _res, next) => {
    for (const [part, value] of [["body", req.body], ["query", req.query], ["params", req.params]] as const) {
      const where = badTextAt(value, part);
      if (where) {
        throw new HttpError(400, "invalid_text", `${where}: text must not contain NUL characters or unpaired UTF-16 surrogates`, { field: where });
      }
    }
    req.valid = {
      body: schemas.body ? schemas.body.parse(req.body ?? {}) : undefined,
      query: schemas.query ? schemas.query.parse(req.query) : undefined,
      params: schemas.params ? schemas.params.parse(req.params) : undefined,
    };
    next();
  };
}

const UNPAIRED_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/**
 * Where a string holding NUL or an unpaired surrogate sits in a parsed body or query, or null.
 * PostgreSQL text cannot store NUL and jsonb (audit details) refuses unpaired surrogates, so such
 * input would otherwise surface as a database error (500) instead of the client's mistake (400).
 */
export function badTextAt(value: unknown, path: string, depth = 0): string | null {
  if (typeof value === "string") return value.includes("\u0000") || UNPAIRED_SURROGATE.test(value) ? path : null;
  if (depth > 20 || value === null || typeof value !== "object") return null;
  for (const [k, v] of Object.entries(value)) {
    if (badTextAt(k, path) !== null) return `${path} (a key)`;
    const hit = badTextAt(v, `${path}.${k}`, depth + 1);
    if (hit) return hit;
  }
  return null;
}
