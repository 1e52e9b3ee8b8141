import { generate, generateSecret, generateURI, verify } from "otplib";

/**
 * TOTP (RFC 6238) with the parameters every authenticator app understands: HMAC-SHA1, 6 digits,
 * 30-second steps from the Unix epoch (RFC 6238 section 4: X = 30, T0 = 0). The arithmetic is
 * otplib's; this file fixes the parameters and the acceptance window in one place.
 */
export const TOTP_PERIOD_S = 30;
export const TOTP_DIGITS = 6;
/**
 * Codes from one step before or after the current one are accepted (RFC 6238 section 5.2
 * recommends at most one step of network delay; phones drift a few seconds).
 */
export const TOTP_WINDOW_STEPS = 1;
export const TOTP_ISSUER = "Pendula";

/** A new 160-bit secret (RFC 4226 section 4 asks for at least 128, recommends 160), base32. */
export function newTotpSecret(): string {
  return generateSecret({ length: 20 });
}

/** The otpauth:// URI an authenticator app reads from the QR code. */
export function totpUri(accountLabel: string, secretBase32: string): string {
  return generateURI({ issuer: TOTP_ISSUER, label: accountLabel, secret: secretBase32, digits: TOTP_DIGITS, period: TOTP_PERIOD_S });
}

/** The RFC 6238 time step T of an instant. */
export function totpStep(atMs: number): number {
  return Math.floor(atMs / 1000 / TOTP_PERIOD_S);
}

/** The code for an instant (the demo code script and the tests; the server only verifies). */
export function totpCode(secretBase32: string, atMs: number = Date.now()): Promise<string> {
  return generate({ secret: secretBase32, epoch: Math.floor(atMs / 1000), digits: TOTP_DIGITS, period: TOTP_PERIOD_S });
}

/**
 * The time step a code belongs to when it is valid within the window and later than `afterStep`
 * (the replay guard: a code, or an older one, that was already accepted is refused); else null.
 */
export async function matchTotp(secretBase32: string, code: string, afterStep: number | null, atMs: number = Date.now()): Promise<number | null> {
  if (!/^\d{6}$/.test(code)) return null;
  const result = await verify({
    secret: secretBase32,
    token: code,
    epoch: Math.floor(atMs / 1000),
    digits: TOTP_DIGITS,
    period: TOTP_PERIOD_S,
    epochTolerance: TOTP_WINDOW_STEPS * TOTP_PERIOD_S,
    ...(afterStep === null ? {} : { afterTimeStep: afterStep }),
  });
  return result.valid && "timeStep" in result ? result.timeStep : null;
}
