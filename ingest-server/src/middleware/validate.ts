import type { RequestHandler } from "express";
import type { z } from "zod";

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
    req.valid = {
      body: schemas.body ? schemas.body.parse(req.body ?? {}) : undefined,
      query: schemas.query ? schemas.query.parse(req.query) : undefined,
      params: schemas.params ? schemas.params.parse(req.params) : undefined,
    };
    next();
  };
}
