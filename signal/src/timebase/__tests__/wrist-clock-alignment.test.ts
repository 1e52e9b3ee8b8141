import { describe, expect, it } from "vitest";
import { analyze } from "../../analyze";
import { synthesizeKinematicSession, type KinematicOptions } from "../../synth";
import type { Placement, SensorRecording, Side } from "../../types";
import { alignLegClocks } from "../align-clocks";
import { alignWristClocks } from "../align-wrist-clocks";
import { resampleToGrid, type ResampledSensor } from "../resample-to-grid";
import { sessionGrid } from "../session-grid";
import { modelRecordings, type ModelSensor } from "./support/impact-walk-model";

// Truth comes from the models' clocks: the kinematic generator's per-device clock error (its wrists
// feel every heel strike through the body, attenuated) and the mechanical impact model's sensors. The
// arm–leg phase truth is the model's ψ on segment angles, not anything the estimator computes.

function alignAll(recs: SensorRecording[]) {
  const grid = sessionGrid(recs);
  const sensors = new Map<Placement, ResampledSensor>();
  recs.forEach((r, i) => sensors.set(r.placement!, resampleToGrid(r, grid, i)));
  const legs = alignLegClocks(recs, grid, sensors, recs);
  const wrists = alignWristClocks(recs, grid, sensors, recs, legs);
  const offsetOf = (p: Placement) => wrists.wrists.find((w) => w.placement === p)?.offsetS ?? null;
  return { legs, wrists, offsetOf };
}

const circDiff = (a: number, b: number) => ((a - b + 540) % 360) - 180;
const pairOf = (side: Side) => (side === "left" ? "leftArmRightLeg" : "rightArmLeftLeg");

describe("wrist clock alignment on the kinematic model", () => {
  const cases: Array<[string, KinematicOptions]> = [
    ["1:1 at 1.1 s strides, left wrist +100 ms, right wrist −150 ms", { seed: 51, bouts: [{ durationS: 90 }], clockOffsetS: { left_wrist: 0.1, right_wrist: -0.15 } }],
    [
      "2:1 at 1.8 s strides, 200 Hz, mirrored right wrist, left wrist −150 ms, right wrist +100 ms, right shank +40 ms",
      { seed: 52, sampleRateHz: 200, bouts: [{ durationS: 90, strideTimeS: 1.8, romScale: 0.7 }], arms: { coupling: "2:1", wear: { right: "mirrored" } }, clockOffsetS: { left_wrist: -0.15, right_wrist: 0.1, right_shank: 0.04 } },
    ],
  ];
  for (const [name, options] of cases) {
    it(`recovers each wrist's offset within 10 ms, reports it, and the arm–leg phase stays within 15° of the model: ${name}`, () => {
      const session = synthesizeKinematicSession(options);
      const { offsetOf } = alignAll(session.recordings);
      const analysis = analyze(session.recordings, { heightCm: 172 });
      for (const side of ["left", "right"] as const) {
        const p = `${side}_wrist` as Placement;
        const truthOffset = options.clockOffsetS![p as "left_wrist"]!;
        const est = offsetOf(p);
        const truth = session.truth.arms[side]!;
        const coupling = analysis.metrics.armLeg[pairOf(side)];
        const phaseErr = circDiff(coupling.meanRelativePhaseDeg!, truth.relativePhaseDeg!);
        console.log(
          `${name} | ${p}: offset model ${(1000 * truthOffset).toFixed(0)} ms, estimated ${est === null ? "–" : (1000 * est).toFixed(1)} ms (error ${est === null ? "–" : (1000 * (est - truthOffset)).toFixed(1)} ms); ψ model ${truth.relativePhaseDeg!.toFixed(1)}° analysis ${coupling.meanRelativePhaseDeg?.toFixed(1)}° (error ${phaseErr.toFixed(1)}°), ratio ${truth.ratio}/${coupling.frequencyRatio}`,
        );
        expect(est).not.toBeNull();
        expect(Math.abs(est! - truthOffset)).toBeLessThan(0.01);
        const item = analysis.quality.find((q) => q.code === "clock-offset" && q.placement === p);
        expect(item?.message).toMatch(/corrected by [+-]\d+ ms/);
        expect(coupling.frequencyRatio).toBe(truth.ratio);
        expect(Math.abs(phaseErr)).toBeLessThan(15);
      }
      expect(analysis.quality.some((q) => q.code === "clock-unverified")).toBe(false);
    });
  }

  it("leaves synchronous wrists within 20 ms and reports no clock-offset", () => {
    const session = synthesizeKinematicSession({ seed: 53, bouts: [{ durationS: 80 }] });
    const { offsetOf } = alignAll(session.recordings);
    for (const p of ["left_wrist", "right_wrist"] as const) {
      console.log(`synchronous | ${p}: estimated ${(1000 * (offsetOf(p) ?? Number.NaN)).toFixed(1)} ms`);
      expect(offsetOf(p)).not.toBeNull();
      expect(Math.abs(offsetOf(p)!)).toBeLessThanOrEqual(0.02);
    }
    const analysis = analyze(session.recordings, { heightCm: 172 });
    expect(analysis.quality.some((q) => q.code === "clock-offset")).toBe(false);
  });

  it("leaves a wrist 30 ms off as recorded (inside the body's transmission delay) and says so", () => {
    const session = synthesizeKinematicSession({ seed: 54, bouts: [{ durationS: 80 }], clockOffsetS: { left_wrist: 0.03 } });
    const { wrists } = alignAll(session.recordings);
    const left = wrists.wrists.find((w) => w.placement === "left_wrist")!;
    expect(left.corrected).toBe(false);
    expect(Math.abs(left.offsetS! - 0.03)).toBeLessThan(0.01);
    expect(wrists.quality.some((q) => q.code === "clock-unverified" && q.placement === "left_wrist" && /left as recorded/.test(q.message))).toBe(true);
    expect(wrists.quality.some((q) => q.code === "clock-offset")).toBe(false);
  });

  it("never corrects an arm held still on a walking aid wrongly (unverified, or within 20 ms of its true clock)", () => {
    for (const offset of [0, 0.1]) {
      const session = synthesizeKinematicSession({ seed: 54, bouts: [{ durationS: 80 }], arms: { heldStill: ["left"] }, clockOffsetS: { left_wrist: offset } });
      const { offsetOf, wrists } = alignAll(session.recordings);
      const est = offsetOf("left_wrist");
      console.log(`still left arm, clock ${1000 * offset} ms | estimated ${est === null ? `unverified (${wrists.quality[0]?.message})` : `${(1000 * est).toFixed(1)} ms`}`);
      if (est === null) expect(wrists.quality.find((q) => q.placement === "left_wrist")?.code).toBe("clock-unverified");
      else expect(Math.abs(est - offset)).toBeLessThanOrEqual(0.02);
    }
  });
});


