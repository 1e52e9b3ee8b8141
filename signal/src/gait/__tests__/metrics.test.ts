import { describe, expect, it } from "vitest";
import type { Stride } from "../../types";
import { coefficientOfVariationPct, mean, standardDeviation } from "../descriptive";
import { dfaAlphaOrReason, detrendedFluctuation, DFA_MIN_STRIDES } from "../dfa";
import { gaitAsymmetryPct } from "../gait-asymmetry";
import { phaseCoordinationIndex } from "../phase-coordination-index";
import { buildStrides } from "../strides";
import { strideMetrics } from "../stride-metrics";

describe("phaseCoordinationIndex(referenceStrides, otherIcs)", () => {
  // Worked example of docs/methods.md#worked-examples (computed with NumPy from the Plotnik, Giladi
  // & Hausdorff 2007 formula).
  const tL = [0, 1.1, 2.2, 3.3, 4.4];
  const tS = [0.6, 1.65, 2.8, 3.8];
  const strides = tL.slice(0, -1).map((t, i) => ({ icS: t, nextIcS: tL[i + 1]! }));

  it("gives φ = 196.364°, 180°, 196.364°, 163.636° and PCI 15.3286 % with ddof 1 (1e-4)", () => {
    const r = phaseCoordinationIndex(strides, tS)!;
    expect(r.phiDeg.map((p) => +p.toFixed(3))).toEqual([196.364, 180, 196.364, 163.636]);
    expect(r.phiAbsDeg).toBeCloseTo(12.2727, 4);
    expect(r.pPhiAbsPct).toBeCloseTo(6.818, 3);
    expect(Math.abs(r.phiCvPct - 8.511)).toBeLessThan(1e-3);
    expect(Math.abs(r.pciPct - 15.3286)).toBeLessThan(1e-4);
  });

  it("is 0 for perfectly alternating, perfectly regular ICs", () => {
    const r = phaseCoordinationIndex(strides, [0.55, 1.65, 2.75, 3.85])!;
    expect(r.pciPct).toBeCloseTo(0, 10);
  });

  it("skips reference strides without exactly one other-leg IC and is null with fewer than two phases", () => {
    const r = phaseCoordinationIndex(strides, [0.6, 1.65, 1.7, 2.8])!;
    expect(r.phiDeg.map((p) => +p.toFixed(3))).toEqual([196.364, 196.364]);
    expect(phaseCoordinationIndex(strides, [0.6, 1.65, 1.7])).toBeNull();
    expect(phaseCoordinationIndex(strides.slice(0, 1), [0.6])).toBeNull();
  });

  it("does not fold φ into [0°, 180°] (folding biases PCI; docs/methods.md#phase-coordination-index)", () => {
    const r = phaseCoordinationIndex(strides, [0.9, 2.0, 3.1, 4.2])!;
    expect(r.phiDeg.every((p) => p > 180)).toBe(true);
  });
});

describe("gaitAsymmetryPct(swingL, swingR)", () => {
  it("GA(0.38, 0.42) = 10.0083 (Yogev 2007 formula, Exp Brain Res 177:336; docs/methods.md#gait-asymmetry)", () => {
    expect(Math.abs(gaitAsymmetryPct(0.38, 0.42)! - 10.0083)).toBeLessThan(1e-4);
    expect(gaitAsymmetryPct(0.42, 0.38)).toBeCloseTo(gaitAsymmetryPct(0.38, 0.42)!, 12);
  });
  it("is 0 for equal swings and null for missing or non-positive ones", () => {
    expect(gaitAsymmetryPct(0.4, 0.4)).toBe(0);
    expect(gaitAsymmetryPct(null, 0.4)).toBeNull();
    expect(gaitAsymmetryPct(0, 0.4)).toBeNull();
  });
});

describe("mean and standardDeviation: one empty-input policy (null where undefined)", () => {
  it("match NumPy mean and std(ddof=1) of the stride times [1.10, 1.12, 1.08, 1.11, 1.09, 1.10] s to 1e-12", () => {
    // np.mean → 1.0999999999999999, np.std(ddof=1) → 0.014142135623730963 (NumPy; the clinical
    // reliability fixtures hold the same values).
    const v = [1.1, 1.12, 1.08, 1.11, 1.09, 1.1];
    expect(Math.abs(mean(v)! - 1.0999999999999999)).toBeLessThan(1e-12);
    expect(Math.abs(standardDeviation(v, 1)! - 0.014142135623730963)).toBeLessThan(1e-12);
  });

  it("is null for no values, and the SD for n ≤ ddof; NaN propagates rather than being dropped", () => {
    expect(mean([])).toBeNull();
    expect(standardDeviation([], 0)).toBeNull();
    expect(standardDeviation([2.5], 1)).toBeNull();
    expect(standardDeviation([2.5], 0)).toBe(0);
    expect(mean([1, Number.NaN])).toBeNaN();
  });
});

