import type { RequestHandler } from "express";
import type { z } from "zod";
import { HttpError } from "../http-error";

/**
 * For edits of clinical fields: a well-formed JSON body whose values the contract refuses (a height
 * of 20 cm, an unknown walking aid) is answered 422 with the contract's own message, instead of the
 * generic 400 the validation middleware gives. Runs before that middleware, which then re-parses a
 * body already known to be good (so the OpenAPI document still shows the schema).
 */
export function unprocessableUnless(schema: z.ZodType, code: string): RequestHandler {
  return (req, _res, next) => {
    const parsed = schema.safeParse(req.body ?? {});
    if (parsed.success) return next();
    const message = parsed.error.issues
      .map((i) => (i.code === "unrecognized_keys" ? `unknown field(s): ${i.keys.join(", ")}` : i.message))
      .join("; ");
    throw new HttpError(422, code, message);
  };
}
