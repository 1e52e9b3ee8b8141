/**
 * Calendar days (DATE columns such as a patient's enrolment day) travel as 'YYYY-MM-DD' text from
 * the database to the screen. They are days, not instants: `new Date("2026-01-05")` is UTC
 * midnight, which a browser west of UTC shows as 4 January, and `toISOString().slice(0, 10)` is the
 * UTC day, which east of UTC is still yesterday in the morning. These helpers never shift a day.
 */

const DAY = /^(\d{4})-(\d{2})-(\d{2})$/;

/** A stored day for reading ("5 Jan 2026"); text that is not a day is shown as it came. */
export function formatCalendarDay(day: string, locale?: string): string {
  const m = DAY.exec(day);
  if (!m) return day;
  const at = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])));
  if (Number.isNaN(at.getTime())) return day;
  // Formatted in UTC, the zone the day was anchored in, so no local offset can move it.
  return at.toLocaleDateString(locale, { timeZone: "UTC", day: "numeric", month: "short", year: "numeric" });
}

/** The user's own calendar day at `now` as 'YYYY-MM-DD' (the value of an `<input type="date">`). */
export function localCalendarDay(now: Date = new Date()): string {
  const pad = (n: number) => String(n).padStart(2, "0");
  return `${now.getFullYear()}-${pad(now.getMonth() + 1)}-${pad(now.getDate())}`;
}
