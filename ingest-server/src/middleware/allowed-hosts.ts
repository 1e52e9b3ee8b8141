import type { RequestHandler } from "express";

/**
 * DNS rebinding: a page on attacker.example can re-point its name at 127.0.0.1 and then read this
 * server as "same origin". Its requests still carry `Host: attacker.example`, so answering only the
 * names in the allowlist (PUBLIC_URL's, loopback's, ALLOWED_HOSTS) closes that door. Ports are not
 * compared: the attack works through a name, and the server listens on one port anyway.
 *
 * The raw Host header is read on purpose, not req.hostname, which honours X-Forwarded-Host when a
 * proxy is trusted; the proxy in front passes Host through (or rewrites it to 127.0.0.1).
 */
export function allowedHosts(names: readonly string[]): RequestHandler {
  const allowed = new Set(names.map((n) => n.toLowerCase()));
  return (req, res, next) => {
    const name = hostName(req.headers.host);
    if (name !== undefined && allowed.has(name)) return next();
    res.status(421).json({
      error: {
        code: "host_not_allowed",
        message: name === undefined ? "the request has no valid Host header" : `this server does not answer for host "${name}" (see ALLOWED_HOSTS)`,
      },
    });
  };
}

/** The lower-cased name of a Host header without its port; undefined when absent or malformed. */
export function hostName(header: string | undefined): string | undefined {
  if (!header) return undefined;
  const value = header.trim().toLowerCase();
  const bracketed = /^\[([0-9a-f:.]+)\](?::\d{1,5})?$/.exec(value);
  if (bracketed) return `[${bracketed[1]}]`;
  const plain = /^([a-z0-9.-]+)(?::\d{1,5})?$/.exec(value);
  return plain ? plain[1] : undefined;
}
