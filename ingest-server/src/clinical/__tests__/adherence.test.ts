import { describe, expect, it } from "vitest";
import fixtures from "./fixtures/reliability-fixtures.json";
import { computeAdherence } from "../adherence";
import { isoWeekLabel, isoWeekStart, isoWeeksBetween } from "../iso-week";

describe("ISO 8601 weeks", () => {
  it.each(fixtures.iso_weeks)("$date is $label (Python datetime.isocalendar)", ({ date, label }) => {
    expect(isoWeekLabel(`${date}T12:00:00Z`)).toBe(label);
  });

  it("starts weeks on Monday and counts weeks across a year boundary", () => {
    expect(isoWeekStart("2027-01-03T23:59:00Z").toISOString()).toBe("2026-12-28T00:00:00.000Z");
    expect(isoWeeksBetween("2026-12-21", "2027-01-04")).toBe(2);
  });
});

describe("computeAdherence", () => {
  // Enrolled Wednesday 2026-09-02 (week 2026-W36); now Thursday 2026-10-08 (W41).
  const base = { enrolledOn: "2026-09-02", now: "2026-10-08T12:00:00Z" };

  it("lists missed ended weeks, excluding the enrolment week and the running week", () => {
    const a = computeAdherence({
      ...base,
      expectedPerWeek: 1,
      sessionDates: ["2026-09-08T10:00:00Z", "2026-09-29T10:00:00Z", "2026-10-01T10:00:00Z"], // W37, W40, W40
    });
    expect(a.weeks.map((w) => w.isoWeek)).toEqual(["2026-W36", "2026-W37", "2026-W38", "2026-W39", "2026-W40", "2026-W41"]);
    expect(a.missedWeeks).toEqual(["2026-W38", "2026-W39"]);
    expect(a.currentStreakWeeks).toBe(1); // W40 met, W41 not yet
    expect(a.thisWeek).toMatchObject({ isoWeek: "2026-W41", uploads: 0, met: false, remaining: 1 });
  });

  it("counts two expected uploads a week: one upload is a missed week", () => {
    const a = computeAdherence({
      ...base,
      expectedPerWeek: 2,
      sessionDates: ["2026-09-08T10:00:00Z", "2026-09-10T10:00:00Z", "2026-09-15T10:00:00Z", "2026-10-06T10:00:00Z", "2026-10-07T10:00:00Z"],
    });
    expect(a.missedWeeks).toEqual(["2026-W38", "2026-W39", "2026-W40"]);
    expect(a.currentStreakWeeks).toBe(1); // only the running week, already met
    expect(a.thisWeek.met).toBe(true);
  });

  it("counts a streak over consecutive met weeks", () => {
    const dates = ["2026-09-09", "2026-09-16", "2026-09-23", "2026-09-30"].map((d) => `${d}T09:00:00Z`);
    const a = computeAdherence({ ...base, expectedPerWeek: 1, sessionDates: dates });
    expect(a.missedWeeks).toEqual([]);
    expect(a.currentStreakWeeks).toBe(4);
  });

  it("misses nothing when no uploads are expected", () => {
    const a = computeAdherence({ ...base, expectedPerWeek: 0, sessionDates: [] });
    expect(a.missedWeeks).toEqual([]);
    expect(a.thisWeek.met).toBe(true);
  });

  it("rejects a negative or fractional expectation", () => {
    expect(() => computeAdherence({ ...base, expectedPerWeek: -1, sessionDates: [] })).toThrow(RangeError);
    expect(() => computeAdherence({ ...base, expectedPerWeek: 1.5, sessionDates: [] })).toThrow(RangeError);
  });
});
