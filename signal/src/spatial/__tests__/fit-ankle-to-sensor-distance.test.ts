import { describe, expect, it } from "vitest";
import { createPrng } from "../../synth/prng";
import type { Stride } from "../../types";
import { fitAnkleToSensorDistance, MIN_FIT_WINDOWS } from "../fit-ankle-to-sensor-distance";
import { sagittalPlaneSignals } from "../sagittal-plane";
import { sessionStrideLengths } from "../session-stride-lengths";
import { midStanceWindows, SHANK_SENSOR_DEFAULT_ABOVE_ANKLE_M, shankSensorDistance } from "../shank-sensor-distance";
import { planarLeg, type PlanarLeg, type PlanarLegOptions } from "./support/planar-leg-model";

// Truth comes from a planar kinematic leg (support/planar-leg-model.ts): the shank turns about an ankle
// held still through stance, the sensor sits a known distance r above it, and the accelerometer is the
// second derivative of the sensor's path plus gravity. r is the model's parameter, not an output of
// the fit. Noise: white, 0.1 m/s² (accelerometer) and 0.5 °/s (gyro) per sample, a test choice.

function stridesOf(icS: number[], fcS: number[]): Stride[] {
  const out: Stride[] = [];
  for (let k = 0; k + 1 < icS.length; k++) {
    out.push({
      side: "left",
      icS: icS[k]!,
      nextIcS: icS[k + 1]!,
      fcS: fcS[k] ?? null,
      strideTimeS: icS[k + 1]! - icS[k]!,
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

function noisy(leg: PlanarLeg, seed: number, accSdMS2 = 0.1, gyroSdDegS = 0.5): PlanarLeg {
  const rng = createPrng(seed);
  const add = (x: Float64Array, sd: number) => x.map((v) => v + sd * rng.normal());
  return {
    ...leg,
    accX: add(leg.accX, accSdMS2),
    accY: add(leg.accY, accSdMS2),
    accZ: add(leg.accZ, accSdMS2),
    gyroX: add(leg.gyroX, gyroSdDegS),
    gyroY: add(leg.gyroY, gyroSdDegS),
    gyroZ: add(leg.gyroZ, gyroSdDegS),
  };
}

const fs = 100;
const base: Omit<PlanarLegOptions, "segment"> = { strideTimeS: 1.1, stanceFraction: 0.62, strideLengthM: 1.3, strides: 40, sampleRateHz: fs };

function estimate(leg: PlanarLeg, heightCm: number) {
  const plane = sagittalPlaneSignals(leg.accX, leg.accY, leg.accZ, leg.gyroX, leg.gyroY, leg.gyroZ, leg.axis);
  return shankSensorDistance(plane, fs, stridesOf(leg.icS, leg.fcS), leg.valid, heightCm);
}

describe("fitAnkleToSensorDistance on a planar shank turning about a fixed ankle", () => {
  it("recovers r = 0.10 m (just above the ankle) within 1 cm, sensor mounted 17° off, tilted in 3-D, gyro bias, noise", () => {
    const leg = noisy(planarLeg({ ...base, segment: "shank", sensorAboveAnkleM: 0.1, mountRad: -0.3, tiltXRad: 0.25, gyroBiasDegS: 0.5 }), 1);
    const d = estimate(leg, 175);
    expect(d.source).toBe("fit");
    expect(d.fit.windowCount).toBe(40);
    expect(Math.abs(d.distanceM - 0.1)).toBeLessThan(0.01);
    expect(d.fit.standardErrorM!).toBeLessThan(0.01);
  });

  it("recovers r = 0.25 m (high on the shank) within 1 cm", () => {
    const leg = noisy(planarLeg({ ...base, segment: "shank", sensorAboveAnkleM: 0.25, mountRad: 0.4 }), 2);
    const d = estimate(leg, 180);
    expect(d.source).toBe("fit");
    expect(Math.abs(d.distanceM - 0.25)).toBeLessThan(0.01);
  });

  it("recovers r = 0.12 m within 1.5 cm at a slow, short-stride walk (0.4 m in 1.2 s, small shank excursion)", () => {
    const leg = noisy(planarLeg({ ...base, segment: "shank", strideTimeS: 1.2, strideLengthM: 0.4, shankAtIcRad: 0.12, shankAtFcRad: -0.2, sensorAboveAnkleM: 0.12 }), 3);
    const d = estimate(leg, 165);
    expect(d.source).toBe("fit");
    expect(Math.abs(d.distanceM - 0.12)).toBeLessThan(0.015);
  });

  it("is exact without noise (the model is the rigid-body equation itself)", () => {
    const leg = planarLeg({ ...base, segment: "shank", sensorAboveAnkleM: 0.17, mountRad: 0.2 });
    const d = estimate(leg, 175);
    expect(d.distanceM).toBeCloseTo(0.17, 3);
    expect(d.fit.axisAngleDeg!).toBeLessThan(30);
  });
});

describe("shankSensorDistance safeguards fall back to the documented placement", () => {
  it("with fewer than the minimum number of mid-stance windows", () => {
    const leg = noisy(planarLeg({ ...base, segment: "shank", strides: MIN_FIT_WINDOWS - 2, sensorAboveAnkleM: 0.2 }), 4);
    const d = estimate(leg, 175);
    expect(d.source).toBe("default");
    expect(d.distanceM).toBe(SHANK_SENSOR_DEFAULT_ABOVE_ANKLE_M);
    expect(d.fit.reason).toMatch(/mid-stance windows/);
  });

  it("when the fitted distance is longer than the shank (0.246·H) of the stated height", () => {
    const leg = noisy(planarLeg({ ...base, segment: "shank", sensorAboveAnkleM: 0.25 }), 5);
    const d = estimate(leg, 90); // shank 0.22 m
    expect(d.source).toBe("default");
    expect(d.fit.distanceM!).toBeGreaterThan(0.22);
    expect(d.fit.reason).toMatch(/outside 3–22 cm/);
  });

  it("when the shank does not turn (a sensor lying still: nothing excites the fit)", () => {
    const rng = createPrng(6);
    const n = 60 * fs;
    const z = () => new Float64Array(n).map(() => 0.5 * rng.normal());
    const accY = new Float64Array(n).map(() => 9.80665 + 0.1 * rng.normal());
    const icS = Array.from({ length: 41 }, (_, k) => 1 + k * 1.1);
    const fcS = icS.map((t) => t + 0.68);
    const plane = sagittalPlaneSignals(z(), accY, z(), z(), z(), z(), [0, 0, 1]);
    const d = shankSensorDistance(plane, fs, stridesOf(icS, fcS), new Uint8Array(n).fill(1), 175);
    expect(d.source).toBe("default");
    expect(d.fit.accepted).toBe(false);
  });

  it("windows only steady strides with an FC and valid samples, between 1/6 and 1/2 of stance", () => {
    const strides = stridesOf([1, 2.1, 3.2, 4.3], [1.6, 2.7, 3.8]);
    strides[1]!.steady = false;
    const valid = new Uint8Array(600).fill(1);
    valid[345] = 0; // inside the third stride's window
    expect(midStanceWindows(strides, valid, fs)).toEqual([[110, 130]]);
  });

  it("refuses a bad sample rate", () => {
    const leg = planarLeg({ ...base, segment: "shank", strides: 3 });
    const plane = sagittalPlaneSignals(leg.accX, leg.accY, leg.accZ, leg.gyroX, leg.gyroY, leg.gyroZ, leg.axis);
    expect(() => fitAnkleToSensorDistance(plane, 0, [], { minM: 0.03, maxM: 0.4 })).toThrow(RangeError);
  });
});

describe("sessionStrideLengths with a shank: r fitted per leg, then the stride lengths", () => {
  it("gives stride lengths within 3 % with the fitted r, where the old fixed mid-shank r (0.215 m) would not apply", () => {
    const leg = noisy(planarLeg({ ...base, segment: "shank", sensorAboveAnkleM: 0.1, mountRad: -0.3, gyroBiasDegS: 0.3 }), 7);
    const strides = stridesOf(leg.icS, leg.fcS);
    const walking = new Uint8Array(leg.valid.length).fill(1);
    const out = sessionStrideLengths({ left: { shank: leg }, right: {} }, strides, { left: leg.fcS, right: [] }, walking, { sampleRateHz: fs, heightCm: 175 });
    expect(out.shankSensorDistance.left!.source).toBe("fit");
    expect(out.notes).toEqual([]);
    const lengths = out.lengthsM.filter((x): x is number => x !== null);
    expect(lengths.length).toBeGreaterThan(30);
    for (const l of lengths) expect(Math.abs(l - 1.3) / 1.3).toBeLessThan(0.03);
  });

  it("says so in notes when a side falls back to the default distance", () => {
    const leg = noisy(planarLeg({ ...base, segment: "shank", strides: 6, sensorAboveAnkleM: 0.1 }), 8);
    const strides = stridesOf(leg.icS, leg.fcS);
    const walking = new Uint8Array(leg.valid.length).fill(1);
    const out = sessionStrideLengths({ left: { shank: leg }, right: {} }, strides, { left: leg.fcS, right: [] }, walking, { sampleRateHz: fs, heightCm: 175 });
    expect(out.shankSensorDistance.left!.source).toBe("default");
    expect(out.notes[0]).toMatch(/left shank: .*documented placement, 10 cm above the ankle/);
  });
});
