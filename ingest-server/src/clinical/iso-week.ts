/**
 * ISO 8601 week numbering in UTC (weeks start on Monday; week 1 holds the year's first Thursday).
 * UTC, not the clinic's zone: a session recorded late on a Sunday evening in a zone east of UTC
 * may count for the previous week — accepted for a weekly test (documented in the README).
 */
const MS_PER_DAY = 24 * 3600 * 1000;

export interface IsoWeek {
  year: number;
  week: number;
}

function toUtcDay(d: Date | string): Date {
  const date = typeof d === "string" ? new Date(d) : d;
  if (Number.isNaN(date.getTime())) throw new RangeError(`not a date: ${String(d)}`);
  return new Date(Date.UTC(date.getUTCFullYear(), date.getUTCMonth(), date.getUTCDate()));
}

export function isoWeekOf(d: Date | string): IsoWeek {
  const day = toUtcDay(d);
  const weekday = day.getUTCDay() || 7; // Monday 1 … Sunday 7
  const thursday = new Date(day.getTime() + (4 - weekday) * MS_PER_DAY);
  const year = thursday.getUTCFullYear();
  const week = Math.floor((thursday.getTime() - Date.UTC(year, 0, 1)) / MS_PER_DAY / 7) + 1;
  return { year, week };
}

export function isoWeekLabel(d: Date | string): string {
  const { year, week } = isoWeekOf(d);
  return `${year}-W${String(week).padStart(2, "0")}`;
}

/** Monday 00:00 UTC of the ISO week holding `d`. */
export function isoWeekStart(d: Date | string): Date {
  const day = toUtcDay(d);
  const weekday = day.getUTCDay() || 7;
  return new Date(day.getTime() - (weekday - 1) * MS_PER_DAY);
}

/** Whole ISO weeks from the week of `a` to the week of `b` (0 = same week). */
export function isoWeeksBetween(a: Date | string, b: Date | string): number {
  return Math.round((isoWeekStart(b).getTime() - isoWeekStart(a).getTime()) / (7 * MS_PER_DAY));
}
