import { createHmac } from "node:crypto";
import { describe, expect, it } from "vitest";
import { AGE_BANDS, ageAtEnrolment, ageBand, pseudonymousSubjectId, suppressSmallCells, weeksSinceEnrolment } from "../safe-harbor";

const KEY = "study-key-for-tests-0123456789";

describe("pseudonymousSubjectId(key, patientId)", () => {
  it("is HMAC-SHA256 of the patient id under the study key (RFC 2104 via node:crypto)", () => {
    const expected = createHmac("sha256", KEY).update("p-1").digest("hex").slice(0, 24);
    expect(pseudonymousSubjectId(KEY, "p-1")).toBe(`sub-${expected}`);
  });

  it("matches the RFC 4231 test case 2 digest prefix (key 'Jefe', data 'what do ya want for nothing?') when the key guard is satisfied", () => {
    // RFC 4231 §4.3: HMAC-SHA-256 = 5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843.
    // The guard needs ≥ 16 characters, so this checks the primitive the function relies on directly.
    expect(createHmac("sha256", "Jefe").update("what do ya want for nothing?").digest("hex")).toBe(
      "5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843",
    );
  });

  it("is stable for one key and differs between studies and patients", () => {
    expect(pseudonymousSubjectId(KEY, "p-1")).toBe(pseudonymousSubjectId(KEY, "p-1"));
    expect(pseudonymousSubjectId(KEY, "p-1")).not.toBe(pseudonymousSubjectId(`${KEY}-other`, "p-1"));
    expect(pseudonymousSubjectId(KEY, "p-1")).not.toBe(pseudonymousSubjectId(KEY, "p-2"));
    expect(pseudonymousSubjectId(KEY, "p-1")).not.toContain("p-1");
  });

  it("refuses a short key", () => {
    expect(() => pseudonymousSubjectId("short", "p-1")).toThrow(RangeError);
  });
});

describe("ageBand(age) — 45 CFR 164.514(b)(2)(i)(C): ages over 89 aggregated", () => {
  it.each([
    [0, "0-4"],
    [4, "0-4"],
    [5, "5-9"],
    [64, "60-64"],
    [65, "65-69"],
    [89, "85-89"],
    [90, "90+"],
    [104, "90+"],
  ])("%d → %s", (age, band) => expect(ageBand(age)).toBe(band));

  it("lists every band once, ending with 90+", () => {
    expect(AGE_BANDS).toHaveLength(19);
    expect(AGE_BANDS.at(-1)).toBe("90+");
    expect(new Set(AGE_BANDS).size).toBe(19);
  });

  it("rejects negative and non-finite ages", () => {
    expect(() => ageBand(-1)).toThrow(RangeError);
    expect(() => ageBand(Number.NaN)).toThrow(RangeError);
  });
});

describe("weeksSinceEnrolment and ageAtEnrolment", () => {
  it("counts whole weeks: day 0–6 is week 0, day 7 is week 1", () => {
    const enrolled = new Date("2026-03-02T00:00:00Z");
    expect(weeksSinceEnrolment(new Date("2026-03-08T23:59:00Z"), enrolled)).toBe(0);
    expect(weeksSinceEnrolment(new Date("2026-03-09T00:00:00Z"), enrolled)).toBe(1);
    expect(weeksSinceEnrolment(new Date("2026-05-25T10:00:00Z"), enrolled)).toBe(12);
  });

  it("uses years only for age", () => {
    expect(ageAtEnrolment(1958, new Date("2026-01-15T00:00:00Z"))).toBe(68);
  });
});

describe("suppressSmallCells(rows) — k = 5 distinct subjects per cell", () => {
  const rows = [
    ...["a", "b", "c", "d", "e"].flatMap((s) => [
      { cell: "stroke|60-64", subject: s },
      { cell: "stroke|60-64", subject: s },
    ]),
    // Many rows but only four subjects: still suppressed, because k counts people, not sessions.
    ...["f", "g", "h", "i"].flatMap((s) => Array.from({ length: 10 }, () => ({ cell: "parkinsons|70-74", subject: s }))),
  ];

  it("keeps cells with ≥ 5 subjects and withholds the rest", () => {
    const { kept, cells } = suppressSmallCells(rows, (r) => r.cell, (r) => r.subject);
    expect(kept).toHaveLength(10);
    expect(kept.every((r) => r.cell === "stroke|60-64")).toBe(true);
    expect(cells).toEqual([
      { cell: "parkinsons|70-74", subjects: 4, suppressed: true },
      { cell: "stroke|60-64", subjects: 5, suppressed: false },
    ]);
  });
});