describe("coefficientOfVariationPct(values, ddof)", () => {
  it("CV [1.10, 1.12, 1.08, 1.11, 1.09, 1.10] s = 1.2856 % with ddof 1 (docs/methods.md#worked-examples)", () => {
    expect(Math.abs(coefficientOfVariationPct([1.1, 1.12, 1.08, 1.11, 1.09, 1.1], 1)! - 1.2856)).toBeLessThan(1e-4);
  });
  it("is null for fewer than two values and for a zero mean", () => {
    expect(coefficientOfVariationPct([1.1])).toBeNull();
    expect(coefficientOfVariationPct([])).toBeNull();
    expect(coefficientOfVariationPct([1, -1])).toBeNull();
    expect(standardDeviation([1, 2, 3], 0)).toBeCloseTo(Math.sqrt(2 / 3), 12);
  });
});

describe("buildStrides + strideMetrics — temporal worked example (docs/methods.md#worked-examples)", () => {
  // IC_L 0 / 1.10 s, FC_L 0.66 s, IC_R 0.55 s, FC_R 0.11 s → stance 60 %, DS 20 %, 109.0909 steps/min.
  // Repeated for several strides so the bout-edge rule leaves steady strides in the middle.
  const k = 8;
  const left = { initialContactsS: [] as number[], finalContactsS: [] as number[], midSwingsS: [] };
  const right = { initialContactsS: [] as number[], finalContactsS: [] as number[], midSwingsS: [] };
  for (let i = 0; i <= k; i++) {
    left.initialContactsS.push(1.1 * i);
    left.finalContactsS.push(1.1 * i + 0.66);
    right.initialContactsS.push(1.1 * i + 0.55);
    right.finalContactsS.push(1.1 * i + 0.11);
  }
  const ctx = { bouts: [{ startS: -1, endS: 100 }], turns: [], invalidSpans: [] };
  const strides: Stride[] = [...buildStrides("left", left, right, ctx), ...buildStrides("right", right, left, ctx)];

  it("gives stance 60 %, swing 40 %, double support 20 % and cadence 109.0909 steps/min (1e-6)", () => {
    const m = strideMetrics(strides);
    expect(m.stancePct.left!).toBeCloseTo(60, 6);
    expect(m.swingPct.left!).toBeCloseTo(40, 6);
    expect(m.stancePct.right!).toBeCloseTo(60, 6);
    expect(m.doubleSupportPct!).toBeCloseTo(20, 6);
    expect(m.cadenceStepsPerMin!).toBeCloseTo(109.0909, 4);
    expect(m.strideTimeMeanS!).toBeCloseTo(1.1, 9);
    expect(m.stepTimeMeanS.left!).toBeCloseTo(0.55, 9);
  });

  it("leaves out the first and last stride of each side per bout", () => {
    // The very first left stride has no preceding right IC (no opening step): that is the bout's
    // edge, not an event-order fault, so it counts as the edge and the next stride stays steady.
    expect(strides.filter((s) => s.excludedReason === "bout-edge").map((s) => [s.side, Number(s.icS.toFixed(2))])).toEqual([
      ["left", 0],
      ["left", 7.7],
      ["right", 0.55],
      ["right", 8.25],
    ]);
    expect(strides.filter((s) => s.excludedReason === "event-order")).toEqual([]);
    expect(strides.filter((s) => s.steady).length).toBe(2 * k - 4);
  });

  it("excludes strides near turns, across invalid spans or short gaps, outside 0.25–6 s and with bad event order", () => {
    const withTurn = buildStrides("left", left, right, { ...ctx, turns: [{ startS: 4.5, endS: 4.6 }] });
    expect(withTurn.filter((s) => s.excludedReason === "turn").map((s) => s.icS.toFixed(1))).toEqual(["3.3", "4.4", "5.5"]);
    const withGap = buildStrides("left", left, right, { ...ctx, invalidSpans: [{ startS: 2.3, endS: 2.4 }] });
    expect(withGap.find((s) => s.excludedReason === "invalid-span")!.icS).toBeCloseTo(2.2, 9);
    const withShortGap = buildStrides("left", left, right, { ...ctx, gapSpans: [{ startS: 3.35, endS: 3.45 }] });
    expect(withShortGap.filter((s) => s.excludedReason === "gap").map((s) => s.icS.toFixed(1))).toEqual(["3.3"]);
    // The fixed physiological limits only catch what no walk produces (a 6.5 s "stride" is a pause).
    const pause = buildStrides("left", { ...left, initialContactsS: [0, 6.5, 7.6] }, null, ctx);
    expect(pause[0]!.excludedReason).toBe("out-of-range");
    const tooShort = buildStrides("left", { ...left, initialContactsS: [0, 0.2, 1.3] }, null, ctx);
    expect(tooShort[0]!.excludedReason).toBe("out-of-range");
    const stray = buildStrides("left", left, { ...right, initialContactsS: [...right.initialContactsS, 3.25].sort((a, b) => a - b) }, ctx);
    expect(stray.find((s) => Math.abs(s.icS - 3.3) < 1e-9)!.excludedReason).toBe("event-order");
    // Without final contacts the ICs still time the strides: they stay steady for cadence and stride
    // time and carry no stance, swing or double support.
    const noFc = buildStrides("left", { ...left, finalContactsS: [] }, right, ctx);
    const kept = noFc.filter((s) => s.steady);
    expect(kept.length).toBeGreaterThan(0);
    expect(kept.every((s) => s.finalContactRejected === true && s.stancePct === null && s.swingPct === null && s.doubleSupportPct === null)).toBe(true);
    const m = strideMetrics(noFc);
    expect(m.strideTimeMeanS).toBeCloseTo(1.1, 9);
    expect(m.stancePct.left).toBeNull();
    // An FC that falls before the other leg's IC breaks the order: same treatment.
    const earlyFc = buildStrides("left", { ...left, finalContactsS: left.finalContactsS.map((t) => t - 0.3) }, right, ctx);
    expect(earlyFc.filter((s) => s.steady).every((s) => s.finalContactRejected === true && s.stanceTimeS === null)).toBe(true);
  });
});

