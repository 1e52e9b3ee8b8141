import type { Side, Stride } from "../types";

/** Two IC times this close (s) are the same event: a stride ends where the next one starts. */
const SAME_EVENT_S = 1e-6;

export interface ConsecutiveRun {
  side: Side;
  boutIndex: number;
  strideTimesS: number[];
}

/**
 * The longest run of consecutive steady strides of one leg inside one walking bout: each stride
 * starts at the IC that closed the previous one, so nothing was left out in between (an excluded
 * stride, a pause or a turn breaks the run). Ties go to the earlier run; null when no stride is steady.
 */
export function longestConsecutiveRun(strides: readonly Stride[]): ConsecutiveRun | null {
  let best: ConsecutiveRun | null = null;
  for (const side of ["left", "right"] as const) {
    const own = strides.filter((s) => s.side === side).sort((a, b) => a.icS - b.icS);
    let run: Stride[] = [];
    const close = () => {
      if (run.length > 0 && (!best || run.length > best.strideTimesS.length)) {
        best = { side, boutIndex: run[0]!.boutIndex ?? -1, strideTimesS: run.map((s) => s.strideTimeS) };
      }
      run = [];
    };
    for (const s of own) {
      if (!s.steady) {
        close();
        continue;
      }
      const prev = run[run.length - 1];
      if (prev && (Math.abs(s.icS - prev.nextIcS) > SAME_EVENT_S || (s.boutIndex ?? -1) !== (prev.boutIndex ?? -1))) close();
      run.push(s);
    }
    close();
  }
  return best;
}
