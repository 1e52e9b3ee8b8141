import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { quantileOfMasked, quantilesOfMasked } from "../quantile";

/** Definition: linear interpolation between the order statistics of the fully sorted values. */
function sortedQuantile(values: number[], q: number): number {
  const s = Float64Array.from(values).sort();
  const pos = q * (s.length - 1);
  const lo = Math.floor(pos);
  const hi = Math.min(s.length - 1, lo + 1);
  return s[lo]! + (s[hi]! - s[lo]!) * (pos - lo);
}

describe("quantilesOfMasked(values, mask, qs)", () => {
  it("equals the quantile of the sorted values exactly (ties, runs, any order)", () => {
    const value = fc.oneof(fc.integer({ min: -3, max: 3 }), fc.double({ min: -1e6, max: 1e6, noNaN: true }));
    fc.assert(
      fc.property(fc.array(value, { minLength: 1, maxLength: 400 }), fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 1, maxLength: 4 }), (values, qs) => {
        const got = quantilesOfMasked(values, null, qs)!;
        qs.forEach((q, i) => expect(got[i]! === sortedQuantile(values, q) || (got[i] === 0 && sortedQuantile(values, q) === 0)).toBe(true));
      }),
      { numRuns: 500 },
    );
  });

  it("handles sorted, reversed and constant inputs", () => {
    const up = Array.from({ length: 1001 }, (_, i) => i);
    expect(quantileOfMasked(up, null, 0.99)).toBe(990);
    expect(quantileOfMasked([...up].reverse(), null, 0.01)).toBe(10);
    expect(quantilesOfMasked(new Array(50).fill(7), null, [0, 0.5, 1])).toEqual([7, 7, 7]);
  });

  it("uses only masked samples and keeps NaN last as a sort would", () => {
    const mask = Uint8Array.from([1, 0, 1, 1, 0]);
    expect(quantileOfMasked([5, 100, 1, 3, -100], mask, 0.5)).toBe(3);
    expect(quantilesOfMasked([2, Number.NaN, 1], null, [0, 0.5])).toEqual([1, Number.NaN]);
    expect(quantileOfMasked([1, 2], Uint8Array.from([0, 0]), 0.5)).toBeNull();
  });
});
