import { describe, expect, it } from "vitest";
import { type SynthOptions, type SynthSession, synthesizeSession } from "../../synth";
import { readColumns } from "../../synth/__tests__/read-columns";
import { armLegCoupling } from "../arm-leg-coupling";
import { wrapPi } from "../relative-phase";

/** Steady mask from the generator's truth: inside bouts, minus the first and last 2 strides. */
function steadyFromTruth(session: SynthSession, t: Float64Array): Uint8Array {
  const mask = new Uint8Array(t.length);
  const ic = session.truth.left.ic;
  for (const bout of session.truth.walkingBouts) {
    const inBout = ic.filter((x) => x >= bout.startS && x <= bout.endS);
    if (inBout.length < 6) continue;
    const a = inBout[2]!;
    const b = inBout[inBout.length - 3]!;
    for (let i = 0; i < t.length; i++) if (t[i]! >= a && t[i]! <= b) mask[i] = 1;
  }
  for (const turn of session.truth.turns) {
    for (let i = 0; i < t.length; i++) if (t[i]! >= turn.startS - 1 && t[i]! <= turn.endS + 1) mask[i] = 0;
  }
  return mask;
}

function couple(options: SynthOptions) {
  const session = synthesizeSession({ placements: ["left_shank", "right_shank", "left_wrist", "right_wrist"], ...options });
  const cols = Object.fromEntries(session.files.map((f) => [f.placement, readColumns(f.text)]));
  const t = cols.left_shank!.t;
  const mask = steadyFromTruth(session, t);
  const fs = session.truth.sampleRateHz;
  const strides = session.truth.strideTimesS;
  const strideHz = strides.length / strides.reduce((s, x) => s + x, 0);
  const leftArmRightLeg = armLegCoupling(cols.left_wrist!.gyro[2], cols.right_shank!.gyro[2], fs, strideHz, mask);
  const rightArmLeftLeg = armLegCoupling(cols.right_wrist!.gyro[2], cols.left_shank!.gyro[2], fs, strideHz, mask);
  return { session, leftArmRightLeg, rightArmLeftLeg };
}

const angleErrorDeg = (a: number, b: number) => (Math.abs(wrapPi(((a - b) * Math.PI) / 180)) * 180) / Math.PI;

