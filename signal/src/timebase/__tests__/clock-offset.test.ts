import { describe, expect, it } from "vitest";
import { analyze } from "../../analyze";
import type { Placement, SensorRecording } from "../../types";
import { alignLegClocks } from "../align-clocks";
import { fitDrift, MIN_DRIFT_WINDOWS } from "../clock-offset";
import { lagPeak } from "../impact-correlation";
import { resampleToGrid, type ResampledSensor } from "../resample-to-grid";
import { sessionGrid } from "../session-grid";
import { type ModelSensor, modelRecordings, type WalkModelOptions } from "./support/impact-walk-model";

// Truth comes from the walking model's clocks (support/impact-walk-model.ts), never from the rule
// under test: every sensor's clock error is a parameter of the model.

function align(recs: SensorRecording[]) {
  const grid = sessionGrid(recs);
  const sensors = new Map<Placement, ResampledSensor>();
  recs.forEach((r, i) => sensors.set(r.placement!, resampleToGrid(r, grid, i)));
  return { ...alignLegClocks(recs, grid, sensors, recs), sensors };
}

const shank = (side: "left" | "right", extra: Partial<ModelSensor> = {}): ModelSensor => ({
  placement: `${side}_shank`,
  fromLeft: side === "left" ? 6 : 1.2,
  fromRight: side === "right" ? 6 : 1.2,
  delayS: 0,
  ...extra,
});
const own = (p: Placement, fromLeft: number, fromRight: number, delayS: number, extra: Partial<ModelSensor> = {}): ModelSensor => ({ placement: p, fromLeft, fromRight, delayS, ...extra });

function walk(sensors: ModelSensor[], over: Partial<WalkModelOptions> = {}): WalkModelOptions {
  return { durationS: 200, sampleRateHz: 100, strideS: 1.1, stepFraction: 0.5, jitterS: 0.03, walkFromS: 10, walkToS: 190, seed: 7, sensors, ...over };
}

describe("lagPeak", () => {
  it("puts the sub-bin vertex of a sampled parabola where it is (the [1 2 1] smoothing keeps a parabola's vertex)", () => {
    // r(k) = 1 − 0.01·(k − 10.3)² over k = 0…20 (lag 0 at k = 10): vertex at +0.3 bins.
    const r = Float64Array.from({ length: 21 }, (_, k) => 1 - 0.01 * (k - 10.3) ** 2);
    const p = lagPeak(r, 3)!;
    expect(p.lagBins).toBeCloseTo(0.3, 9);
    expect(p.runnerUp).toBe(0); // a single peak: no other local maximum
  });
});

describe("fitDrift", () => {
  it("recovers a straight-line drift exactly and keeps it when it matters", () => {
    const pts = Array.from({ length: 10 }, (_, i) => ({ centreS: 60 + 120 * i, offsetS: 0.02 + (0.003 / 60) * (60 + 120 * i) }));
    const fit = fitDrift(pts)!;
    expect(fit.corrected).toBe(true);
    expect(fit.driftSPerS * 60_000).toBeCloseTo(3, 9); // ms per minute
    expect(fit.offsetS).toBeCloseTo(0.02 + (0.003 / 60) * fit.centreS, 9);
  });

  it("keeps a constant offset (median) when the windows scatter without a trend or are too few", () => {
    const scatter = [0.01, -0.004, 0.006, -0.002, 0.004, 0.0, 0.008, -0.006].map((o, i) => ({ centreS: 60 + 120 * i, offsetS: 0.05 + o }));
    const fit = fitDrift(scatter)!;
    expect(fit.corrected).toBe(false);
    expect(fit.offsetS).toBeCloseTo(0.052, 9); // median of the eight values
    expect(fitDrift(scatter.slice(0, MIN_DRIFT_WINDOWS - 1))!.corrected).toBe(false);
    expect(fitDrift([])).toBeNull();
  });
});

