import { describe, expect, it } from "vitest";
import { minMaxDecimate } from "../min-max-decimate";

// Min/max-per-bucket decimation is common practice for plotting long traces (no external source).
describe("minMaxDecimate(samples, rate, start, from, to, maxPoints)", () => {
  const rate = 100;
  const samples = Float32Array.from({ length: 1000 }, (_, i) => Math.sin((2 * Math.PI * i) / 100));

  it("returns the window unchanged when it has no more samples than maxPoints", () => {
    const out = minMaxDecimate(samples, rate, 0, 1, 1.5, 1000);
    expect(out.value).toHaveLength(51);
    expect(out.timeS[0]).toBeCloseTo(1, 12);
    expect(out.timeS.at(-1)).toBeCloseTo(1.5, 12);
    expect(out.value[0]).toBeCloseTo(samples[100]!, 6);
  });

  it("keeps every peak and trough of a 1 Hz sine at ≤ maxPoints", () => {
    const out = minMaxDecimate(samples, rate, 0, 0, 10, 100);
    expect(out.value.length).toBeLessThanOrEqual(100);
    expect(Math.max(...out.value)).toBeCloseTo(1, 6);
    expect(Math.min(...out.value)).toBeCloseTo(-1, 6);
    // Each of the 10 cycles keeps its own +1 peak (at t = k + 0.25 s).
    const peaks = out.timeS.filter((_, i) => out.value[i]! > 0.999);
    expect(peaks.map((t) => Math.round(t * 100) / 100)).toEqual([0.25, 1.25, 2.25, 3.25, 4.25, 5.25, 6.25, 7.25, 8.25, 9.25]);
  });

  it("keeps time order within a bucket", () => {
    const out = minMaxDecimate(samples, rate, 0, 0, 10, 40);
    for (let i = 1; i < out.timeS.length; i++) expect(out.timeS[i]!).toBeGreaterThan(out.timeS[i - 1]!);
  });

  it("honours a start offset and returns nothing outside the trace", () => {
    const out = minMaxDecimate(samples, rate, 5, 5, 5.02, 10);
    expect(out.timeS.map((t) => Math.round(t * 100) / 100)).toEqual([5, 5.01, 5.02]);
    expect(minMaxDecimate(samples, rate, 0, 20, 30, 10).value).toEqual([]);
  });

  it("skips NaN samples (invalid spans) instead of plotting them", () => {
    const withGap = Float32Array.from(samples);
    withGap.fill(Number.NaN, 100, 200);
    const out = minMaxDecimate(withGap, rate, 0, 1, 1.99, 1000);
    expect(out.value).toEqual([]);
  });

  it("rejects a bad rate or maxPoints", () => {
    expect(() => minMaxDecimate(samples, 0, 0, 0, 1, 10)).toThrow(RangeError);
    expect(() => minMaxDecimate(samples, rate, 0, 0, 1, 1)).toThrow(RangeError);
  });
});
