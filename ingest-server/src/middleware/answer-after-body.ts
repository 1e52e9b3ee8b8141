import type { IncomingMessage } from "node:http";
import type { RequestHandler, Response } from "express";

export interface AnswerAfterBodyOptions {
  /** Read and discard at most this many body bytes before answering anyway. */
  maxBytes: number;
  /** …and wait at most this long for them. */
  maxMs: number;
}

/**
 * Makes an early refusal of a request with a large body (401/403 before the body is read, 413,
 * 429) readable by every client. A client that writes its whole body before it reads — Python's
 * http.client, many upload libraries, browsers under some conditions — never sees an answer sent
 * mid-body if the server then closes the socket with unread bytes in its receive buffer: the kernel
 * answers those bytes with a reset, which also discards the answer the client had not read yet.
 *
 * So an error answer (status ≥ 400) to a request whose body has not been fully received is held
 * back: the rest of the body is read and discarded, up to `maxBytes` or `maxMs`, and only then
 * is the answer sent, with `Connection: close` (the connection is not reused after a refused
 * body). A body declared larger than `maxBytes` is not waited for: it is answered at once and closed,
 * since reading it all would cost more than the client's convenience is worth.
 *
 * Mount before authentication so that 401 and 403 go through it too.
 */
export function answerAfterBody(options: AnswerAfterBodyOptions): RequestHandler {
  return (req, res, next) => {
    if (!hasBody(req)) return next();
    const end = res.end.bind(res) as (...args: unknown[]) => Response;
    let holding = false;
    res.end = ((...args: unknown[]) => {
      if (holding) return res;
      if (req.complete || req.destroyed || res.statusCode < 400) return end(...args);
      holding = true;
      if (!res.headersSent) res.setHeader("Connection", "close");
      void drainBody(req, options).then(() => {
        if (!res.destroyed) end(...args);
      });
      return res;
    }) as Response["end"];
    next();
  };
}

function hasBody(req: IncomingMessage): boolean {
  const length = Number(req.headers["content-length"] ?? 0);
  return length > 0 || req.headers["transfer-encoding"] !== undefined;
}

/** Reads and drops the rest of the body; resolves at its end, at a bound, or when the client leaves. */
export function drainBody(req: IncomingMessage, { maxBytes, maxMs }: AnswerAfterBodyOptions): Promise<void> {
  const declared = Number(req.headers["content-length"] ?? 0);
  if (req.complete || req.destroyed || declared > maxBytes) return Promise.resolve();
  return new Promise((resolve) => {
    let seen = 0;
    let settled = false;
    const finish = () => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      req.off("data", onData);
      req.off("end", finish);
      req.off("close", finish);
      req.off("error", finish);
      resolve();
    };
    const onData = (chunk: Buffer) => {
      seen += chunk.length;
      if (seen > maxBytes) finish();
    };
    const timer = setTimeout(finish, maxMs);
    timer.unref();
    req.on("data", onData);
    req.once("end", finish);
    req.once("close", finish);
    req.once("error", finish);
    req.resume();
  });
}
