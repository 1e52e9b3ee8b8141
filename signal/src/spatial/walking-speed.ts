import type { Stride } from "../types";

/** Fewer steady strides with a length than this give no session speed; common practice. */
export const MIN_STRIDES_FOR_SPEED = 3;

export interface WalkingSpeed {
  walkingSpeedMPerS: number | null;
  strideLengthM: number | null;
  /** Steady strides whose length entered both numbers. */
  strideCount: number;
  /** Why no speed was computed; or, with a speed, the caveats on it (e.g. an assumed sensor distance); null when none. */
  reason: string | null;
}

/**
 * Session walking speed = Σ stride length / Σ stride time over the steady strides that have a length
 * (the same as mean stride length / mean stride time over those strides, so a long slow stride weighs
 * by its duration, as a timed walk would); stride length = their mean. Stride times are the analysis's
 * own (IC to next IC), so speed stays consistent with cadence and stride time. `rejected` (from
 * sessionStrideLengths) only shapes the reason given when no speed can be reported; `notes` (same
 * source) become the reason when a speed is reported with a caveat.
 */
export function walkingSpeedFromStrides(strides: readonly Stride[], rejected: Partial<Record<string, number>> = {}, notes: readonly string[] = []): WalkingSpeed {
  const steady = strides.filter((s) => s.steady);
  let lengthSum = 0;
  let timeSum = 0;
  let count = 0;
  for (const s of steady) {
    const len = s.strideLengthM;
    if (len === null || len === undefined || !Number.isFinite(len)) continue;
    lengthSum += len;
    timeSum += s.strideTimeS;
    count++;
  }
  if (count < MIN_STRIDES_FOR_SPEED) {
    const reason =
      steady.length === 0
        ? "no steady strides"
        : (rejected["no-height"] ?? 0) > 0 && count === 0
          ? "height not recorded: the shank method needs it for the ankle-to-sensor distance (a foot sensor needs none)"
          : `only ${count} of ${steady.length} steady strides had a measurable length (at least ${MIN_STRIDES_FOR_SPEED} needed)`;
    return { walkingSpeedMPerS: null, strideLengthM: null, strideCount: count, reason };
  }
  return { walkingSpeedMPerS: lengthSum / timeSum, strideLengthM: lengthSum / count, strideCount: count, reason: notes.length ? notes.join("; ") : null };
}
