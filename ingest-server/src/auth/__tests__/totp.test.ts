import { createHmac } from "node:crypto";
import { generate } from "otplib";
import { describe, expect, it } from "vitest";
import { matchTotp, newTotpSecret, totpCode, totpStep, totpUri, TOTP_PERIOD_S } from "../totp";

/**
 * RFC 6238 Appendix B: shared secrets are the ASCII strings below, X = 30 s, T0 = 0, 8 digits.
 * Every (time, SHA1, SHA256, SHA512) row of the table.
 */
const RFC6238_SECRETS = {
  sha1: "12345678901234567890",
  sha256: "12345678901234567890123456789012",
  sha512: "1234567890123456789012345678901234567890123456789012345678901234",
} as const;
const RFC6238_APPENDIX_B: Array<[timeS: number, sha1: string, sha256: string, sha512: string]> = [
  [59, "94287082", "46119246", "90693936"],
  [1111111109, "07081804", "68084774", "25091201"],
  [1111111111, "14050471", "67062674", "99943326"],
  [1234567890, "89005924", "91819424", "93441116"],
  [2000000000, "69279037", "90698825", "38618901"],
  [20000000000, "65353130", "77737706", "47863826"],
];
// RFC 4648 section 6 base32 of the SHA1 secret above, as an authenticator app would receive it.
const RFC_SHA1_SECRET_BASE32 = "GEZDGNBVGY3TQOJQGEZDGNBVGY3TQOJQ";

/** RFC 4226 section 5.3 (HOTP with dynamic truncation) written out with node:crypto, as a second, independent implementation. */
function referenceHotp(key: Buffer, counter: number, digits: number, algorithm = "sha1"): string {
  const msg = Buffer.alloc(8);
  msg.writeBigUInt64BE(BigInt(counter));
  const h = createHmac(algorithm, key).update(msg).digest();
  const offset = h[h.length - 1]! & 0x0f;
  const binary = ((h[offset]! & 0x7f) << 24) | (h[offset + 1]! << 16) | (h[offset + 2]! << 8) | h[offset + 3]!;
  return String(binary % 10 ** digits).padStart(digits, "0");
}

describe("TOTP against RFC 6238 Appendix B", () => {
  it("otplib reproduces every row of the table for SHA1, SHA256 and SHA512 (8 digits)", async () => {
    const enc = new TextEncoder();
    for (const [t, sha1, sha256, sha512] of RFC6238_APPENDIX_B) {
      expect(await generate({ secret: enc.encode(RFC6238_SECRETS.sha1), epoch: t, digits: 8 })).toBe(sha1);
      expect(await generate({ secret: enc.encode(RFC6238_SECRETS.sha256), epoch: t, digits: 8, algorithm: "sha256" })).toBe(sha256);
      expect(await generate({ secret: enc.encode(RFC6238_SECRETS.sha512), epoch: t, digits: 8, algorithm: "sha512" })).toBe(sha512);
    }
  });

  it("the independent RFC 4226 truncation gives the same table", () => {
    for (const [t, sha1, sha256, sha512] of RFC6238_APPENDIX_B) {
      const counter = Math.floor(t / 30);
      expect(referenceHotp(Buffer.from(RFC6238_SECRETS.sha1), counter, 8)).toBe(sha1);
      expect(referenceHotp(Buffer.from(RFC6238_SECRETS.sha256), counter, 8, "sha256")).toBe(sha256);
      expect(referenceHotp(Buffer.from(RFC6238_SECRETS.sha512), counter, 8, "sha512")).toBe(sha512);
    }
  });

  it("Pendula's 6-digit codes from the base32 secret are the table's last 6 digits (truncation is mod 10^digits, RFC 4226 section 5.3)", async () => {
    for (const [t, sha1] of RFC6238_APPENDIX_B) {
      expect(await totpCode(RFC_SHA1_SECRET_BASE32, t * 1000)).toBe(sha1.slice(-6));
    }
  });
});

describe("matchTotp", () => {
  const at = 1_111_111_111_000; // step 37037037, 1 s into it
  it("accepts the current code and the codes one step either side, and says which step it was", async () => {
    const step = totpStep(at);
    for (const d of [-1, 0, 1]) {
      const code = await totpCode(RFC_SHA1_SECRET_BASE32, at + d * TOTP_PERIOD_S * 1000);
      expect(await matchTotp(RFC_SHA1_SECRET_BASE32, code, null, at)).toBe(step + d);
    }
  });

  it("refuses codes two steps away, malformed input, and a code at or before the last used step (replay)", async () => {
    for (const d of [-2, 2]) {
      const code = await totpCode(RFC_SHA1_SECRET_BASE32, at + d * TOTP_PERIOD_S * 1000);
      expect(await matchTotp(RFC_SHA1_SECRET_BASE32, code, null, at)).toBeNull();
    }
    const now = await totpCode(RFC_SHA1_SECRET_BASE32, at);
    expect(await matchTotp(RFC_SHA1_SECRET_BASE32, now, totpStep(at), at)).toBeNull();
    expect(await matchTotp(RFC_SHA1_SECRET_BASE32, now, totpStep(at) - 1, at)).toBe(totpStep(at));
    for (const bad of ["", "12345", "1234567", "12a456", " 287082"]) expect(await matchTotp(RFC_SHA1_SECRET_BASE32, bad, null, at)).toBeNull();
  });
});

describe("secrets and URIs", () => {
  it("makes 160-bit base32 secrets (RFC 4226 section 4), different each time", () => {
    const a = newTotpSecret();
    expect(a).toMatch(/^[A-Z2-7]{32}$/);
    expect(newTotpSecret()).not.toBe(a);
  });

  it("writes the otpauth URI with issuer, account, secret, 6 digits and 30 s", () => {
    const uri = new URL(totpUri("kestrel.lane@example.test", RFC_SHA1_SECRET_BASE32));
    expect(uri.protocol).toBe("otpauth:");
    expect(decodeURIComponent(uri.pathname)).toContain("Pendula:kestrel.lane@example.test");
    expect(uri.searchParams.get("secret")).toBe(RFC_SHA1_SECRET_BASE32);
    expect(uri.searchParams.get("issuer")).toBe("Pendula");
    expect(uri.searchParams.get("digits") ?? "6").toBe("6");
    expect(uri.searchParams.get("period") ?? "30").toBe("30");
  });
});
