import { describe, expect, it } from "vitest";
import { consentEventCounts, consentInForceAt, consentPeriods, type ConsentEventLike } from "../consent-periods";

const at = (d: string) => new Date(`${d}T12:00:00Z`);
const ev = (kind: "given" | "withdrawn", day: string, counts = true): ConsentEventLike => ({ kind, counts, at: at(day) });

describe("which consent events count", () => {
  it("a withdrawal always; a 'given' from the patient or an admin; never a clinician's or the old flag's 'given'", () => {
    expect(consentEventCounts("withdrawn", "clinician")).toBe(true);
    expect(consentEventCounts("withdrawn", "migration")).toBe(true);
    expect(consentEventCounts("given", "patient")).toBe(true);
    expect(consentEventCounts("given", "admin")).toBe(true);
    expect(consentEventCounts("given", "clinician")).toBe(false);
    expect(consentEventCounts("given", "migration")).toBe(false);
  });
});

describe("consentPeriods", () => {
  it("opens on a counting 'given' and closes on a withdrawal; half-open intervals", () => {
    const periods = consentPeriods([ev("given", "2026-03-01"), ev("withdrawn", "2026-05-01"), ev("given", "2026-07-01")]);
    expect(periods).toEqual([
      { from: at("2026-03-01"), to: at("2026-05-01") },
      { from: at("2026-07-01"), to: null },
    ]);
    expect(consentInForceAt(periods, at("2026-02-28"))).toBe(false);
    expect(consentInForceAt(periods, at("2026-03-01"))).toBe(true);
    expect(consentInForceAt(periods, at("2026-04-15"))).toBe(true);
    expect(consentInForceAt(periods, at("2026-05-01"))).toBe(false);
    expect(consentInForceAt(periods, at("2026-06-15"))).toBe(false);
    expect(consentInForceAt(periods, at("2027-01-01"))).toBe(true);
  });

  it("ignores events that do not count, and repeated events of the same kind", () => {
    const periods = consentPeriods([ev("given", "2026-03-01", false), ev("withdrawn", "2026-03-05"), ev("given", "2026-04-01"), ev("given", "2026-04-10")]);
    expect(periods).toEqual([{ from: at("2026-04-01"), to: null }]);
  });

  it("no events → never in force", () => {
    expect(consentPeriods([])).toEqual([]);
    expect(consentInForceAt([], at("2026-01-01"))).toBe(false);
  });
});
