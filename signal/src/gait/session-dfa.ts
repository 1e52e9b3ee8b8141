import type { Stride } from "../types";
import { longestConsecutiveRun } from "./consecutive-strides";
import { type DfaAlphaOutcome, dfaAlphaOrReason } from "./dfa";

/**
 * DFA α of a session: over the longest run of consecutive steady strides of one leg in one bout,
 * never joined across pauses, turns or excluded strides (DFA integrates an unbroken series, so a
 * join would add an artificial jump). With no steady stride the series is empty and α is null with
 * dfaAlphaOrReason's reason.
 */
export function sessionDfa(strides: readonly Stride[]): DfaAlphaOutcome {
  const run = longestConsecutiveRun(strides);
  return dfaAlphaOrReason(run?.strideTimesS ?? []);
}
