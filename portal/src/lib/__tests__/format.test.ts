import { describe, expect, it } from "vitest";
import {
  DATE_OPTIONS,
  MISSING,
  formatDate,
  formatDateTime,
  formatDateTimeSeconds,
  formatDuration,
  formatLongDate,
  formatNumber,
  formatPercent,
} from "../format";

// 08:05:09 UTC on 30 November 2026; 21:05:09 the same day in Auckland (UTC+13 in daylight time,
// IANA tz database), 00:05:09 the same day in Los Angeles (UTC−8).
const AT = "2026-11-30T08:05:09.000Z";
const GB_UTC = { locale: "en-GB", timeZone: "UTC" };

describe("instants", () => {
  // Expected strings: the CLDR en-GB and en-US patterns as shipped in Node's ICU (Intl, ECMA-402).
  it("shows the day with the month as a word", () => {
    expect(formatDate(AT, GB_UTC)).toBe("30 Nov 2026");
    expect(formatDate(AT, { locale: "en-US", timeZone: "UTC" })).toBe("Nov 30, 2026");
    expect(formatLongDate(AT, GB_UTC)).toBe("30 November 2026");
  });

  it("shows the time to the minute, or to the second for logs, on a 24-hour clock in en-GB", () => {
    expect(formatDateTime(AT, GB_UTC)).toBe("30 Nov 2026, 08:05");
    expect(formatDateTimeSeconds(AT, GB_UTC)).toBe("30 Nov 2026, 08:05:09");
  });

  it("follows the reader's locale: the same options as Intl.DateTimeFormat computed here", () => {
    // Source: ECMA-402 Intl.DateTimeFormat, the browser's own formatter for the same options.
    const expected = new Intl.DateTimeFormat("de-DE", { ...DATE_OPTIONS, hour: "2-digit", minute: "2-digit", timeZone: "UTC" }).format(new Date(AT));
    expect(formatDateTime(AT, { locale: "de-DE", timeZone: "UTC" })).toBe(expected);
    expect(expected).toContain("08:05");
  });

  it("shows the reader's own wall-clock day, which differs from the UTC day across the date line", () => {
    expect(formatDate("2026-11-30T20:00:00Z", { locale: "en-GB", timeZone: "Pacific/Auckland" })).toBe("1 Dec 2026");
    expect(formatDate("2026-11-30T06:00:00Z", { locale: "en-GB", timeZone: "America/Los_Angeles" })).toBe("29 Nov 2026");
  });

  it("accepts a Date as well as ISO text", () => {
    expect(formatDateTime(new Date(AT), GB_UTC)).toBe("30 Nov 2026, 08:05");
  });

  it("reads a missing value as a dash or the caller's word, and shows text that is not a time as it came", () => {
    expect(formatDateTime(null, GB_UTC)).toBe(MISSING);
    expect(formatDateTime(undefined, GB_UTC)).toBe("—");
    expect(formatDateTime("", GB_UTC)).toBe("—");
    expect(formatDateTime(null, { ...GB_UTC, missing: "never" })).toBe("never");
    expect(formatDate("not a date", GB_UTC)).toBe("not a date");
    expect(formatDate(new Date(Number.NaN), GB_UTC)).toBe("—");
  });
});

describe("formatNumber", () => {
  it("fixes the decimals and writes the unit straight after (Number.prototype.toFixed, ECMA-262)", () => {
    expect(formatNumber(92.44, 1, " steps/min")).toBe("92.4 steps/min");
    expect(formatNumber(0.645, 2)).toBe("0.65"); // 0.645 is stored as 0.64500000000000001776…, so it rounds up
    expect(formatNumber(1.005, 2)).toBe("1.00"); // 1.005 is stored as 1.00499999999999989342…, so it rounds down
    expect((-0.04).toFixed(1)).toBe("-0.0"); // what toFixed alone would show
    expect(formatNumber(-0.04, 1)).toBe("0.0");
    expect(formatNumber(-0.06, 1)).toBe("-0.1");
    expect(formatNumber(12)).toBe("12.0");
    expect(formatNumber(12.5, 0, "°")).toBe("13°");
  });

  it("never prints NaN or Infinity", () => {
    for (const v of [null, undefined, Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY]) expect(formatNumber(v, 2, " %")).toBe("—");
  });
});

describe("formatPercent", () => {
  it("rounds to a whole percent (Math.round, ECMA-262: halves go up)", () => {
    expect(formatPercent(74.5)).toBe("75 %");
    expect(formatPercent(40)).toBe("40 %");
    expect(formatPercent(0.4)).toBe("0 %");
    expect(formatPercent(null)).toBe("—");
    expect(formatPercent(Number.NaN)).toBe("—");
  });
});

describe("formatDuration", () => {
  it("writes minutes and seconds", () => {
    expect(formatDuration(45)).toBe("45 s");
    expect(formatDuration(185)).toBe("3 min 5 s");
    expect(formatDuration(0)).toBe("0 s");
  });

  it("rounds before splitting, so a minute never shows 60 seconds", () => {
    expect(formatDuration(119.6)).toBe("2 min 0 s");
    expect(formatDuration(59.5)).toBe("1 min 0 s");
  });

  it("says unknown for a length that is missing or impossible", () => {
    for (const v of [null, undefined, Number.NaN, -1, Number.POSITIVE_INFINITY]) expect(formatDuration(v)).toBe("unknown");
  });
});
