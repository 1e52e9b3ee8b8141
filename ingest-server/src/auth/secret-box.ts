import { createCipheriv, createDecipheriv, hkdfSync, randomBytes } from "node:crypto";

/**
 * Authenticator secrets are sealed at rest with AES-256-GCM, so a copy of the database (a backup, a
 * read-only SQL injection) does not hand out working second factors. The key comes from
 * SECOND_FACTOR_KEY when set, else it is derived from JWT_SECRET with HKDF-SHA256 (RFC 5869) under
 * its own label, so the two uses never share key material.
 * Format: "v1." + base64url(12-byte IV ‖ 16-byte tag ‖ ciphertext).
 */
const VERSION = "v1";
const keys = new Map<string, Buffer>();

function keyFor(material: string): Buffer {
  let k = keys.get(material);
  if (!k) {
    k = Buffer.from(hkdfSync("sha256", material, "pendula", "pendula/second-factor-secret/v1", 32));
    keys.set(material, k);
  }
  return k;
}

export interface SecretBoxKey {
  jwtSecret: string;
  secondFactorKey?: string;
}

const material = (k: SecretBoxKey) => k.secondFactorKey ?? k.jwtSecret;

export function sealSecret(plain: string, key: SecretBoxKey): string {
  const iv = randomBytes(12);
  const cipher = createCipheriv("aes-256-gcm", keyFor(material(key)), iv);
  const body = Buffer.concat([cipher.update(plain, "utf8"), cipher.final()]);
  return `${VERSION}.${Buffer.concat([iv, cipher.getAuthTag(), body]).toString("base64url")}`;
}

/** The plain secret; throws when the box was sealed with another key or was altered. */
export function openSecret(sealed: string, key: SecretBoxKey): string {
  const [version, data] = sealed.split(".");
  if (version !== VERSION || !data) throw new Error("unknown sealed-secret format");
  const raw = Buffer.from(data, "base64url");
  const decipher = createDecipheriv("aes-256-gcm", keyFor(material(key)), raw.subarray(0, 12));
  decipher.setAuthTag(raw.subarray(12, 28));
  return Buffer.concat([decipher.update(raw.subarray(28)), decipher.final()]).toString("utf8");
}