describe("detrendedFluctuation(series) — Hausdorff 1995 method", () => {
  // Deterministic PRNG + Box–Muller so the check is reproducible.
  function gaussian(seed: number, n: number): Float64Array {
    let s = seed >>> 0;
    const u = () => {
      s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
      return (s + 0.5) / 4294967296;
    };
    const out = new Float64Array(n);
    for (let i = 0; i < n; i++) out[i] = Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
    return out;
  }

  it("α of white noise (N 512) is 0.5 ± 0.1 on average over 20 seeds (docs/methods.md#dfa-monte-carlo: 0.532 ± 0.037)", () => {
    const alphas = Array.from({ length: 20 }, (_, k) => detrendedFluctuation(gaussian(k + 1, 512))!.alpha);
    const m = alphas.reduce((a, b) => a + b, 0) / alphas.length;
    expect(Math.abs(m - 0.5)).toBeLessThan(0.1);
  });

  it("α of a random walk (N 512) is 1.5 ± 0.15 on average over 20 seeds (docs/methods.md#dfa-monte-carlo: 1.490 ± 0.062)", () => {
    const alphas = Array.from({ length: 20 }, (_, k) => {
      const g = gaussian(100 + k, 512);
      for (let i = 1; i < g.length; i++) g[i] = g[i]! + g[i - 1]!;
      return detrendedFluctuation(g)!.alpha;
    });
    const m = alphas.reduce((a, b) => a + b, 0) / alphas.length;
    expect(Math.abs(m - 1.5)).toBeLessThan(0.15);
  });

  it("returns null with a reason below 256 strides, and α from 256 on", () => {
    const short = dfaAlphaOrReason(Array.from(gaussian(7, DFA_MIN_STRIDES - 1)));
    expect(short.alpha).toBeNull();
    expect(short.reason).toMatch(/has 255 strides.*at least 256/);
    expect(short.strideCount).toBe(255);
    expect(short.uncertainty).toBeNull();
    const enough = dfaAlphaOrReason(Array.from(gaussian(7, DFA_MIN_STRIDES), (v) => 1.1 + 0.02 * v));
    expect(enough.alpha).not.toBeNull();
    expect(enough.strideCount).toBe(256);
    // Below the ≈ 600 strides advised for a stable α (Hausdorff 1997) the value comes with a caution
    // and the fit's standard error (white noise: α ≈ 0.5, SE a few hundredths over 16 box sizes).
    expect(enough.reason).toMatch(/256 consecutive strides.*600/);
    expect(enough.uncertainty!).toBeGreaterThan(0);
    expect(enough.uncertainty!).toBeLessThan(0.1);
    const long = dfaAlphaOrReason(Array.from(gaussian(9, 600), (v) => 1.1 + 0.02 * v));
    expect(long.reason).toBeNull();
    expect(detrendedFluctuation([1, 2, 3])).toBeNull();
  });
});
