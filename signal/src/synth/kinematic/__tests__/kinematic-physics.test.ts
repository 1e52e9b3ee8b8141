import { describe, expect, it } from "vitest";
import type { SensorRecording, Side } from "../../../types";
import { synthesizeKinematicSession } from "../synthesize-kinematic-session";
import type { KinematicOptions, KinematicSession } from "../types";

// Physics of the kinematic generator itself. Sources: a rigid segment that returns to its posture
// has zero net rotation per stride (kinematics); the tibia advances over the planted foot in stance,
// so the shank rotates backward (negative here) between contacts and forward in swing (Perry &
// Burnfield 2010, rockers; docs/methods.md#shank-kinematics-over-a-stride); an accelerometer at
// rest reads the specific force 9.81 m/s² upward (standard gravity, the value the generator uses).

const QUIET = { gyroDegS: 0, accMs2: 0, gyroBiasDegS: 0 };
const SIDES: Side[] = ["left", "right"];

function session(o: KinematicOptions = {}): KinematicSession {
  return synthesizeKinematicSession({ bouts: [{ durationS: 40 }], ...o });
}

function rec(s: KinematicSession, placement: string): SensorRecording {
  return s.recordings.find((r) => r.placement === placement)!;
}

/** Trapezoid integral of a recording's gyro_z from sample i0 to sample i1, degrees. */
function integrateGyroZ(r: SensorRecording, i0: number, i1: number): number {
  let sum = 0;
  for (let i = i0 + 1; i <= i1; i++) sum += 0.5 * (r.gyroZ[i - 1]! + r.gyroZ[i]!) * (r.timeS[i]! - r.timeS[i - 1]!);
  return sum;
}

const steady = (s: KinematicSession, side: Side) => s.truth[side].strides.filter((x) => !x.boutEdge && !x.containsPause);

