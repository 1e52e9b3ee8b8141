import type { WalkSummary } from "../api/get-my-walks";

const mean = (xs: number[]) => xs.reduce((s, x) => s + x, 0) / xs.length;

/** Sessions used as "the start": the first three measured walks (the same baseline length the care team's screens use by default). */
export const START_WALKS = 3;
/** Relative change in rhythm variability treated as "about the same" either side; wording only, not a clinical threshold. */
export const SAME_BAND = 0.1;

export interface ProgressWords {
  walks: number;
  cadence: string | null;
  rhythm: string | null;
}

/**
 * Everyday sentences about the person's own walks. No clinical terms, no judgement words such as
 * "worse", and nothing about what it means for their condition: that is their care team's part.
 */
export function progressWords(done: WalkSummary[]): ProgressWords {
  const ordered = [...done].sort((a, b) => a.recordedAt.localeCompare(b.recordedAt));
  const cad = ordered.map((w) => w.cadenceStepsPerMin).filter((v): v is number => typeof v === "number");
  const cv = ordered.map((w) => w.strideTimeCvPct).filter((v): v is number => typeof v === "number");

  let cadence: string | null = null;
  if (cad.length) {
    const latest = Math.round(cad[cad.length - 1]!);
    cadence =
      cad.length > START_WALKS
        ? `In your latest walk you took about ${latest} steps per minute. In your first walks it was about ${Math.round(mean(cad.slice(0, START_WALKS)))}.`
        : `In your latest walk you took about ${latest} steps per minute.`;
  }

  let rhythm: string | null = null;
  if (cv.length > START_WALKS) {
    const start = mean(cv.slice(0, START_WALKS));
    const recent = cv[cv.length - 1]!;
    const change = start > 0 ? (recent - start) / start : 0;
    rhythm =
      change <= -SAME_BAND
        ? "Your walking rhythm was steadier than at the start."
        : change >= SAME_BAND
          ? "Your walking rhythm was a little less even than at the start. This often changes from week to week, with tiredness, shoes or the route."
          : "Your walking rhythm was about as steady as at the start.";
  }
  return { walks: ordered.length, cadence, rhythm };
}
