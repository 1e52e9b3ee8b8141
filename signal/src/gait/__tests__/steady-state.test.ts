import { describe, expect, it } from "vitest";
import type { Stride } from "../../types";
import { coefficientOfVariationPct } from "../descriptive";
import { HAMPEL_K, labelSteadyState, MAD_TO_SD, median, MIN_BAND_FRACTION, pooledRobustSdS, steadyBand } from "../steady-state";
import { strideMetrics } from "../stride-metrics";
import { buildSessionStrides, gateSteadyStateInPlace } from "../strides";
import { pacedWalk } from "./support/pace-model";

const oneBout = (startS: number, endS: number) => ({ bouts: [{ startS, endS }], turns: [], invalidSpans: [] });

describe("median / pooledRobustSdS / steadyBand / labelSteadyState", () => {
  it("median of odd and even lists, null when empty", () => {
    expect(median([3, 1, 2])).toBe(2);
    expect(median([4, 1, 3, 2])).toBe(2.5);
    expect(median([])).toBeNull();
  });

  it("robust SD is 1.4826·MAD about each bout's own median, so a change of pace does not widen it", () => {
    // Hand-computed: deviations |x − bout median| = [0.02, 0, 0.02] and [0.03, 0, 0.03] → MAD 0.02.
    expect(pooledRobustSdS([[0.98, 1.0, 1.02], [1.47, 1.5, 1.53]])!).toBeCloseTo(MAD_TO_SD * 0.02, 12);
    expect(pooledRobustSdS([])).toBeNull();
  });

  it("band = median ± max(3 robust SDs, 3 × 1.94 % of the median)", () => {
    expect(steadyBand([1, 1, 1], 0)).toEqual({ medianS: 1, halfWidthS: MIN_BAND_FRACTION });
    expect(steadyBand([1, 1, 1], 0.05)!.halfWidthS).toBeCloseTo(HAMPEL_K * 0.05, 12);
    expect(steadyBand([], 0.05)).toBeNull();
  });

  it("leading and trailing runs outside the band are unsteady, an isolated outlier is out-of-range", () => {
    const band = { medianS: 1, halfWidthS: 0.06 };
    expect(labelSteadyState([1.5, 1.2, 1.0, 1.01, 1.3, 0.99, 1.0, 1.1, 1.2], band)).toEqual([
      "unsteady",
      "unsteady",
      "steady",
      "steady",
      "out-of-range",
      "steady",
      "steady",
      "unsteady",
      "unsteady",
    ]);
    expect(labelSteadyState([], band)).toEqual([]);
    // Nothing inside the band: every stride is part of one unsteady run.
    expect(labelSteadyState([2, 2], band)).toEqual(["unsteady", "unsteady"]);
  });
});

