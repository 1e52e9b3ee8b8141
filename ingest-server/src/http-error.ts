/**
 * The one error type services throw. The error handler turns it into
 * `{error: {code, message, details?}}` with `status`; `code` is a stable machine-readable slug.
 */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = "HttpError";
  }
}

export const notFound = (what = "resource") => new HttpError(404, "not_found", `${what} not found`);
export const forbidden = (message = "this action is outside your role's scope") =>
  new HttpError(403, "forbidden", message);
export const unauthorized = (message = "sign-in required") => new HttpError(401, "unauthorized", message);
export const conflict = (message: string, details?: unknown) => new HttpError(409, "conflict", message, details);