describe("armLegCoupling(arm, leg, fs, strideHz, steadyMask) on the project's synthetic sessions", () => {
  // Truth: the generator builds the arm on the contralateral leg's fundamental phase plus phaseDeg.
  it("1:1 locked arms → ratio 1, R > 0.98, mean ψ within 3° of the designed 35°", () => {
    const r = couple({ seed: 11, durationS: 120, sampleRateHz: 100, arm: { coupling: "1:1", phaseDeg: 35 } });
    for (const c of [r.leftArmRightLeg, r.rightArmLeftLeg]) {
      expect(c.frequencyRatio).toBe(1);
      expect(c.couplingStrength!).toBeGreaterThan(0.98);
      expect(angleErrorDeg(c.meanRelativePhaseDeg!, 35)).toBeLessThan(3);
      expect(c.circularSdDeg!).toBeCloseTo((Math.sqrt(-2 * Math.log(c.couplingStrength!)) * 180) / Math.PI, 9);
    }
  });

  // Slow gait with 2:1 arm locking (Wagenaar & van Emmerik 2000: 2:1 below ≈ 0.7 m/s). The generator
  // designs ψ on angular velocity (−60°); the analysis now measures it on segment angles, where each
  // phase is 90° behind its ω phase, so ψ_angle = ψ_ω − 90° + 2·90° = −60° + 90° = 30°.
  it("slow gait with 2:1 arms → ratio 2, R > 0.98, angle-based mean ψ within 3° of 30° (ω design −60°)", () => {
    const r = couple({ seed: 12, durationS: 150, sampleRateHz: 60, strideTimeS: 1.8, arm: { coupling: "2:1", phaseDeg: -60, amplitudeDegS: 40 } });
    for (const c of [r.leftArmRightLeg, r.rightArmLeftLeg]) {
      expect(c.frequencyRatio).toBe(2);
      expect(c.couplingStrength!).toBeGreaterThan(0.98);
      expect(angleErrorDeg(c.meanRelativePhaseDeg!, -60 + 90)).toBeLessThan(3);
    }
  });

  it("uncoupled arms (1.4 cycles per stride, drifting) → ratio not snapped, R < 0.3, no mean phase", () => {
    const r = couple({ seed: 13, durationS: 180, sampleRateHz: 128, arm: { coupling: "uncoupled", uncoupledRatio: 1.4 } });
    for (const c of [r.leftArmRightLeg, r.rightArmLeftLeg]) {
      expect(c.frequencyRatio!).toBeGreaterThan(1.2);
      expect(c.frequencyRatio!).toBeLessThan(1.6);
      expect(c.couplingStrength!).toBeLessThan(0.3);
      expect(c.meanRelativePhaseDeg).toBeNull();
      expect(c.reason).toMatch(/too weak/);
    }
  });

  // Gaussian phase noise of SD σ has mean resultant length E[R] = exp(−σ²/2) (wrapped-normal
  // distribution; Mardia & Jupp, Directional Statistics, 2000 — from memory). The wander is slow
  // (τ ≈ 2 s), so one 3-minute session samples it coarsely: tolerance ±0.12.
  it("a locked arm with 40° phase wander → R near exp(−σ²/2) = 0.78, still ratio 1", () => {
    const sigma = (40 * Math.PI) / 180;
    const r = couple({ seed: 21, durationS: 180, sampleRateHz: 100, arm: { coupling: "1:1", phaseDeg: 10, phaseJitterDeg: 40 } });
    for (const c of [r.leftArmRightLeg, r.rightArmLeftLeg]) {
      expect(c.frequencyRatio).toBe(1);
      expect(c.couplingStrength!).toBeGreaterThan(Math.exp((-sigma * sigma) / 2) - 0.12);
      expect(c.couplingStrength!).toBeLessThan(Math.exp((-sigma * sigma) / 2) + 0.12);
    }
  });

  it("no arm swing → every field null, with a reason", () => {
    const r = couple({ seed: 14, durationS: 90, arm: { coupling: "none" } });
    expect(r.leftArmRightLeg).toMatchObject({ frequencyRatio: null, meanRelativePhaseDeg: null, couplingStrength: null, circularSdDeg: null });
    expect(r.leftArmRightLeg.reason).toMatch(/no arm rhythm/);
  });

  it("too little steady walking → every field null", () => {
    const fs = 100;
    const n = fs * 60;
    const arm = Float64Array.from({ length: n }, (_, i) => 80 * Math.cos((2 * Math.PI * i) / (fs * 1.1)));
    const leg = Float64Array.from({ length: n }, (_, i) => 300 * Math.cos((2 * Math.PI * i) / (fs * 1.1)));
    const mask = new Uint8Array(n).fill(1, 0, fs * 5);
    const c = armLegCoupling(arm, leg, fs, 1 / 1.1, mask);
    expect(c.couplingStrength).toBeNull();
    expect(c.reason).toMatch(/at least 10/);
    // The same signals with the whole minute steady are computable.
    const full = armLegCoupling(arm, leg, fs, 1 / 1.1, new Uint8Array(n).fill(1));
    expect(full.frequencyRatio).toBe(1);
    expect(full.couplingStrength!).toBeGreaterThan(0.99);
    expect(Math.abs(full.meanRelativePhaseDeg!)).toBeLessThan(1);
  });

  it("rejects arrays of different lengths", () => {
    expect(() => armLegCoupling(new Float64Array(10), new Float64Array(9), 100, 1, new Uint8Array(10))).toThrow(RangeError);
  });
});
