import { createHmac } from "node:crypto";
import { describe, expect, it } from "vitest";
import {
  AGE_BANDS,
  ageAtEnrolment,
  ageBand,
  projectKey,
  pseudonymousSessionRef,
  pseudonymousSubjectId,
  releaseCutoff,
  studyWeekBlock,
  suppressSmallCells,
  weeksSinceEnrolment,
} from "../safe-harbor";

const SECRET = "server-research-secret-0123456789";
const SALT_A = Buffer.alloc(32, 1);
const SALT_B = Buffer.alloc(32, 2);

describe("project keys and pseudonyms (HMAC-SHA256, RFC 2104)", () => {
  it("the HMAC primitive matches RFC 4231 test case 2 (key 'Jefe', data 'what do ya want for nothing?')", () => {
    // RFC 4231 §4.3: HMAC-SHA-256 = 5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843.
    expect(createHmac("sha256", "Jefe").update("what do ya want for nothing?").digest("hex")).toBe(
      "5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843",
    );
  });

  it("the project key is HMAC(secret, label ‖ salt) and the subject id HMAC(project key, project ‖ 0x00 ‖ patient), as node:crypto computes them", () => {
    const key = projectKey(SECRET, SALT_A);
    const expectedKey = createHmac("sha256", SECRET).update("pendula-research-project-key").update(SALT_A).digest();
    expect(key.equals(expectedKey)).toBe(true);
    const expected = createHmac("sha256", expectedKey).update("proj-1\u0000p-1").digest("hex").slice(0, 24);
    expect(pseudonymousSubjectId(key, "proj-1", "p-1")).toBe(`sub-${expected}`);
    expect(pseudonymousSessionRef(key, "proj-1", "s-1")).toBe(
      `ses-${createHmac("sha256", expectedKey).update("session\u0000proj-1\u0000s-1").digest("hex").slice(0, 32)}`,
    );
  });

  it("is stable within a project and differs between projects, patients and sessions", () => {
    const a = projectKey(SECRET, SALT_A);
    const b = projectKey(SECRET, SALT_B);
    expect(pseudonymousSubjectId(a, "proj-a", "p-1")).toBe(pseudonymousSubjectId(projectKey(SECRET, SALT_A), "proj-a", "p-1"));
    expect(pseudonymousSubjectId(a, "proj-a", "p-1")).not.toBe(pseudonymousSubjectId(b, "proj-b", "p-1"));
    // Same key, other project id: still a different id, since the project is part of the message.
    expect(pseudonymousSubjectId(a, "proj-a", "p-1")).not.toBe(pseudonymousSubjectId(a, "proj-b", "p-1"));
    expect(pseudonymousSubjectId(a, "proj-a", "p-1")).not.toBe(pseudonymousSubjectId(a, "proj-a", "p-2"));
    expect(pseudonymousSubjectId(a, "proj-a", "p-1")).not.toContain("p-1");
    // "ab" + "c" and "a" + "bc" must not collide: the separator keeps the two parts apart.
    expect(pseudonymousSubjectId(a, "ab", "c")).not.toBe(pseudonymousSubjectId(a, "a", "bc"));
  });

  it("refuses a short server secret or a salt that is not 32 bytes", () => {
    expect(() => projectKey("short", SALT_A)).toThrow(RangeError);
    expect(() => projectKey(SECRET, Buffer.alloc(16))).toThrow(RangeError);
  });
});

describe("study clock: 4-week blocks, capped at 52 (common practice, see studyWeekBlock)", () => {
  it.each([
    [0, 0],
    [3, 0],
    [4, 4],
    [7, 4],
    [51, 48],
    [52, 52],
    [53, 52],
    [260, 52],
  ])("week %d → block %d", (w, block) => expect(studyWeekBlock(w)).toBe(block));

  it("refuses negative or fractional weeks", () => {
    expect(() => studyWeekBlock(-1)).toThrow(RangeError);
    expect(() => studyWeekBlock(1.5)).toThrow(RangeError);
  });

  it("holds back the last 28 days", () => {
    expect(releaseCutoff(new Date("2026-12-02T10:00:00Z")).toISOString()).toBe("2026-11-04T10:00:00.000Z");
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
