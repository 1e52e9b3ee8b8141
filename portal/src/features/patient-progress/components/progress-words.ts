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
  speed: string | null;
}

/** 1 m/s = 3.6 km/h (3600 s per hour, 1000 m per km). */
const KMH_PER_MS = 3.6;

/** "about 0.8 metres per second (about 2.9 km/h)": one decimal, everyday units beside the measured ones. */
export function speedInWords(mPerS: number): string {
  return `about ${mPerS.toFixed(1)} metres per second (about ${(mPerS * KMH_PER_MS).toFixed(1)} km/h)`;
}

/** Shown whenever speed is: the number informs the care team's view, it does not replace it. */
export const SPEED_CAUTION =
  "Walking speed is one of the things your care team looks at. It supports their judgement about your walking and does not replace it; ask them what it means for you.";

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
  const spd = ordered.map((w) => w.walkingSpeedMPerS).filter((v): v is number => typeof v === "number" && v > 0);
  let speed: string | null = null;
  if (spd.length) {
    const latest = speedInWords(spd[spd.length - 1]!);
    speed =
      spd.length > START_WALKS
        ? `In your latest walk your walking speed was ${latest}. In your first walks it was ${speedInWords(mean(spd.slice(0, START_WALKS)))}.`
        : `In your latest walk your walking speed was ${latest}.`;
  }
  return { walks: ordered.length, cadence, rhythm, speed };
}
