import type { RequestHandler } from "express";

/**
 * Behind a reverse proxy without TRUST_PROXY every request seems to come from the proxy's address,
 * so all clients share one rate-limit bucket and a handful of bad sign-ins locks everyone out. The
 * proxy gives itself away by adding X-Forwarded-For or Forwarded; the first such request logs one
 * warning per process. Nothing is trusted automatically: a client can send those headers too.
 */
export function proxyWarning(trustProxy: boolean, warn: (message: string) => void = (m) => console.warn(m)): RequestHandler {
  let warned = trustProxy;
  return (req, _res, next) => {
    if (!warned && (req.headers["x-forwarded-for"] !== undefined || req.headers.forwarded !== undefined)) {
      warned = true;
      warn(
        "[pendula] requests arrive with X-Forwarded-For/Forwarded but TRUST_PROXY is not set: every client then " +
          "shares the proxy's rate-limit bucket. Behind a reverse proxy on this machine, set TRUST_PROXY=1.",
      );
    }
    next();
  };
}