describe("buildSessionStrides — steady state on a pace model (truth from the model, not from the rule)", () => {
  // Speeding up from standing (first strides 60 % slower, time constant 5 s) and slowing to a stop
  // (last strides 40 % slower, 3 s), 2 % stride-to-stride variation: the shape of a belt start-up or
  // of the first and last metres of a home walk.
  const walk = pacedWalk({ strides: 120, steadyStrideTimeS: 1.0, cv: 0.02, startExcess: 0.6, startTauS: 5, endExcess: 0.4, endTauS: 3, seed: 21 });
  const strides = buildSessionStrides(walk.left, walk.right, oneBout(-0.1, walk.endS + 0.1));
  const leftOf = (icS: number) => strides.find((s) => s.side === "left" && Math.abs(s.icS - icS) < 1e-9)!;

  it("labels the model's ramp strides (excess > 15 %) unsteady at both ends", () => {
    const ramp = walk.leftStrides.slice(1, -1).filter((s) => s.excess > 0.15);
    expect(ramp.length).toBeGreaterThan(6);
    for (const r of ramp) expect(leftOf(r.icS).excludedReason, `stride at ${r.icS.toFixed(2)} s`).toBe("unsteady");
    const first = strides.filter((s) => s.excludedReason === "unsteady");
    expect(first.some((s) => s.icS < 5)).toBe(true);
    expect(first.some((s) => s.icS > walk.endS - 5)).toBe(true);
  });

  it("keeps the model's steady part (excess < 1 %) and its CV ≈ the model's own (± 0.3 points), not the ramp-inflated one", () => {
    const steadyTruth = walk.leftStrides.filter((s) => s.excess < 0.01);
    const kept = steadyTruth.filter((s) => leftOf(s.icS)?.steady).length;
    expect(kept / steadyTruth.length).toBeGreaterThan(0.97);
    // Truth: both legs' model stride times inside the model's steady part, pooled (ddof 1).
    const from = steadyTruth[0]!.icS;
    const to = steadyTruth[steadyTruth.length - 1]!.icS;
    const ric = walk.right.initialContactsS;
    const rightTruth = ric.slice(0, -1).flatMap((t, i) => (t >= from && ric[i + 1]! <= to + 1 ? [ric[i + 1]! - t] : []));
    const truthCv = coefficientOfVariationPct([...steadyTruth.map((s) => s.strideTimeS), ...rightTruth])!;
    const m = strideMetrics(strides);
    expect(Math.abs(m.strideTimeCvPct! - truthCv)).toBeLessThan(0.3);
    // What the old rule (bout edges only) would have reported: the ramps inflate it well past 4 %.
    const edgesOnly = strides.filter((s) => s.excludedReason !== "bout-edge").map((s) => s.strideTimeS);
    expect(coefficientOfVariationPct(edgesOnly)!).toBeGreaterThan(4);
    expect(m.counts.strideTimeCvPct).toBe(strides.filter((s) => s.steady).length);
  });

  it("keeps a 40 steps/min walk (3.2 s strides, 3 % CV): only the bout edges go", () => {
    const slow = pacedWalk({ strides: 30, steadyStrideTimeS: 3.2, cv: 0.03, seed: 5 });
    const s = buildSessionStrides(slow.left, slow.right, oneBout(-0.1, slow.endS + 0.1));
    const excluded = s.filter((x) => !x.steady).map((x) => x.excludedReason);
    expect(excluded.filter((r) => r !== "bout-edge").length).toBeLessThanOrEqual(1);
    const m = strideMetrics(s);
    expect(m.cadenceStepsPerMin!).toBeGreaterThan(35);
    expect(m.cadenceStepsPerMin!).toBeLessThan(40);
    expect(m.strideTimeMeanS!).toBeGreaterThan(3.0);
  });

  it("two bouts at different paces: pooled CV ≈ the within-bout 2 %, not the ≈ 17 % of all strides pooled", () => {
    const a = pacedWalk({ strides: 60, steadyStrideTimeS: 1.0, cv: 0.02, seed: 31 });
    const b = pacedWalk({ startS: a.endS + 20, strides: 60, steadyStrideTimeS: 1.4, cv: 0.02, seed: 32 });
    const join = (x: typeof a.left, y: typeof a.left) => ({
      initialContactsS: [...x.initialContactsS, ...y.initialContactsS],
      finalContactsS: [...x.finalContactsS, ...y.finalContactsS],
      midSwingsS: [],
    });
    const ctx = {
      bouts: [
        { startS: -0.1, endS: a.endS + 0.1 },
        { startS: a.endS + 19.9, endS: b.endS + 0.1 },
      ],
      turns: [],
      invalidSpans: [],
    };
    const s = buildSessionStrides(join(a.left, b.left), join(a.right, b.right), ctx);
    expect(new Set(s.filter((x) => x.steady).map((x) => x.boutIndex))).toEqual(new Set([0, 1]));
    // The stride across the pause lies in no bout.
    expect(s.find((x) => x.side === "left" && x.icS === a.endS)!.boutIndex).toBe(-1);
    const m = strideMetrics(s);
    expect(Math.abs(m.strideTimeCvPct! - 2)).toBeLessThan(0.5);
    const all = s.filter((x) => x.steady).map((x) => x.strideTimeS);
    expect(coefficientOfVariationPct(all)!).toBeGreaterThan(10);
    // Neither pace is gated away as an outlier of the other.
    expect(s.filter((x) => x.excludedReason === "out-of-range" || x.excludedReason === "unsteady").length).toBeLessThanOrEqual(4);
  });

  it("a stride across an interpolated gap is reported as 'gap' and kept out of the metrics", () => {
    const w = pacedWalk({ strides: 40, steadyStrideTimeS: 1.1, cv: 0.02, seed: 41 });
    const target = w.leftStrides[20]!;
    const gap = { startS: target.icS + 0.3, endS: target.icS + 0.4 };
    const s = buildSessionStrides(w.left, w.right, { ...oneBout(-0.1, w.endS + 0.1), gapSpans: [gap] });
    const hit = s.filter((x) => x.excludedReason === "gap");
    expect(hit.length).toBeGreaterThanOrEqual(1);
    for (const x of hit) expect(x.icS < gap.endS && x.nextIcS > gap.startS).toBe(true);
    expect(s.filter((x) => x.steady && x.icS < gap.endS && x.nextIcS > gap.startS)).toEqual([]);
  });

  it("a leg flagged unreliable: its strides are reported, the other leg is measured on its own events", () => {
    const w = pacedWalk({ strides: 50, steadyStrideTimeS: 1.0, cv: 0.02, seed: 51 });
    // The unreliable leg's ICs land late and at random, as from a sensor twisting round the leg:
    // they must not push the good leg's strides out through the order checks.
    const z = pacedWalk({ strides: 50, steadyStrideTimeS: 1.0, cv: 0.2, seed: 52 });
    const badLeft = { ...w.left, initialContactsS: w.left.initialContactsS.map((t, i) => t + 0.25 + 0.1 * (z.leftStrides[i]?.strideTimeS ?? 1)) };
    const s = buildSessionStrides(badLeft, w.right, { ...oneBout(-0.1, w.endS + 1), unreliableSides: ["left"] });
    expect(s.filter((x) => x.side === "left").every((x) => x.excludedReason === "unreliable-sensor" && !x.steady)).toBe(true);
    const right = s.filter((x) => x.side === "right");
    expect(right.filter((x) => x.steady).length).toBeGreaterThanOrEqual(right.length - 3);
    expect(right.every((x) => x.stepTimeS === null && x.doubleSupportPct === null)).toBe(true);
    const m = strideMetrics(s);
    // No steps from one leg: cadence = 120 / mean stride (docs/methods.md#stride-step-and-cadence),
    // counted in strides.
    expect(m.cadenceStepsPerMin!).toBeCloseTo(120 / m.strideTimeMeanS!, 9);
    expect(m.counts.cadenceStepsPerMin).toBe(right.filter((x) => x.steady).length);
    // Truth: the model's own right-leg stride times (the step model halves their variance: ≈ 1.4 %).
    const ric = w.right.initialContactsS;
    const truthCv = coefficientOfVariationPct(ric.slice(2, -1).map((t, i) => t - ric[i + 1]!))!;
    expect(Math.abs(m.strideTimeCvPct! - truthCv)).toBeLessThan(0.2);
    expect(m.stepTimeAsymmetryPct).toBeNull();
    expect(m.gaitAsymmetryPct).toBeNull();
    expect(m.swingTimeCvPct.left).toBeNull();
    // Without the flag the same late ICs would spoil the right leg's checks.
    const unflagged = buildSessionStrides(badLeft, w.right, oneBout(-0.1, w.endS + 1));
    expect(unflagged.filter((x) => x.side === "right" && x.excludedReason === "event-order").length).toBeGreaterThan(10);
  });

  it("empty input: no strides, null metrics, zero counts", () => {
    expect(buildSessionStrides(null, null, oneBout(0, 10))).toEqual([]);
    const none: Stride[] = [];
    gateSteadyStateInPlace(none);
    const m = strideMetrics(none);
    expect(m.strideTimeCvPct).toBeNull();
    expect(m.cadenceStepsPerMin).toBeNull();
    expect(m.swingTimeCvPct).toEqual({ left: null, right: null });
    expect(m.counts.strideTimeCvPct).toBe(0);
  });
});
