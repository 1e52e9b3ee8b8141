/**
 * The portal's number and date formats, one definition each, so a time reads the same on every
 * screen. Dates and times are instants (ISO strings from the API) shown in the reader's own locale
 * and time zone; calendar days stored as 'YYYY-MM-DD' go through `calendar-day.ts` instead, which
 * never shifts a day. The month is always a word, so "5 Jan 2026" and "Jan 5, 2026" cannot be read
 * as two different days the way 05/01 can.
 */

/** Shown where a value is missing (null, not measured, not a finite number). */
export const MISSING = "—";

/** Shared with `formatCalendarDay`: "5 Jan 2026" (en-GB), "Jan 5, 2026" (en-US). */
export const DATE_OPTIONS: Intl.DateTimeFormatOptions = { day: "numeric", month: "short", year: "numeric" };
const LONG_DATE_OPTIONS: Intl.DateTimeFormatOptions = { day: "numeric", month: "long", year: "numeric" };
const DATE_TIME_OPTIONS: Intl.DateTimeFormatOptions = { ...DATE_OPTIONS, hour: "2-digit", minute: "2-digit" };
const DATE_TIME_SECONDS_OPTIONS: Intl.DateTimeFormatOptions = { ...DATE_TIME_OPTIONS, second: "2-digit" };

export interface InstantFormat {
  /** BCP 47 locale; the browser's when absent. Tests fix it. */
  locale?: string;
  /** IANA zone; the browser's when absent. */
  timeZone?: string;
  /** Text for a missing value (default "—"). */
  missing?: string;
}

type Instant = string | Date | null | undefined;

function format(value: Instant, options: Intl.DateTimeFormatOptions, { locale, timeZone, missing = MISSING }: InstantFormat): string {
  if (value === null || value === undefined || value === "") return missing;
  const at = value instanceof Date ? value : new Date(value);
  // Text that is not a time is shown as it came rather than as "Invalid Date".
  if (Number.isNaN(at.getTime())) return value instanceof Date ? missing : value;
  return at.toLocaleString(locale, timeZone ? { ...options, timeZone } : options);
}

/** The day of an instant: "30 Nov 2026". */
export const formatDate = (value: Instant, opts: InstantFormat = {}): string => format(value, DATE_OPTIONS, opts);

/** The day of an instant with the month in full, for sentences: "30 November 2026". */
export const formatLongDate = (value: Instant, opts: InstantFormat = {}): string => format(value, LONG_DATE_OPTIONS, opts);

/** Day and time to the minute: "30 Nov 2026, 09:15". */
export const formatDateTime = (value: Instant, opts: InstantFormat = {}): string => format(value, DATE_TIME_OPTIONS, opts);

/** Day and time to the second, for logs where order within a minute matters: "30 Nov 2026, 09:15:04". */
export const formatDateTimeSeconds = (value: Instant, opts: InstantFormat = {}): string => format(value, DATE_TIME_SECONDS_OPTIONS, opts);

/**
 * A number with a fixed count of decimals and an optional unit written straight after it
 * (`formatNumber(92.44, 1, " steps/min")`); missing, NaN and infinite values read "—", never "NaN".
 * A small negative value that rounds to zero reads "0.0", not "-0.0", which looks like a change.
 */
export function formatNumber(value: number | null | undefined, decimals = 1, unit = ""): string {
  if (typeof value !== "number" || !Number.isFinite(value)) return MISSING;
  const text = value.toFixed(decimals);
  return `${/^-0(\.0+)?$/.test(text) ? text.slice(1) : text}${unit}`;
}

/** A share in percent, rounded to a whole number, with the thin spacing the portal uses: "75 %". */
export function formatPercent(value: number | null | undefined): string {
  return typeof value === "number" && Number.isFinite(value) ? `${Math.round(value)} %` : MISSING;
}

/**
 * A length of time in whole seconds for people: "45 s", "3 min 5 s". Rounded once, before it is
 * split, so 119.6 s reads "2 min 0 s" and never "1 min 60 s".
 */
export function formatDuration(seconds: number | null | undefined): string {
  if (typeof seconds !== "number" || !Number.isFinite(seconds) || seconds < 0) return "unknown";
  const total = Math.round(seconds);
  const m = Math.floor(total / 60);
  const s = total - m * 60;
  return m > 0 ? `${m} min ${s} s` : `${s} s`;
}
