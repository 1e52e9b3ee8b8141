import { describe, expect, it } from "vitest";
import { newRecoveryCodes, normalizeRecoveryCode, recoveryCodeDigest, RECOVERY_CODE_COUNT } from "../recovery-codes";

describe("recovery codes", () => {
  it("hands out 10 distinct XXXX-XXXX-XXXX codes without the look-alike letters I, L, O, U", () => {
    const codes = newRecoveryCodes();
    expect(codes).toHaveLength(RECOVERY_CODE_COUNT);
    expect(new Set(codes).size).toBe(RECOVERY_CODE_COUNT);
    for (const c of codes) expect(c).toMatch(/^[0-9A-HJKMNP-TV-Z]{4}-[0-9A-HJKMNP-TV-Z]{4}-[0-9A-HJKMNP-TV-Z]{4}$/);
  });

  it("reads a code typed in lower case, with spaces, or with O for 0 and I/L for 1, as the same code", () => {
    const [code] = newRecoveryCodes(1) as [string];
    const n = normalizeRecoveryCode(code)!;
    expect(normalizeRecoveryCode(code.toLowerCase().replace(/-/g, " "))).toBe(n);
    expect(normalizeRecoveryCode("0000-1111-ABCD")).toBe(normalizeRecoveryCode("oooo-ilIL-abcd"));
    expect(recoveryCodeDigest(n)).toMatch(/^[0-9a-f]{64}$/);
    expect(recoveryCodeDigest(n)).not.toContain(n);
  });

  it("refuses input of the wrong length or with characters outside the alphabet", () => {
    for (const bad of ["", "ABCD-EFGH", "ABCD-EFGH-JKMN-P", "ABCD-EFGH-JKM!", "ABCD-EFGH-JKMU"]) expect(normalizeRecoveryCode(bad)).toBeNull();
  });
});
