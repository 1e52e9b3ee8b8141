import { type SensorRecording, SignalInputError } from "../types";

/** The one uniform time grid every sensor is resampled onto (0 s = earliest start_utc). */
export interface SessionGrid {
  startUtc: string;
  startMs: number;
  sampleRateHz: number;
  /** Number of grid samples; sample k is at k / sampleRateHz seconds. */
  length: number;
  durationS: number;
  /** Per recording (same order as the input): its t_s = 0 on the session time base. */
  offsetsS: number[];
}

/** Largest session accepted: 6 h (a weekly home test lasts minutes; this bounds memory). */
export const MAX_SESSION_DURATION_S = 6 * 3600;

/**
 * Session time base: seconds since the earliest start_utc among the recordings, sampled at the
 * highest nominal rate among them.
 */
export function sessionGrid(recordings: readonly SensorRecording[]): SessionGrid {
  if (recordings.length === 0) throw new SignalInputError("no recordings to analyse");
  const starts = recordings.map((r) => {
    const ms = Date.parse(r.startUtc);
    if (!Number.isFinite(ms)) throw new SignalInputError(`${r.fileName}: start time "${r.startUtc}" is not a valid date`, r.fileName);
    if (r.timeS.length === 0) throw new SignalInputError(`${r.fileName}: recording has no samples`, r.fileName);
    return ms;
  });
  const startMs = Math.min(...starts);
  const sampleRateHz = Math.max(...recordings.map((r) => r.nominalSampleRateHz));
  const offsetsS = starts.map((ms) => (ms - startMs) / 1000);
  let endS = 0;
  recordings.forEach((r, i) => {
    endS = Math.max(endS, offsetsS[i]! + r.timeS[r.timeS.length - 1]!);
  });
  if (endS > MAX_SESSION_DURATION_S) {
    throw new SignalInputError(
      `session spans ${(endS / 3600).toFixed(1)} h (start times or clocks disagree?); at most ${MAX_SESSION_DURATION_S / 3600} h is accepted`,
    );
  }
  const length = Math.floor(endS * sampleRateHz + 1e-9) + 1;
  return {
    startUtc: new Date(startMs).toISOString(),
    startMs,
    sampleRateHz,
    length,
    durationS: (length - 1) / sampleRateHz,
    offsetsS,
  };
}
