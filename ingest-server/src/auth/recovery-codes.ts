import { randomInt } from "node:crypto";
import { sha256Hex } from "./opaque-token";

/** How many single-use recovery codes an enrolment (or a regeneration) hands out. */
export const RECOVERY_CODE_COUNT = 10;

// Crockford-style alphabet without I, L, O, U: nothing to misread when typed from paper.
const ALPHABET = "0123456789ABCDEFGHJKMNPQRSTVWXYZ";
const GROUPS = 3;
const GROUP_LENGTH = 4;

/**
 * Twelve characters of a 32-letter alphabet = 60 random bits per code, shown as XXXX-XXXX-XXXX.
 * That much entropy, with sign-in attempts capped, makes a fast hash enough to store them (as for
 * the opaque tokens); a slow password hash would only slow the sign-in down.
 */
export function newRecoveryCodes(count: number = RECOVERY_CODE_COUNT): string[] {
  return Array.from({ length: count }, () =>
    Array.from({ length: GROUPS }, () => Array.from({ length: GROUP_LENGTH }, () => ALPHABET[randomInt(ALPHABET.length)]).join("")).join("-"),
  );
}

/** Case, spaces and dashes do not matter; the look-alikes O→0 and I/L→1 are read as meant. */
export function normalizeRecoveryCode(input: string): string | null {
  const s = input.toUpperCase().replace(/[\s-]/g, "").replace(/O/g, "0").replace(/[IL]/g, "1");
  if (s.length !== GROUPS * GROUP_LENGTH || ![...s].every((c) => ALPHABET.includes(c))) return null;
  return s;
}

export function recoveryCodeDigest(normalized: string): string {
  return sha256Hex(`pendula-recovery:${normalized}`);
}
