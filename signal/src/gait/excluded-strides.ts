import type { Stride } from "../types";

type Reason = NonNullable<Stride["excludedReason"]>;

/** Plain-language meaning of each exclusion reason, in the order they are listed. */
const REASON_TEXT: Record<Reason, string> = {
  unsteady: "speeding up or slowing down at a bout's start or end",
  "bout-edge": "first or last stride of a leg in a bout",
  "out-of-range": "stride time far from the walk's own typical stride",
  "event-order": "contacts not in the expected order",
  turn: "near a turn",
  gap: "across a short data gap",
  "invalid-span": "across missing data",
  "unreliable-sensor": "from a sensor flagged unreliable",
};

/** Counts of left-out strides by reason (only reasons that occur). */
export function excludedStrideCounts(strides: readonly Stride[]): Partial<Record<Reason, number>> {
  const out: Partial<Record<Reason, number>> = {};
  for (const s of strides) if (!s.steady && s.excludedReason) out[s.excludedReason] = (out[s.excludedReason] ?? 0) + 1;
  return out;
}

/** One line for the `strides-excluded` quality item, or null when every stride is steady. */
export function describeExcludedStrides(strides: readonly Stride[]): string | null {
  const counts = excludedStrideCounts(strides);
  const parts = (Object.keys(REASON_TEXT) as Reason[])
    .filter((r) => counts[r])
    .map((r) => `${counts[r]} ${r} (${REASON_TEXT[r]})`);
  if (parts.length === 0) return null;
  const total = Object.values(counts).reduce((a, b) => a + (b ?? 0), 0);
  return `${total} of ${strides.length} strides left out of the steady-state metrics: ${parts.join("; ")}`;
}