describe("synthesizeKinematicSession(options): physics of the model", () => {
  const normal = session({ noise: QUIET });

  it("returns each shank to its starting angle over every steady stride (model within 0.5°, integrated gyro within 0.5°)", () => {
    // The sampled integral is checked without the 10–20 Hz transients, which a 100 Hz trapezoid
    // cannot integrate exactly; the transients are built with zero net rotation by construction.
    const smooth = session({ noise: { ...QUIET, impactMs2: 0, impactGyroDegS: 0, rippleDegS: 0 } });
    let strides = 0;
    for (const side of SIDES) {
      const r = rec(smooth, `${side}_shank`);
      for (const st of steady(smooth, side)) {
        const net = smooth.model.shankAngleDeg(side, st.nextIcS) - smooth.model.shankAngleDeg(side, st.icS);
        expect(Math.abs(net)).toBeLessThan(0.5);
        // Whole samples between the two ICs: compare with the model's rotation between those samples.
        const fs = smooth.truth.sampleRateHz;
        const i0 = Math.ceil(st.icS * fs);
        const i1 = Math.floor(st.nextIcS * fs);
        const sensed = integrateGyroZ(r, i0, i1);
        const modelNet = smooth.model.shankAngleDeg(side, r.timeS[i1]!) - smooth.model.shankAngleDeg(side, r.timeS[i0]!);
        expect(Math.abs(sensed - modelNet)).toBeLessThan(0.05);
        strides++;
      }
    }
    expect(strides).toBeGreaterThan(50);
  });

  it("rotates the shank backward in stance (negative, deepest in the second half of stance) and forward in swing", () => {
    for (const side of SIDES) {
      for (const st of steady(normal, side)) {
        const rate = (t: number) => normal.model.shankRateDegS(side, t);
        let stanceSum = 0;
        let stanceMin = Infinity;
        let stanceMinAt = 0;
        const n = 200;
        for (let i = 0; i < n; i++) {
          const t = st.icS + ((st.fcS - st.icS) * i) / n;
          stanceSum += rate(t);
          if (rate(t) < stanceMin) {
            stanceMin = rate(t);
            stanceMinAt = (t - st.icS) / (st.fcS - st.icS);
          }
        }
        let swingMax = -Infinity;
        for (let i = 0; i < n; i++) swingMax = Math.max(swingMax, rate(st.fcS + ((st.nextIcS - st.fcS) * i) / n));
        expect(stanceSum / n).toBeLessThan(0);
        expect(stanceMin).toBeLessThan(-50);
        expect(stanceMinAt).toBeGreaterThan(0.5);
        expect(swingMax).toBeGreaterThan(200);
      }
    }
  });

  it("sets contacts by the schedule, not at minima of ω: the nearest local minimum of the model's shank rate is ≥ 20 ms from most ICs", () => {
    const distancesMs: number[] = [];
    for (const side of SIDES) {
      for (const st of steady(normal, side)) {
        const rate = (t: number) => normal.model.shankRateDegS(side, t);
        let nearest = Infinity;
        for (let t = st.icS - 0.2; t <= st.icS + 0.2; t += 0.001) {
          if (rate(t) < rate(t - 0.001) && rate(t) <= rate(t + 0.001)) nearest = Math.min(nearest, Math.abs(t - st.icS));
        }
        distancesMs.push(1000 * nearest);
      }
    }
    distancesMs.sort((a, b) => a - b);
    expect(distancesMs[distancesMs.length >> 1]!).toBeGreaterThanOrEqual(20);
  });

  it("reads 9.81 m/s² of specific force at rest, +y up on a standard mount, −y on an upside-down wrist", () => {
    const s = session({
      noise: { ...QUIET, standingSwayDegS: 0 },
      arms: { wear: { right: "upside-down" } },
      placements: ["left_shank", "right_shank", "left_wrist", "right_wrist", "lower_back"],
    });
    expect(s.recordings).toHaveLength(5);
    for (const r of s.recordings) {
      let mag = 0;
      let y = 0;
      let count = 0;
      for (let i = 0; i < r.timeS.length && r.timeS[i]! < 3; i++) {
        mag += Math.hypot(r.accX[i]!, r.accY[i]!, r.accZ[i]!);
        y += r.accY[i]!;
        count++;
      }
      expect(mag / count).toBeCloseTo(9.81, 2);
      expect(y / count).toBeCloseTo(r.placement === "right_wrist" ? -9.81 : 9.81, 2);
    }
  });

  it("sways slowly while standing (gyro SD 0.5–5 °/s, not exactly 0)", () => {
    const s = session({ noise: { ...QUIET, standingSwayDegS: 2 } });
    const r = rec(s, "left_shank");
    const xs: number[] = [];
    for (let i = 0; i < r.timeS.length && r.timeS[i]! < 3.5; i++) xs.push(r.gyroZ[i]!);
    const m = xs.reduce((a, b) => a + b, 0) / xs.length;
    const sd = Math.sqrt(xs.reduce((a, b) => a + (b - m) ** 2, 0) / (xs.length - 1));
    expect(sd).toBeGreaterThan(0.5);
    expect(sd).toBeLessThan(5);
  });

  it("moves the pelvis forward: stride length = speed × stride time, braking after each IC and propulsion before the next", () => {
    const all = [...steady(normal, "left"), ...steady(normal, "right")];
    for (const st of all) expect(st.strideLengthM).toBeCloseTo(st.walkingSpeedMPerS * st.strideTimeS, 9);
    expect(normal.truth.summary.walkingSpeedMPerS).toBeGreaterThan(0.7);
    expect(normal.truth.summary.walkingSpeedMPerS).toBeLessThan(1.6);
    const x = (t: number) => normal.model.pelvisPositionM(t)[0];
    const accel = (t: number) => (x(t - 0.005) - 2 * x(t) + x(t + 0.005)) / 0.005 ** 2;
    const steps = [...normal.truth.left.ic, ...normal.truth.right.ic].sort((a, b) => a - b).slice(4, -4);
    let braking = 0;
    let propulsion = 0;
    for (let k = 0; k + 1 < steps.length; k++) {
      const d = steps[k + 1]! - steps[k]!;
      if (accel(steps[k]! + 0.2 * d) < 0) braking++;
      if (accel(steps[k]! + 0.8 * d) > 0) propulsion++;
    }
    expect(braking).toBe(steps.length - 1);
    expect(propulsion).toBe(steps.length - 1);
  });

  it("realises the requested stride-time CV (5 %) within sampling error", () => {
    const s = synthesizeKinematicSession({ seed: 9, bouts: [{ durationS: 150 }], strideTimeCvPct: 5, noise: QUIET });
    const cv = s.truth.summary.strideTimeCvPct;
    // SE of a CV from ≈ 260 pooled strides (half independent) ≈ 5 %/√(2·130) ≈ 0.31 points.
    expect(Math.abs(cv - 5)).toBeLessThan(1.2);
  });

  it("shifts a device's data by its clock offset while its start time stays", () => {
    const base = session({ noise: QUIET });
    const shifted = session({ noise: QUIET, clockOffsetS: { left_shank: 0.2 } });
    const a = rec(base, "left_shank");
    const b = rec(shifted, "left_shank");
    expect(b.startUtc).toBe(a.startUtc);
    let worst = 0;
    for (let i = 0; i + 20 < a.gyroZ.length; i++) worst = Math.max(worst, Math.abs(b.gyroZ[i]! - a.gyroZ[i + 20]!));
    expect(worst).toBeLessThan(0.01);
    expect(shifted.truth.clockOffsetS.left_shank).toBe(0.2);
  });

  it("puts a brief forward reversal of the shank into mid-stance with knee hyperextension, and none without", () => {
    const hyper = session({ noise: QUIET, legs: { left: { hyperextensionDeg: 12 } } });
    const reversal = (s: KinematicSession, side: Side) =>
      steady(s, side).map((st) => {
        let max = -Infinity;
        for (let i = 10; i < 90; i++) max = Math.max(max, s.model.shankRateDegS(side, st.icS + ((st.fcS - st.icS) * i) / 100));
        return max;
      });
    expect(Math.min(...reversal(hyper, "left"))).toBeGreaterThan(10);
    expect(Math.max(...reversal(hyper, "right"))).toBeLessThan(0);
    expect(Math.max(...reversal(normal, "left"))).toBeLessThan(0);
  });

  it("reduces the swing peak of a stiff knee", () => {
    const stiff = session({ noise: QUIET, legs: { right: { swingKneeScale: 0.4 } } });
    const peak = (s: KinematicSession, side: Side) => {
      const st = steady(s, side)[5]!;
      let max = -Infinity;
      for (let i = 0; i < 200; i++) max = Math.max(max, s.model.shankRateDegS(side, st.fcS + ((st.nextIcS - st.fcS) * i) / 200));
      return max;
    };
    expect(peak(stiff, "right")).toBeLessThan(0.75 * peak(stiff, "left"));
  });

  it("locks the arms to the contralateral leg at the requested phase and range, 1:1 and 2:1", () => {
    for (const coupling of ["1:1", "2:1"] as const) {
      const s = session({ noise: QUIET, arms: { coupling, relativePhaseDeg: -30, rangeDeg: { left: 36, right: 12 } } });
      for (const side of SIDES) {
        const arm = s.truth.arms[side]!;
        expect(arm.ratio).toBe(coupling === "1:1" ? 1 : 2);
        expect(Math.abs(arm.relativePhaseDeg! - -30)).toBeLessThan(3);
        expect(arm.swingRangeDeg).toBeCloseTo(side === "left" ? 36 : 12, 0);
        expect(arm.cycles).toBeGreaterThan(20);
        expect(arm.swingRangesDeg).toHaveLength(arm.cycles * (coupling === "1:1" ? 1 : 2));
      }
    }
  });

  it("holds an arm still (tremor only) and reports no ratio or phase for it; a mirrored wrist flips gyro_z", () => {
    const plain = session({ noise: QUIET });
    const s = session({ noise: QUIET, arms: { heldStill: ["left"], wear: { right: "mirrored" } } });
    expect(s.truth.arms.left!.ratio).toBeNull();
    expect(s.truth.arms.left!.relativePhaseDeg).toBeNull();
    expect(s.truth.arms.left!.swingRangeDeg).toBeLessThan(0.5);
    expect(s.truth.arms.right!.sagittalSign).toBe(-1);
    const a = rec(plain, "right_wrist");
    const b = rec(s, "right_wrist");
    let worst = 0;
    for (let i = 0; i < a.gyroZ.length; i++) worst = Math.max(worst, Math.abs(a.gyroZ[i]! + b.gyroZ[i]!));
    expect(worst).toBeLessThan(0.01);
  });

  it("carries the body's braking after each IC, propulsion before the next and the heel-strike transient to a still wrist", () => {
    const still = { heldStill: ["left", "right"] as Side[], tremor: { amplitudeDeg: 0 } };
    const calm = session({ noise: { ...QUIET, impactMs2: 0, rippleDegS: 0 }, arms: still });
    const struck = session({ noise: { ...QUIET, rippleDegS: 0 }, arms: still });
    const a = rec(calm, "left_wrist");
    const b = rec(struck, "left_wrist");
    const fs = calm.truth.sampleRateHz;
    const mean = (r: SensorRecording, t0: number, t1: number) => {
      let s = 0;
      let n = 0;
      for (let i = Math.ceil(t0 * fs); i <= Math.floor(t1 * fs); i++) {
        s += r.accX[i]!;
        n++;
      }
      return s / n;
    };
    const steps = [...calm.truth.left.ic, ...calm.truth.right.ic].sort((x, y) => x - y).slice(2, -2);
    let braking = 0;
    let propulsion = 0;
    let impacts = 0;
    for (let k = 0; k + 1 < steps.length; k++) {
      const d = steps[k + 1]! - steps[k]!;
      if (mean(a, steps[k]!, steps[k]! + 0.25 * d) < 0) braking++;
      if (mean(a, steps[k]! + 0.75 * d, steps[k + 1]!) > 0) propulsion++;
      let peak = 0;
      for (let i = Math.ceil(steps[k]! * fs); i <= Math.floor((steps[k]! + 0.04) * fs); i++) peak = Math.max(peak, Math.abs(b.accY[i]! - a.accY[i]!));
      // 25 m/s² at the striking shank × 0.08 at the wrist (project choice), sampled within 10 ms of its onset.
      if (peak > 1 && peak < 2.5) impacts++;
    }
    expect(braking, "braking").toBe(steps.length - 1);
    expect(propulsion, "propulsion").toBe(steps.length - 1);
    expect(impacts, "impacts").toBe(steps.length - 1);
  });

  it("refuses impossible settings with a RangeError", () => {
    expect(() => session({ sampleRateHz: 30 })).toThrow(RangeError);
    expect(() => session({ strideTimeS: 5 })).toThrow(RangeError);
    expect(() => session({ legs: { left: { stanceFraction: 0.4 } } })).toThrow(RangeError);
    expect(() => session({ stepFraction: 0.35, legs: { left: { stanceFraction: 0.5 } }, stanceFraction: 0.5 })).toThrow(RangeError);
    expect(() => session({ bouts: [{ durationS: 1 }] })).toThrow(RangeError);
    expect(() => session({ bouts: [{ durationS: 3.5 }] })).toThrow(/bout longer/);
    expect(() => session({ hesitations: [{ atS: 5, durationS: 1, boutIndex: 2 }] })).toThrow(RangeError);
    expect(() => session({ hesitations: [{ atS: 5, durationS: 9 }] })).toThrow(RangeError);
  });
});
