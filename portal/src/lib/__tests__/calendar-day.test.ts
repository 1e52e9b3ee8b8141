import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { formatCalendarDay, localCalendarDay, localDateTimeInputValue } from "../calendar-day";

// Node applies a change of process.env.TZ at once; each case runs in a zone where the naive
// conversions (local midnight, the UTC day) land on a different calendar day. Offsets: IANA tz
// database (America/Los_Angeles UTC−8 in January, Pacific/Auckland UTC+13 in January, daylight time).
let previousTz: string | undefined;
beforeEach(() => {
  previousTz = process.env.TZ;
});
afterEach(() => {
  if (previousTz === undefined) delete process.env.TZ;
  else process.env.TZ = previousTz;
});

describe("formatCalendarDay", () => {
  it("shows the stored day west of UTC, where the day's UTC midnight is still the day before", () => {
    process.env.TZ = "America/Los_Angeles";
    expect(new Date("2026-01-05").getDate()).toBe(4); // the shift the helper avoids
    expect(formatCalendarDay("2026-01-05", "en-GB")).toBe("5 Jan 2026");
  });

  it("shows the stored day east of UTC", () => {
    process.env.TZ = "Pacific/Auckland";
    expect(formatCalendarDay("2026-12-31", "en-GB")).toBe("31 Dec 2026");
  });

  it("shows text that is not a day unchanged", () => {
    expect(formatCalendarDay("2026-13-45x", "en-GB")).toBe("2026-13-45x");
    expect(formatCalendarDay("", "en-GB")).toBe("");
  });
});

describe("localCalendarDay", () => {
  it("is the user's day east of UTC just after local midnight, not the UTC day", () => {
    process.env.TZ = "Pacific/Auckland";
    const now = new Date("2026-01-05T11:30:00Z"); // 00:30 on 6 January in Auckland (UTC+13)
    expect(now.toISOString().slice(0, 10)).toBe("2026-01-05");
    expect(localCalendarDay(now)).toBe("2026-01-06");
  });

  it("is the user's day west of UTC late in the evening", () => {
    process.env.TZ = "America/Los_Angeles";
    const now = new Date("2026-01-06T06:30:00Z"); // 22:30 on 5 January in Los Angeles (UTC−8)
    expect(localCalendarDay(now)).toBe("2026-01-05");
  });
});

describe("localDateTimeInputValue", () => {
  // The value format of <input type="datetime-local">: HTML Living Standard, "valid normalized
  // local date and time string" (YYYY-MM-DDTHH:MM when seconds are zero).
  it("is the user's wall-clock time to the minute, on the user's day", () => {
    process.env.TZ = "Pacific/Auckland";
    expect(localDateTimeInputValue(new Date("2026-01-05T11:30:45Z"))).toBe("2026-01-06T00:30");
  });

  it("west of UTC, keeps the evening on the user's day", () => {
    process.env.TZ = "America/Los_Angeles";
    expect(localDateTimeInputValue(new Date("2026-01-06T03:07:00Z"))).toBe("2026-01-05T19:07");
  });

  it("turns back into the same instant, to the minute", () => {
    process.env.TZ = "Pacific/Auckland";
    const at = new Date("2026-07-01T22:59:30Z");
    expect(new Date(localDateTimeInputValue(at)).toISOString()).toBe("2026-07-01T22:59:00.000Z");
  });
});
