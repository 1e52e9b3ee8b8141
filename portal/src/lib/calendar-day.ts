/**
 * Calendar days (DATE columns such as a patient's enrolment day) travel as 'YYYY-MM-DD' text from
 * the database to the screen. They are days, not instants: `new Date("2026-01-05")` is UTC
 * midnight, which a browser west of UTC shows as 4 January, and `toISOString().slice(0, 10)` is the
 * UTC day, which east of UTC is still yesterday in the morning. These helpers never shift a day.
 */

import { DATE_OPTIONS } from "./format";

const DAY = /^(\d{4})-(\d{2})-(\d{2})$/;

/** A stored day for reading ("5 Jan 2026"); text that is not a day is shown as it came. */
export function formatCalendarDay(day: string, locale?: string): string {
  const m = DAY.exec(day);
  if (!m) return day;
  const at = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])));
  if (Number.isNaN(at.getTime())) return day;
  // Formatted in UTC, the zone the day was anchored in, so no local offset can move it.
  return at.toLocaleDateString(locale, { ...DATE_OPTIONS, timeZone: "UTC" });
}

const pad = (n: number) => String(n).padStart(2, "0");

/** The user's own calendar day at `now` as 'YYYY-MM-DD' (the value of an `<input type="date">`). */
export function localCalendarDay(now: Date = new Date()): string {
  return `${now.getFullYear()}-${pad(now.getMonth() + 1)}-${pad(now.getDate())}`;
}

/**
 * The user's own wall-clock time at `now` to the minute, 'YYYY-MM-DDTHH:MM' (the value of an
 * `<input type="datetime-local">`); the browser turns it back into an instant in the same zone.
 */
export function localDateTimeInputValue(now: Date = new Date()): string {
  return `${localCalendarDay(now)}T${pad(now.getHours())}:${pad(now.getMinutes())}`;
}
