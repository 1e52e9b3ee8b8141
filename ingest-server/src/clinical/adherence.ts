/**
 * Upload adherence: did the patient upload the expected number of walking tests each ISO week?
 *
 * Rules (common practice, our own): weeks run from the ISO week of enrolment to the ISO week of
 * `now`. The enrolment week is never counted as missed (the patient may have enrolled on a Sunday)
 * and the current week is not counted as missed until it has ended, but both count as met when the
 * uploads are there. `expectedPerWeek` 0 means no home tests are expected: nothing is missed.
 * The streak counts consecutive met weeks ending at the last ended week, plus the current week
 * when it is already met.
 */
import { isoWeekLabel, isoWeekStart, isoWeeksBetween } from "./iso-week";

export interface AdherenceInput {
  enrolledOn: string;
  expectedPerWeek: number;
  /** recordedAt of every processed session of the patient. */
  sessionDates: readonly string[];
  now: Date | string;
}

export interface WeekAdherence {
  isoWeek: string;
  uploads: number;
  met: boolean;
}

export interface Adherence {
  expectedPerWeek: number;
  weeks: WeekAdherence[];
  missedWeeks: string[];
  currentStreakWeeks: number;
  thisWeek: WeekAdherence & { expected: number; remaining: number };
}

const MS_PER_WEEK = 7 * 24 * 3600 * 1000;

export function computeAdherence(input: AdherenceInput): Adherence {
  const { expectedPerWeek } = input;
  if (!Number.isInteger(expectedPerWeek) || expectedPerWeek < 0) throw new RangeError("expectedPerWeek must be an integer ≥ 0");
  const first = isoWeekStart(input.enrolledOn);
  const total = isoWeeksBetween(input.enrolledOn, input.now) + 1;
  const counts = new Map<string, number>();
  for (const d of input.sessionDates) {
    const label = isoWeekLabel(d);
    counts.set(label, (counts.get(label) ?? 0) + 1);
  }
  const weeks: WeekAdherence[] = [];
  for (let i = 0; i < Math.max(total, 0); i++) {
    const label = isoWeekLabel(new Date(first.getTime() + i * MS_PER_WEEK));
    const uploads = counts.get(label) ?? 0;
    weeks.push({ isoWeek: label, uploads, met: uploads >= expectedPerWeek });
  }
  const ended = weeks.slice(0, -1);
  const missedWeeks = ended.filter((w, i) => i > 0 && !w.met).map((w) => w.isoWeek);
  const current = weeks[weeks.length - 1] ?? { isoWeek: isoWeekLabel(input.now), uploads: 0, met: expectedPerWeek === 0 };
  let streak = 0;
  for (let i = ended.length - 1; i >= 0 && ended[i]!.met; i--) streak++;
  if (current.met) streak++;
  return {
    expectedPerWeek,
    weeks,
    missedWeeks,
    currentStreakWeeks: streak,
    thisWeek: { ...current, expected: expectedPerWeek, remaining: Math.max(0, expectedPerWeek - current.uploads) },
  };
}
