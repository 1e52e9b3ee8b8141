/** A failed API call with the server's `{error: {code, message, details?}}` body, or a local code. */
export class ApiError extends Error {
  override readonly name = "ApiError";
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
  }
}

export function isApiError(error: unknown): error is ApiError {
  return error instanceof ApiError;
}

/** Reads an error body; falls back to a plain message when the server sent no JSON. */
export function errorFromBody(status: number, body: unknown, statusText = ""): ApiError {
  if (body && typeof body === "object" && "error" in body) {
    const e = (body as { error: unknown }).error;
    if (e && typeof e === "object") {
      const { code, message, details } = e as { code?: unknown; message?: unknown; details?: unknown };
      return new ApiError(
        status,
        typeof code === "string" ? code : `http_${status}`,
        typeof message === "string" ? message : statusText || `Request failed (${status})`,
        details,
      );
    }
  }
  return new ApiError(status, `http_${status}`, statusText || `Request failed (${status})`);
}

/** Words a person can act on, for an error of any kind. */
export function describeError(error: unknown): string {
  if (isApiError(error)) {
    if (error.status === 0) return "Pendula could not reach the server. Check your connection and try again.";
    if (error.status === 403) return "Your account does not have access to this.";
    if (error.status === 404) return "This could not be found. It may have been removed, or the link is wrong.";
    return error.message;
  }
  if (error instanceof Error) return error.message;
  return "Something went wrong.";
}
