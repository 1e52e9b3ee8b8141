import { describe, expect, it } from "vitest";
import { openSecret, sealSecret } from "../secret-box";

const jwtSecret = "j".repeat(40);

describe("secret box (AES-256-GCM)", () => {
  it("opens what it sealed; the sealed text does not contain the secret and differs every time (random IV)", () => {
    const secret = "GEZDGNBVGY3TQOJQGEZDGNBVGY3TQOJQ";
    const a = sealSecret(secret, { jwtSecret });
    const b = sealSecret(secret, { jwtSecret });
    expect(a).not.toContain(secret);
    expect(a).not.toBe(b);
    expect(openSecret(a, { jwtSecret })).toBe(secret);
    expect(openSecret(b, { jwtSecret })).toBe(secret);
  });

  it("refuses another key, a dedicated key in place of the derived one, an altered box and an unknown format", () => {
    const sealed = sealSecret("ABCDEFGHIJKLMNOP", { jwtSecret });
    expect(() => openSecret(sealed, { jwtSecret: "k".repeat(40) })).toThrow();
    expect(() => openSecret(sealed, { jwtSecret, secondFactorKey: "s".repeat(40) })).toThrow();
    const raw = Buffer.from(sealed.slice(3), "base64url");
    raw[raw.length - 1] = raw[raw.length - 1]! ^ 1;
    expect(() => openSecret(`v1.${raw.toString("base64url")}`, { jwtSecret })).toThrow();
    expect(() => openSecret("v0.abc", { jwtSecret })).toThrow(/format/);
  });

  it("with a dedicated key, rotating JWT_SECRET keeps the secrets readable", () => {
    const sealed = sealSecret("ABCDEFGHIJKLMNOP", { jwtSecret, secondFactorKey: "s".repeat(40) });
    expect(openSecret(sealed, { jwtSecret: "other".repeat(10), secondFactorKey: "s".repeat(40) })).toBe("ABCDEFGHIJKLMNOP");
  });
});
