import { describe, expect, it } from "vitest";
import type { Stride } from "../../types";
import { AT_REST, integrateSagittalStride } from "../integrate-sagittal-stride";
import { sagittalPlaneSignals } from "../sagittal-plane";
import { shankLengthM, shankPendulumReset } from "../shank-pendulum";
import { strideLengthsForSide } from "../stride-lengths";
import { walkingSpeedFromStrides } from "../walking-speed";
import { planarLeg, type PlanarLegOptions } from "./support/planar-leg-model";

// Truth comes from a planar kinematic leg (support/planar-leg-model.ts): stride length and events are
// the model's parameters; the signals are derivatives of its path, not outputs of any rule tested here.

function stridesOf(icS: number[], fcS: number[]): Stride[] {
  const out: Stride[] = [];
  for (let k = 0; k + 1 < icS.length; k++) {
    const t = icS[k + 1]! - icS[k]!;
    out.push({
      side: "left",
      icS: icS[k]!,
      nextIcS: icS[k + 1]!,
      fcS: fcS[k] ?? null,
      strideTimeS: t,
      stanceTimeS: null,
      swingTimeS: null,
      stancePct: null,
      swingPct: null,
      doubleSupportPct: null,
      steady: true,
    });
  }
  return out;
}

const base: Omit<PlanarLegOptions, "segment"> = { strideTimeS: 1.1, stanceFraction: 0.62, strideLengthM: 1.3, strides: 10, sampleRateHz: 100 };

describe("strideLengthsForSide(signals, strides, fcs, options) on a planar kinematic leg", () => {
  it("recovers a foot's stride length within 1 % (mounted 30° off, tilted 3-D, 0.5 °/s gyro bias)", () => {
    const leg = planarLeg({ ...base, segment: "foot", mountRad: 0.52, tiltXRad: 0.3, tiltYRad: -0.2, gyroBiasDegS: 0.5 });
    const strides = stridesOf(leg.icS, leg.fcS);
    const res = strideLengthsForSide({ segment: "foot", ...leg }, strides, leg.fcS, { sampleRateHz: 100 });
    const lengths = res.map((r) => r.strideLengthM).filter((x): x is number => x !== null);
    expect(lengths.length).toBe(strides.length - 1); // the last stride has no FC after its closing IC
    for (const l of lengths) expect(Math.abs(l - 1.3) / 1.3).toBeLessThan(0.01);
  });

  it("recovers a shank's stride length within 3 % with the true ankle-to-sensor distance (shank not vertical at mid-stance)", () => {
    const leg = planarLeg({ ...base, segment: "shank", sensorAboveAnkleM: 0.21, mountRad: -0.3, tiltXRad: 0.25, gyroBiasDegS: 0.5 });
    const strides = stridesOf(leg.icS, leg.fcS);
    const res = strideLengthsForSide({ segment: "shank", ...leg }, strides, leg.fcS, { sampleRateHz: 100, shankSensorAboveAnkleM: 0.21 });
    const lengths = res.map((r) => r.strideLengthM).filter((x): x is number => x !== null);
    expect(lengths.length).toBe(strides.length - 1);
    for (const l of lengths) expect(Math.abs(l - 1.3) / 1.3).toBeLessThan(0.03);
  });

  it("a shank at a slow, short-stride walk (0.4 m in 1.2 s) stays within 5 %", () => {
    const leg = planarLeg({ ...base, segment: "shank", strideTimeS: 1.2, strideLengthM: 0.4, shankAtIcRad: 0.12, shankAtFcRad: -0.2, sensorAboveAnkleM: 0.2 });
    const strides = stridesOf(leg.icS, leg.fcS);
    const res = strideLengthsForSide({ segment: "shank", ...leg }, strides, leg.fcS, { sampleRateHz: 100, shankSensorAboveAnkleM: 0.2 });
    for (const r of res.slice(0, -1)) expect(Math.abs(r.strideLengthM! - 0.4) / 0.4).toBeLessThan(0.05);
  });

  it("ignoring the pendulum (shank treated as at rest at mid-stance) under-reads, so the model term matters", () => {
    const leg = planarLeg({ ...base, segment: "shank", sensorAboveAnkleM: 0.21 });
    const plane = sagittalPlaneSignals(leg.accX, leg.accY, leg.accZ, leg.gyroX, leg.gyroY, leg.gyroZ, leg.axis);
    const fs = 100;
    const i0 = Math.round(((leg.icS[2]! + leg.fcS[2]!) / 2) * fs);
    const i1 = Math.round(((leg.icS[3]! + leg.fcS[3]!) / 2) * fs);
    const naive = integrateSagittalStride(plane, fs, i0, i1, AT_REST, AT_REST, 5);
    expect(naive.strideLengthM).toBeLessThan(1.3 * 0.95);
  });

  it("rejects strides whose data are invalid, strides without an FC and turning strides", () => {
    const leg = planarLeg({ ...base, segment: "foot" });
    const strides = stridesOf(leg.icS, leg.fcS);
    strides[5]!.steady = false;
    strides[5]!.excludedReason = "turn";
    leg.valid.fill(0, Math.round(strides[3]!.icS * 100) + 20, Math.round(strides[3]!.icS * 100) + 25);
    const res = strideLengthsForSide({ segment: "foot", ...leg }, strides, leg.fcS, { sampleRateHz: 100 });
    expect(res[3]!.strideLengthM).toBeNull();
    expect(res[3]!.rejection).toBe("invalid-data");
    expect(res[res.length - 1]!.rejection).toBe("no-stance");
    expect(res[5]!).toEqual({ strideLengthM: null, rejection: "turn", resetIndices: null });
    expect(res[4]!.strideLengthM).not.toBeNull();
  });

  it("refuses a shank without an ankle-to-sensor distance", () => {
    const leg = planarLeg({ ...base, segment: "shank" });
    expect(() => strideLengthsForSide({ segment: "shank", ...leg }, [], leg.fcS, { sampleRateHz: 100 })).toThrow(RangeError);
  });
});

