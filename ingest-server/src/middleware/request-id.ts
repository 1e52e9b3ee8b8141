import { randomUUID } from "node:crypto";
import type { RequestHandler } from "express";

/** A request id per request (a well-formed incoming X-Request-Id is kept so logs can be joined). */
export const requestId: RequestHandler = (req, res, next) => {
  const incoming = req.get("x-request-id");
  req.id = incoming && /^[A-Za-z0-9-]{8,64}$/.test(incoming) ? incoming : randomUUID();
  res.setHeader("X-Request-Id", req.id);
  next();
};
