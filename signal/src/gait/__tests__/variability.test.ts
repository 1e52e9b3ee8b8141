import { describe, expect, it } from "vitest";
import type { Stride } from "../../types";
import { longestConsecutiveRun } from "../consecutive-strides";
import { dfaAlphaOrReason } from "../dfa";
import { describeExcludedStrides, excludedStrideCounts } from "../excluded-strides";
import { pooledWithinBoutCvPct } from "../pooled-variability";
import { stepTimeAsymmetryPct } from "../step-asymmetry";
import { gaussianStream } from "./support/pace-model";

describe("pooledWithinBoutCvPct(bouts)", () => {
  it("one bout = the ordinary CV with ddof 1: [1.10, 1.12, 1.08, 1.11, 1.09, 1.10] s → 1.2856 % (docs/methods.md#worked-examples)", () => {
    const r = pooledWithinBoutCvPct([[1.1, 1.12, 1.08, 1.11, 1.09, 1.1]]);
    expect(Math.abs(r.cvPct! - 1.2856)).toBeLessThan(1e-4);
    expect(r.count).toBe(6);
  });

  it("two bouts at 1.0 and 1.5 s: pooled SD √((2·0.02² + 2·0.03²)/4) = 0.025495 over the grand mean 1.25 → 2.0396 % (NIST pooled SD, by hand)", () => {
    const r = pooledWithinBoutCvPct([
      [0.98, 1.0, 1.02],
      [1.47, 1.5, 1.53],
    ]);
    expect(Math.abs(r.cvPct! - (100 * Math.sqrt((2 * 0.02 ** 2 + 2 * 0.03 ** 2) / 4)) / 1.25)).toBeLessThan(1e-9);
    expect(Math.abs(r.cvPct! - 2.0396)).toBeLessThan(1e-4);
    // All six pooled as one list would say 21.9 %: the pace change, not variability.
    expect(r.cvPct!).toBeLessThan(3);
  });

  it("null without two values in any bout; single-value bouts are left out", () => {
    expect(pooledWithinBoutCvPct([])).toEqual({ cvPct: null, count: 0 });
    expect(pooledWithinBoutCvPct([[1.1], [1.2]]).cvPct).toBeNull();
    const withSingle = pooledWithinBoutCvPct([[1.1, 1.12, 1.08, 1.11, 1.09, 1.1], [5]]);
    expect(Math.abs(withSingle.cvPct! - 1.2856)).toBeLessThan(1e-4);
    expect(withSingle.count).toBe(6);
  });
});

describe("stepTimeAsymmetryPct(meanLeftS, meanRightS)", () => {
  it("100·|ln(0.55/0.65)| = 16.7054 (log-ratio form of Plotnik 2007 / Yogev 2007, computed by hand)", () => {
    expect(Math.abs(stepTimeAsymmetryPct(0.55, 0.65)! - 16.7054)).toBeLessThan(1e-4);
    expect(stepTimeAsymmetryPct(0.65, 0.55)).toBeCloseTo(stepTimeAsymmetryPct(0.55, 0.65)!, 12);
  });
  it("is 0 for equal steps and null for missing or non-positive ones", () => {
    expect(stepTimeAsymmetryPct(0.5, 0.5)).toBe(0);
    expect(stepTimeAsymmetryPct(null, 0.5)).toBeNull();
    expect(stepTimeAsymmetryPct(0.5, 0)).toBeNull();
  });
});

/** A leg's back-to-back strides of `strideTimeS` from `t0`, all steady, in bout `boutIndex`. */
function run(side: "left" | "right", t0: number, n: number, boutIndex: number, strideTimeS = 1): Stride[] {
  const z = gaussianStream(boutIndex * 100 + n);
  const out: Stride[] = [];
  let t = t0;
  for (let i = 0; i < n; i++) {
    const T = strideTimeS * (1 + 0.02 * z());
    out.push({ side, icS: t, nextIcS: t + T, fcS: null, strideTimeS: T, stanceTimeS: null, swingTimeS: null, stancePct: null, swingPct: null, doubleSupportPct: null, steady: true, boutIndex });
    t += T;
  }
  return out;
}

describe("longestConsecutiveRun(strides) and DFA over one continuous bout", () => {
  it("does not join two bouts: 2 × 200 strides give a run of 200 (< 256, α null), one bout of 400 gives α", () => {
    const a = run("left", 0, 200, 0);
    const b = run("left", a[a.length - 1]!.nextIcS + 30, 200, 1);
    const r = longestConsecutiveRun([...a, ...b])!;
    expect(r.strideTimesS.length).toBe(200);
    const d = dfaAlphaOrReason(r.strideTimesS);
    expect(d.alpha).toBeNull();
    expect(d.strideCount).toBe(200);
    expect(d.reason).toMatch(/200 strides.*256/);
    const long = run("left", 0, 400, 0);
    const dl = dfaAlphaOrReason(longestConsecutiveRun(long)!.strideTimesS);
    expect(dl.alpha).not.toBeNull();
    expect(dl.strideCount).toBe(400);
    expect(dl.uncertainty!).toBeGreaterThan(0);
  });

  it("breaks at an excluded stride and at a missing stride, and takes the longer leg", () => {
    const a = run("left", 0, 50, 0);
    a[20] = { ...a[20]!, steady: false, excludedReason: "out-of-range" };
    expect(longestConsecutiveRun(a)!.strideTimesS.length).toBe(29);
    const holed = run("right", 0, 50, 0).filter((_, i) => i !== 10);
    expect(longestConsecutiveRun(holed)!.strideTimesS.length).toBe(39);
    const best = longestConsecutiveRun([...a, ...holed])!;
    expect(best.side).toBe("right");
    expect(longestConsecutiveRun([])).toBeNull();
  });
});

describe("excludedStrideCounts / describeExcludedStrides", () => {
  it("counts left-out strides by reason and names each reason in the one-line summary", () => {
    const s = run("left", 0, 10, 0);
    s[0] = { ...s[0]!, steady: false, excludedReason: "bout-edge" };
    s[1] = { ...s[1]!, steady: false, excludedReason: "unsteady" };
    s[2] = { ...s[2]!, steady: false, excludedReason: "unsteady" };
    s[5] = { ...s[5]!, steady: false, excludedReason: "gap" };
    expect(excludedStrideCounts(s)).toEqual({ "bout-edge": 1, unsteady: 2, gap: 1 });
    const line = describeExcludedStrides(s)!;
    expect(line).toMatch(/^4 of 10 strides/);
    expect(line).toMatch(/2 unsteady/);
    expect(line).toMatch(/1 gap/);
    expect(describeExcludedStrides(run("left", 0, 5, 0))).toBeNull();
  });
});