describe("shankPendulumReset(ω, α, r) and shankLengthM(h)", () => {
  it("gives the rigid-body velocity and reading of a point r above a fixed pivot (v = ω×r, a = α×r − ω²r)", () => {
    const s = shankPendulumReset(-1.5, -8, 0.2);
    expect(s.velocity.forward).toBeCloseTo(0.3, 12);
    expect(s.velocity.up).toBe(0);
    expect(s.specificForce.forward).toBeCloseTo(1.6, 12);
    expect(s.specificForce.up).toBeCloseTo(9.80665 - 2.25 * 0.2, 12);
  });
  it("takes the shank as 0.246·H, knee to ankle (Winter 2009, Fig. 4.1, after Drillis & Contini 1966)", () => {
    expect(shankLengthM(175)).toBeCloseTo(0.246 * 1.75, 12);
    expect(() => shankLengthM(0)).toThrow(RangeError);
  });
});

describe("walkingSpeedFromStrides(strides)", () => {
  it("is Σ length / Σ time over steady strides with a length, and counts them", () => {
    const leg = planarLeg({ ...base, segment: "foot" });
    const strides = stridesOf(leg.icS, leg.fcS);
    const res = strideLengthsForSide({ segment: "foot", ...leg }, strides, leg.fcS, { sampleRateHz: 100 });
    strides.forEach((s, i) => (s.strideLengthM = res[i]!.strideLengthM));
    strides[0]!.steady = false;
    const speed = walkingSpeedFromStrides(strides);
    expect(speed.strideCount).toBe(strides.length - 2);
    expect(speed.walkingSpeedMPerS!).toBeCloseTo(1.3 / 1.1, 2);
    expect(speed.strideLengthM!).toBeCloseTo(1.3, 2);
  });
  it("returns null with a reason when too few strides have a length, and names a missing height", () => {
    const strides = stridesOf([0, 1, 2, 3], [0.6, 1.6, 2.6]);
    expect(walkingSpeedFromStrides(strides).reason).toMatch(/only 0 of 3/);
    expect(walkingSpeedFromStrides(strides, { "no-height": 3 }).reason).toMatch(/height not recorded/);
    expect(walkingSpeedFromStrides([]).reason).toBe("no steady strides");
  });
});
