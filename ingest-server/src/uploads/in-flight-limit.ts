import type { RequestHandler } from "express";
import { HttpError } from "../http-error";

/**
 * At most `max` uploads in flight per signed-in user; one more is a 429 with Retry-After, answered
 * before a byte of its body is read. Each upload holds a parse slot, disk space and up to 400 MiB of
 * body, so one account cannot monopolise them, while a clinic uploading for several patients from
 * one address is not throttled as a whole (the key is the user, not the address).
 *
 * The counter lives in this process: with several server processes the cap is per process, which
 * is enough for its purpose (no single process is swamped) — a shared counter would need the
 * database on every upload and a way to forget slots of processes that died.
 */
export function inFlightUploadLimit(max: number, retryAfterS: number): RequestHandler {
  const inFlight = new Map<string, number>();
  return (req, res, next) => {
    const key = req.auth?.userId ?? "-";
    const current = inFlight.get(key) ?? 0;
    if (current >= max) {
      res.setHeader("Retry-After", String(retryAfterS));
      throw new HttpError(
        429,
        "uploads_in_progress",
        `${max} uploads from this account are still being received; wait for one to finish, then send this one again`,
        { inFlight: current, max, retryAfterS },
      );
    }
    inFlight.set(key, current + 1);
    // 'close' fires once whatever happens: answered, failed, or the client went away.
    res.once("close", () => {
      const n = (inFlight.get(key) ?? 1) - 1;
      if (n <= 0) inFlight.delete(key);
      else inFlight.set(key, n);
    });
    next();
  };
}