describe("leg clock alignment on the walking model", () => {
  it("recovers +80 ms on the right shank through the lower back, whatever the back's own clock", () => {
    const est = align(
      modelRecordings(walk([shank("left"), shank("right", { offsetS: 0.08 }), own("lower_back", 2, 2, 0.01, { offsetS: -0.05 })])),
    );
    expect(est.offsetS! * 1000).toBeCloseTo(80, -1); // |error| < 5 ms
    expect(Math.abs(est.offsetS! - 0.08)).toBeLessThan(0.005);
    expect(est.quality.map((q) => q.code)).toEqual(["clock-offset"]);
    expect(est.quality[0]!.placement).toBe("right_shank");
  });

  it("recovers −120 ms at 200 Hz with asymmetric steps through the two wrists", () => {
    const recs = modelRecordings(
      walk(
        [shank("left"), shank("right", { offsetS: -0.12 }), own("left_wrist", 0.8, 0.8, 0.02), own("right_wrist", 0.8, 0.8, 0.025, { offsetS: 0.03 })],
        { sampleRateHz: 200, stepFraction: 0.42, strideS: 1.3 },
      ),
    );
    const est = align(recs);
    expect(Math.abs(est.offsetS! + 0.12)).toBeLessThan(0.005);
  });

  it("recovers +60 ms through two wrists whose own clocks are off by +200 and −200 ms (a bridge's clock is no better than a leg's)", () => {
    const recs = modelRecordings(
      walk([shank("left"), shank("right", { offsetS: 0.06 }), own("left_wrist", 0.8, 0.8, 0.02, { offsetS: 0.2 }), own("right_wrist", 0.8, 0.8, 0.02, { offsetS: -0.2 })]),
    );
    const est = align(recs);
    expect(Math.abs(est.offsetS! - 0.06)).toBeLessThan(0.005);
    expect(est.quality.map((q) => q.code)).toEqual(["clock-offset"]);
  });

  it("agrees with a zero offset on synchronous clocks (no clock-offset item)", () => {
    const est = align(modelRecordings(walk([shank("left"), shank("right"), own("lower_back", 2, 2, 0.01)], { stepFraction: 0.45 })));
    expect(Math.abs(est.offsetS!)).toBeLessThan(0.005);
    expect(est.quality).toEqual([]);
  });

  it("finds and corrects a drift of 3 ms/min over a 20-minute walk", () => {
    const drift = 0.003 / 60;
    const recs = modelRecordings(
      walk([shank("left"), shank("right", { offsetS: 0.02, driftSPerS: drift }), own("lower_back", 2, 2, 0.01)], { durationS: 1220, walkToS: 1210 }),
    );
    const est = align(recs);
    expect(est.driftMsPerMin!).toBeGreaterThan(2.5);
    expect(est.driftMsPerMin!).toBeLessThan(3.5);
    expect(est.quality[0]!.message).toMatch(/drifting/);
    // The corrected right shank now matches the model's time: its mid-session offset is taken out.
    const grid = sessionGrid(recs);
    expect(est.offsetS!).toBeGreaterThan(0.02 + drift * 0.4 * grid.durationS);
    expect(est.offsetS!).toBeLessThan(0.02 + drift * 0.6 * grid.durationS);
  });

  it("says the clocks are unverified with the shanks alone, without walking, or when the bridge feels nothing", () => {
    const shanksOnly = align(modelRecordings(walk([shank("left"), shank("right", { offsetS: 0.08 })])));
    expect(shanksOnly.offsetS).toBeNull();
    expect(shanksOnly.quality.map((q) => q.code)).toEqual(["clock-unverified"]);
    const standing = align(modelRecordings(walk([shank("left"), shank("right"), own("lower_back", 2, 2, 0.01)], { walkFromS: 300, walkToS: 300 })));
    expect(standing.quality.map((q) => q.code)).toEqual(["clock-unverified"]);
    const numb = align(modelRecordings(walk([shank("left"), shank("right", { offsetS: 0.08 }), own("lower_back", 0, 0, 0)])));
    expect(numb.offsetS).toBeNull();
    expect(numb.quality.map((q) => q.code)).toEqual(["clock-unverified"]);
  });

  it("analyze() reports the corrected offset and its events follow the model's clock", () => {
    const sensors = [shank("left"), shank("right"), own("lower_back", 2, 2, 0.01)];
    const synced = analyze(modelRecordings(walk(sensors)));
    const off = analyze(modelRecordings(walk([sensors[0]!, shank("right", { offsetS: 0.08 }), sensors[2]!])));
    const item = off.quality.find((q) => q.code === "clock-offset");
    expect(item?.placement).toBe("right_shank");
    expect(item?.message).toMatch(/corrected by \+(7[6-9]|8[0-4]) ms/);
    expect(synced.quality.some((q) => q.code === "clock-offset" || q.code === "clock-unverified")).toBe(false);
    const a = synced.events.right.initialContacts;
    const b = off.events.right.initialContacts;
    expect(a.length).toBeGreaterThan(60);
    const matched = a.filter((t) => b.some((u) => Math.abs(u - t) <= 0.01)).length;
    expect(matched / a.length).toBeGreaterThanOrEqual(0.95);
  });
});
