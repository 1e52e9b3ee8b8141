import { describe, expect, it } from "vitest";
import { firstIndexAbove, firstIndexAtOrAbove } from "../sorted-search";

// numpy.searchsorted(a, v, side="right"), NumPy reference documentation, "Examples":
// np.searchsorted([11, 12, 13, 14, 15], 13, side='right') == 3.
describe("firstIndexAbove(sorted, t) = numpy.searchsorted(sorted, t, side='right')", () => {
  it("matches NumPy's documented example", () => {
    expect(firstIndexAbove([11, 12, 13, 14, 15], 13)).toBe(3);
    expect(firstIndexAbove(new Float64Array([11, 12, 13, 14, 15]), 13)).toBe(3);
  });

  it("goes past every equal value, and gives 0 below and length above the range", () => {
    expect(firstIndexAbove([1, 2, 2, 2, 3], 2)).toBe(4);
    expect(firstIndexAbove([1, 2, 3], 0.5)).toBe(0);
    expect(firstIndexAbove([1, 2, 3], 3)).toBe(3);
    expect(firstIndexAbove([], 1)).toBe(0);
  });

  it("agrees with a linear scan on random sorted arrays (definition check)", () => {
    let seed = 7;
    const rand = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
    for (let k = 0; k < 200; k++) {
      const a = Array.from({ length: Math.floor(rand() * 20) }, () => Math.round(rand() * 10)).sort((x, y) => x - y);
      const t = Math.round(rand() * 12) - 1;
      const scan = a.findIndex((v) => v > t);
      expect(firstIndexAbove(a, t)).toBe(scan === -1 ? a.length : scan);
      const scanLeft = a.findIndex((v) => v >= t);
      expect(firstIndexAtOrAbove(a, t)).toBe(scanLeft === -1 ? a.length : scanLeft);
    }
  });
});

// np.searchsorted([11, 12, 13, 14, 15], 13) == 2 (side='left', the default), same documentation.
describe("firstIndexAtOrAbove(sorted, t) = numpy.searchsorted(sorted, t, side='left')", () => {
  it("matches NumPy's documented example and stops at the first equal value", () => {
    expect(firstIndexAtOrAbove([11, 12, 13, 14, 15], 13)).toBe(2);
    expect(firstIndexAtOrAbove([1, 2, 2, 2, 3], 2)).toBe(1);
    expect(firstIndexAtOrAbove([1, 2, 3], 4)).toBe(3);
  });

  it("searches only from `from` on, as both functions do", () => {
    expect(firstIndexAtOrAbove([1, 2, 3, 4], 0, 2)).toBe(2);
    expect(firstIndexAbove([1, 2, 3, 4], 0, 3)).toBe(3);
    expect(firstIndexAtOrAbove([1, 2, 3, 4], 3.5, 1)).toBe(3);
  });
});
