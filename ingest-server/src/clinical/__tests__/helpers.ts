import type { SeriesPoint } from "../change-flags";

/** Weekly sessions from Monday 2026-09-07 10:00 UTC, ids s1, s2, … */
export function weekly(values: readonly number[], startIso = "2026-09-07T10:00:00.000Z", stepDays = 7): SeriesPoint[] {
  const start = Date.parse(startIso);
  return values.map((value, i) => ({
    sessionId: `s${i + 1}`,
    recordedAt: new Date(start + i * stepDays * 86_400_000).toISOString(),
    value,
  }));
}
