import { describe, expect, it } from "vitest";
import { intervalSpreadLimit } from "../resample-to-grid";

// The limit is median(Δt) + k · 1.4826 · MAD(Δt), the median taken as the upper middle value
// (index ⌊len/2⌋ of the ascending list). 1.4826 = 1 / Φ⁻¹(3/4) makes the MAD a consistent estimate
// of a normal SD (Rousseeuw & Croux 1993, J Am Stat Assoc 88:1273, §1).

/** The rule straight from its definition: intervals sampled as the function does, plain sorts. */
function byDefinition(t: readonly number[], k: number): number {
  const step = Math.max(1, Math.floor((t.length - 1) / 4096));
  const d: number[] = [];
  for (let i = 1; i < t.length; i += step) d.push(t[i]! - t[i - 1]!);
  const upperMedian = (v: number[]) => [...v].sort((a, b) => a - b)[v.length >> 1]!;
  const med = upperMedian(d);
  return med + k * 1.4826 * upperMedian(d.map((x) => Math.abs(x - med)));
}

describe("intervalSpreadLimit (median + k·1.4826·MAD of the sample intervals)", () => {
  it("worked example: intervals 10, 11, 9, 12, 8, 11 ms give 11 ms + 5 × 1.4826 × 1 ms", () => {
    // Ascending intervals 8 9 10 11 11 12 → upper median 11 ms; |Δ − 11| = 3 2 1 0 0 1 ms →
    // ascending 0 0 1 1 2 3 → upper median 1 ms (hand computation).
    const t = Float64Array.from([0, 0.01, 0.021, 0.03, 0.042, 0.05, 0.061]);
    expect(intervalSpreadLimit(t, 5)).toBeCloseTo(0.011 + 5 * 1.4826 * 0.001, 12);
  });

  it("a jittered 200 Hz clock over 30 minutes (subsampled to ~4096 intervals) matches the definition exactly", () => {
    let seed = 7;
    const uniform = () => (seed = (seed * 16807) % 2147483647) / 2147483647;
    const n = 360_000;
    const t = new Float64Array(n);
    for (let i = 1; i < n; i++) t[i] = t[i - 1]! + 0.005 + (uniform() - 0.5) * 0.0004 + (i % 50_000 === 0 ? 0.08 : 0);
    expect(intervalSpreadLimit(t, 5)).toBe(byDefinition(Array.from(t), 5));
  });

  it("equal timestamps (a −0 interval) give the definition's value too", () => {
    // −0 − 0 = −0: an interval the numeric sort of a typed array would order before +0.
    const t = Float64Array.from([0, -0, 0, 0.01, 0.02, 0.02, 0.035, 0.04]);
    expect(Object.is(t[1]! - t[0]!, -0)).toBe(true);
    expect(intervalSpreadLimit(t, 5)).toBe(byDefinition(Array.from(t), 5));
    expect(intervalSpreadLimit(t, 3)).toBe(byDefinition(Array.from(t), 3));
  });
});