describe("wrist clock alignment on the mechanical impact model", () => {
  const shank = (side: "left" | "right"): ModelSensor => ({ placement: `${side}_shank`, fromLeft: side === "left" ? 6 : 1.2, fromRight: side === "right" ? 6 : 1.2, delayS: 0 });
  const walk = (sensors: ModelSensor[]) => modelRecordings({ durationS: 150, sampleRateHz: 100, strideS: 1.1, stepFraction: 0.5, jitterS: 0.03, walkFromS: 10, walkToS: 140, seed: 9, sensors });

  it("recovers a wrist offset at 200 ms; a wrist that feels no strikes, or one foot's only at another time (a cane's taps), stays unverified", () => {
    const { offsetOf, wrists } = alignAll(
      walk([
        shank("left"),
        shank("right"),
        { placement: "lower_back", fromLeft: 2, fromRight: 2, delayS: 0 },
        { placement: "left_wrist", fromLeft: 0.8, fromRight: 0.8, delayS: 0, offsetS: 0.2 },
        { placement: "right_wrist", fromLeft: 0, fromRight: 0.8, delayS: 0.06 },
      ]),
    );
    expect(Math.abs(offsetOf("left_wrist")! - 0.2)).toBeLessThan(0.005);
    expect(offsetOf("right_wrist")).toBeNull();
    expect(wrists.quality.find((q) => q.placement === "right_wrist")?.code).toBe("clock-unverified");
    const numb = alignAll(walk([shank("left"), shank("right"), { placement: "lower_back", fromLeft: 2, fromRight: 2, delayS: 0 }, { placement: "left_wrist", fromLeft: 0, fromRight: 0, delayS: 0, offsetS: 0.1 }]));
    expect(numb.offsetOf("left_wrist")).toBeNull();
    expect(numb.wrists.quality.map((q) => q.code)).toEqual(["clock-unverified"]);
    // Legs that cannot be aligned to each other (their only bridges, the wrists, feel nothing): one
    // item for both wrists, nothing corrected.
    const noLegs = alignAll(walk([shank("left"), shank("right"), { placement: "left_wrist", fromLeft: 0, fromRight: 0, delayS: 0 }, { placement: "right_wrist", fromLeft: 0, fromRight: 0, delayS: 0 }]));
    expect(noLegs.legs.offsetS).toBeNull();
    expect(noLegs.wrists.wrists.every((w) => w.offsetS === null)).toBe(true);
    expect(noLegs.wrists.quality.map((q) => q.code)).toEqual(["clock-unverified"]);
    expect(noLegs.wrists.quality[0]!.message).toMatch(/left_wrist, right_wrist/);
  });

  it("finds and corrects a wrist drifting 3 ms/min over a 20-minute walk (and none on a steady wrist clock)", () => {
    const drift = 0.003 / 60;
    const recs = modelRecordings({
      durationS: 1220,
      sampleRateHz: 100,
      strideS: 1.1,
      stepFraction: 0.5,
      jitterS: 0.03,
      walkFromS: 10,
      walkToS: 1210,
      seed: 4,
      sensors: [
        shank("left"),
        shank("right"),
        { placement: "left_wrist", fromLeft: 0.8, fromRight: 0.8, delayS: 0, offsetS: 0.05, driftSPerS: drift },
        { placement: "right_wrist", fromLeft: 0.8, fromRight: 0.8, delayS: 0, offsetS: -0.03 },
      ],
    });
    const { wrists } = alignAll(recs);
    const left = wrists.wrists.find((w) => w.placement === "left_wrist")!;
    const right = wrists.wrists.find((w) => w.placement === "right_wrist")!;
    console.log(`drifting wrist: ${left.driftMsPerMin?.toFixed(2)} ms/min (model 3), offset at the fit's centre ${(1000 * left.offsetS!).toFixed(1)} ms; steady wrist ${(1000 * right.offsetS!).toFixed(1)} ms (model −30), drift ${right.driftMsPerMin}`);
    expect(left.driftMsPerMin!).toBeGreaterThan(2.5);
    expect(left.driftMsPerMin!).toBeLessThan(3.5);
    expect(wrists.quality.find((q) => q.placement === "left_wrist")?.message).toMatch(/drifting/);
    // The fit's centre lies mid-session: the offset there is the model's offset at about 600 s.
    expect(left.offsetS!).toBeGreaterThan(0.05 + drift * 400);
    expect(left.offsetS!).toBeLessThan(0.05 + drift * 800);
    expect(right.driftMsPerMin).toBeNull();
    expect(Math.abs(right.offsetS! + 0.03)).toBeLessThan(0.005);
  });
});
