import { describe, expect, it } from "vitest";
import { type KinematicOptions, kinematicArmLeg } from "../../coordination/__tests__/support/kinematic-arm-leg";
import { wristOrientation } from "../wrist-sign";

// The kinematic wrist model (rigid forearm swinging about the shoulder, body forward acceleration
// braking after each IC, heel-strike ringing, trunk yaw) read by a device worn four ways. Truth is
// how the model mounted the device; the detector sees only the six channels and the leg ICs.
function orient(extra: Partial<KinematicOptions>, seed = 5) {
  const m = kinematicArmLeg({
    seed,
    durationS: 90,
    sampleRateHz: 100,
    strideTimeS: 1.1,
    arm: { ratio: 1, fundamentalDeg: 14, leadDeg: 10, secondHarmonic: 0.5, secondHarmonicPhaseDeg: 30 },
    ...extra,
  });
  const o = wristOrientation({
    accX: m.acc[0],
    accY: m.acc[1],
    accZ: m.acc[2],
    gyroX: m.gyro[0],
    gyroY: m.gyro[1],
    gyroZ: m.gyro[2],
    mask: m.steadyMask,
    sampleRateHz: m.sampleRateHz,
    strideFrequencyHz: m.strideFrequencyHz,
    initialContactsS: m.allIcS,
  })!;
  // Correlation of the corrected ω with the model's forward-positive ω.
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < m.steadyMask.length; i++) {
    if (!m.steadyMask[i]) continue;
    const w = m.gyro[0][i]! * o.rightAxis[0] + m.gyro[1][i]! * o.rightAxis[1] + m.gyro[2][i]! * o.rightAxis[2];
    const t = m.armOmegaTruthDegS[i]!;
    sxy += w * t;
    sxx += w * w;
    syy += t * t;
  }
  return { o, r: sxy / Math.sqrt(sxx * syy) };
}

describe("wristOrientation(...) from gravity and the body's forward acceleration", () => {
  it("nominal wear → verified, not flipped, upright, facing forward", () => {
    const { o, r } = orient({ mounting: "nominal" });
    expect(o.verified).toBe(true);
    expect(o.flippedFromNominal).toBe(false);
    expect(o.upsideDown).toBe(false);
    expect(o.turnedAround).toBe(false);
    expect(o.forwardCue!.t).toBeGreaterThan(3);
    expect(r).toBeGreaterThan(0.95);
  });

  it("upside down (180° about the forward axis) → gravity says upside down, ω sign corrected", () => {
    const { o, r } = orient({ mounting: "upside-down" });
    expect(o.verified).toBe(true);
    expect(o.upsideDown).toBe(true);
    expect(o.turnedAround).toBe(false);
    expect(o.flippedFromNominal).toBe(true);
    expect(r).toBeGreaterThan(0.95);
  });

  it("turned around / mirrored (180° about the forearm) → gravity cannot tell; the forward cue corrects the sign", () => {
    const { o, r } = orient({ mounting: "mirrored" });
    expect(o.verified).toBe(true);
    expect(o.upsideDown).toBe(false);
    expect(o.turnedAround).toBe(true);
    expect(o.flippedFromNominal).toBe(true);
    expect(r).toBeGreaterThan(0.95);
  });

  it("upside down and turned around → ω keeps its nominal sign, both conditions named", () => {
    const { o, r } = orient({ mounting: "upside-down-and-mirrored" });
    expect(o.verified).toBe(true);
    expect(o.upsideDown).toBe(true);
    expect(o.turnedAround).toBe(true);
    expect(o.flippedFromNominal).toBe(false);
    expect(r).toBeGreaterThan(0.95);
  });

  it("a 2:1 arm does not mislead the cue (the arm's own step-frequency swing is modelled out)", () => {
    for (const mounting of ["nominal", "mirrored"] as const) {
      const { o, r } = orient({ mounting, strideTimeS: 1.6, arm: { ratio: 2, fundamentalDeg: 6, leadDeg: 60, strideComponent: 0.2 } });
      expect(o.verified).toBe(true);
      expect(r).toBeGreaterThan(0.9);
    }
  });

  it("a wrist clock 100 ms late with heel-strike impacts still gives the right sign", () => {
    for (const mounting of ["nominal", "mirrored", "upside-down"] as const) {
      const { o, r } = orient({ mounting, wristClockOffsetS: 0.1 });
      expect(o.verified).toBe(true);
      expect(r).toBeGreaterThan(0.95);
    }
  });

  it("no body forward acceleration and no impacts → not verified; nominal axes with gravity used, never a guess from the phase", () => {
    const upright = orient({ mounting: "nominal", bodyForwardAccM_S2: 0, impactM_S2: 0 });
    expect(upright.o.verified).toBe(false);
    expect(upright.o.turnedAround).toBeNull();
    expect(upright.r).toBeGreaterThan(0.95);
    const inverted = orient({ mounting: "upside-down", bodyForwardAccM_S2: 0, impactM_S2: 0 });
    expect(inverted.o.verified).toBe(false);
    expect(inverted.o.upsideDown).toBe(true);
    expect(inverted.r).toBeGreaterThan(0.95);
    // A turned-around device cannot be recognised without the cue: the fallback is wrong, which is
    // why the analysis withholds the mean phase when `verified` is false.
    const turned = orient({ mounting: "mirrored", bodyForwardAccM_S2: 0, impactM_S2: 0 });
    expect(turned.o.verified).toBe(false);
    expect(turned.r).toBeLessThan(-0.95);
  });

  // The arm's own swing (up to ~10 m/s² of L·α) dwarfs the body's cue, so the decision must not hang
  // on the arm–leg phase. Across arm leads from −150° to 150° a 0.5 m/s² body cue is never read the
  // wrong way; where the arm's step-frequency terms line up with the body's pattern the regression
  // cannot separate them and the sign stays unverified (seen at +30° here), which is allowed, but
  // most leads must verify. With no body cue nothing is ever verified.
  it("over arm leads −150°…150°: body cue → never a wrong sign, ≥ 80 % verified; no body cue → never verified", () => {
    let verified = 0;
    let total = 0;
    for (let lead = -150; lead <= 150; lead += 60) {
      for (const mounting of ["nominal", "mirrored"] as const) {
        const arm = { ratio: 1, fundamentalDeg: 16, leadDeg: lead, secondHarmonic: 0.5, secondHarmonicPhaseDeg: lead / 2 };
        const withCue = orient({ mounting, arm, bodyForwardAccM_S2: 0.5, impactM_S2: 0 }, 40 + lead);
        total++;
        if (withCue.o.verified) {
          verified++;
          expect(withCue.r).toBeGreaterThan(0.95);
        }
        const without = orient({ mounting, arm, bodyForwardAccM_S2: 0, impactM_S2: 0 }, 40 + lead);
        expect(without.o.verified).toBe(false);
      }
    }
    expect(verified / total).toBeGreaterThanOrEqual(0.8);
  });
});
