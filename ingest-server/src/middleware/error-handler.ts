import type { ErrorRequestHandler, RequestHandler } from "express";
import multer from "multer";
import { z } from "zod";
import { HttpError } from "../http-error";

const MULTER_STATUS: Record<string, number> = {
  LIMIT_FILE_SIZE: 413,
  LIMIT_FILE_COUNT: 413,
  LIMIT_PART_COUNT: 413,
  LIMIT_FIELD_VALUE: 413,
  LIMIT_FIELD_COUNT: 413,
  LIMIT_FIELD_KEY: 400,
  LIMIT_UNEXPECTED_FILE: 400,
  MISSING_FIELD_NAME: 400,
};

interface BodyParserError {
  type?: string;
  status?: number;
  expose?: boolean;
}

function isBodyParserError(err: unknown): err is Error & BodyParserError {
  return err instanceof Error && typeof (err as BodyParserError).type === "string" && typeof (err as BodyParserError).status === "number";
}

/**
 * The single error middleware: every failure leaves as `{error: {code, message, details?}}`.
 * Unknown errors are logged with the request id and answered with a bare 500, never a stack.
 */
export const errorHandler: ErrorRequestHandler = (err, req, res, next) => {
  if (res.headersSent) return next(err);
  let status = 500;
  let body: { code: string; message: string; details?: unknown } = {
    code: "internal",
    message: "internal server error",
  };
  if (err instanceof HttpError) {
    status = err.status;
    body = { code: err.code, message: err.message, ...(err.details === undefined ? {} : { details: err.details }) };
  } else if (err instanceof z.ZodError) {
    status = 400;
    body = { code: "invalid_request", message: summarise(err), details: z.treeifyError(err) };
  } else if (err instanceof multer.MulterError) {
    status = MULTER_STATUS[err.code] ?? 400;
    body = { code: status === 413 ? "payload_too_large" : "invalid_upload", message: `${err.message}${err.field ? ` (field ${err.field})` : ""}` };
  } else if (isBodyParserError(err) && err.status && err.status < 500) {
    // express.json(): malformed JSON (400), too large (413), wrong charset (415).
    status = err.status;
    body = {
      code: err.type === "entity.too.large" ? "payload_too_large" : err.type === "entity.parse.failed" ? "malformed_json" : "invalid_request",
      message: err.type === "entity.parse.failed" ? "request body is not valid JSON" : err.message,
    };
  }
  if (status >= 500) {
    console.error(`[${req.id ?? "-"}] ${req.method} ${req.originalUrl}`, err);
  }
  res.status(status).json({ error: body });
};

function summarise(err: z.ZodError): string {
  const first = err.issues.slice(0, 3).map((i) => (i.path.length ? `${i.path.join(".")}: ${i.message}` : i.message));
  const more = err.issues.length > 3 ? ` (and ${err.issues.length - 3} more)` : "";
  return `invalid request: ${first.join("; ")}${more}`;
}

/** JSON 404 for anything under /api that no router answered. */
export const apiNotFound: RequestHandler = (req, res) => {
  res.status(404).json({ error: { code: "not_found", message: `no route for ${req.method} ${req.path}` } });
};
