import { createHash, randomBytes } from "node:crypto";

/** Refresh, invitation and reset tokens: 256 random bits for the holder, only the sha256 stored. */
export function newOpaqueToken(): { token: string; sha256: string } {
  const token = randomBytes(32).toString("base64url");
  return { token, sha256: sha256Hex(token) };
}

export function sha256Hex(value: string): string {
  return createHash("sha256").update(value, "utf8").digest("hex");
}
