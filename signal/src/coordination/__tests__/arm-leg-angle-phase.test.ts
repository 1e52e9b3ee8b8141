import { describe, expect, it } from "vitest";
import { createPrng } from "../../synth/prng";
import { armLegCoupling } from "../arm-leg-coupling";
import { armRhythm } from "../arm-rhythm";
import { wrapPi } from "../relative-phase";
import { segmentAngleDeg } from "../segment-angle";
import { welchPsd } from "../welch-psd";
import { type ArmDesign, kinematicArmLeg } from "./support/kinematic-arm-leg";

// Truth: the kinematic model writes the arm and shank ANGLES as Fourier series of the paired leg's
// gait phase; ψ truth is the model's lead of the arm fundamental over the shank fundamental
// (×n for n:1), a model parameter, not a result of the estimator. ω is the model's derivative.
const angleErrorDeg = (a: number, b: number) => (Math.abs(wrapPi(((a - b) * Math.PI) / 180)) * 180) / Math.PI;

function run(arm: ArmDesign, extra: { seed?: number; strideTimeS?: number; durationS?: number } = {}) {
  const m = kinematicArmLeg({ seed: extra.seed ?? 7, durationS: extra.durationS ?? 150, sampleRateHz: 100, strideTimeS: extra.strideTimeS ?? 1.1, arm });
  const c = armLegCoupling(m.armOmegaTruthDegS, m.legOmegaDegS, m.sampleRateHz, m.strideFrequencyHz, m.steadyMask);
  return { m, c };
}

describe("armLegCoupling on segment angles (kinematic arm and shank, non-sinusoidal)", () => {
  it("1:1 with a 45 % 2nd harmonic (asymmetric forward/backward swing) → ratio 1, ψ within 15° of the model's 20°", () => {
    const { c } = run({ ratio: 1, fundamentalDeg: 15, leadDeg: 20, secondHarmonic: 0.45, secondHarmonicPhaseDeg: 0, offsetDeg: 5 });
    expect(c.frequencyRatio).toBe(1);
    expect(c.couplingStrength!).toBeGreaterThan(0.9);
    expect(angleErrorDeg(c.meanRelativePhaseDeg!, 20)).toBeLessThan(15);
    expect(c.reason).toBeNull();
  });

  it("1:1 with a 60 % 2nd harmonic: ω's spectrum peaks at 2× (the old trap) but the angle rule says 1", () => {
    const { m, c } = run({ ratio: 1, fundamentalDeg: 12, leadDeg: -25, secondHarmonic: 0.6, secondHarmonicPhaseDeg: 90 });
    // ω weights harmonic k by k: 2 × 0.6 = 1.2 > 1, so the ω spectrum's largest peak is at 2 × f_stride.
    const w = welchPsd(m.armOmegaTruthDegS, 100, { segmentLength: 2048, mask: m.steadyMask, minMaskFraction: 0.5 });
    let best = 1;
    for (let k = 1; k < w.psd.length; k++) if (w.frequenciesHz[k]! < 2.6 * m.strideFrequencyHz && w.psd[k]! > w.psd[best]!) best = k;
    expect(w.frequenciesHz[best]! / m.strideFrequencyHz).toBeGreaterThan(1.7);
    expect(c.frequencyRatio).toBe(1);
    expect(angleErrorDeg(c.meanRelativePhaseDeg!, -25)).toBeLessThan(15);
  });

  it("2:1 slow walking with a 30 % stride-frequency residue → ratio 2, n:1 ψ within 15° of the model's −40°", () => {
    const { c } = run({ ratio: 2, fundamentalDeg: 6, leadDeg: -40, strideComponent: 0.3, secondHarmonic: 0.3, secondHarmonicPhaseDeg: 45 }, { strideTimeS: 1.8, durationS: 220 });
    expect(c.frequencyRatio).toBe(2);
    expect(c.couplingStrength!).toBeGreaterThan(0.8);
    expect(angleErrorDeg(c.meanRelativePhaseDeg!, -40)).toBeLessThan(15);
  });

  it("2× peak with a strong 1× part (80 %) → neither 1 nor 2: a mixed ratio in 1.5–1.8 and no mean phase", () => {
    const { c } = run({ ratio: 2, fundamentalDeg: 8, leadDeg: 0, strideComponent: 0.8 }, { strideTimeS: 1.6, durationS: 200 });
    expect(c.frequencyRatio!).toBeGreaterThan(1.5);
    expect(c.frequencyRatio!).toBeLessThan(1.8);
    expect(c.meanRelativePhaseDeg).toBeNull();
    expect(c.reason).toMatch(/stride and partly at step/);
  });

  it("a free-running arm (1.4 cycles per stride) → measured ratio, R below the gate, mean phase null with reason", () => {
    const { c } = run({ ratio: 1.4, fundamentalDeg: 12, leadDeg: 0 }, { durationS: 200 });
    expect(c.frequencyRatio!).toBeGreaterThan(1.25);
    expect(c.frequencyRatio!).toBeLessThan(1.55);
    expect(c.couplingStrength!).toBeLessThan(0.5);
    expect(c.meanRelativePhaseDeg).toBeNull();
    expect(c.reason).toMatch(/too weak/);
  });

  it("armRhythm(angle) ignores sensor noise alone (integrated white noise is 1/f², not a rhythm)", () => {
    const { m } = run({ ratio: 1, fundamentalDeg: 0, leadDeg: 0 });
    const rand = createPrng(3);
    const angle = segmentAngleDeg(m.armOmegaTruthDegS.map(() => 2 * rand.normal()), 100, 0.2);
    expect(armRhythm(angle, 100, m.strideFrequencyHz, m.steadyMask)).toBeNull();
  });

  // Published convention check: in healthy walking each arm is most forward at the contralateral heel
  // strike (Murray, Sepic & Barnard 1967, Phys Ther 47:272, sagittal rotation of the upper limbs) and
  // diagonal arm–leg pairs move in phase at 1:1 (Wagenaar & van Emmerik 2000, J Biomech 33:853). The
  // model puts the arm's peak exactly at the contralateral IC; the shank is most forward just before
  // IC (model: 0.97 of the stride). The angle-based ψ must read "in phase" (|ψ| < 30°) and equal the
  // model's lead of 360° × (0.97 − 1) = −10.8°.
  it("arm most forward at contralateral heel strike (Murray 1967) → ψ ≈ 0° (in phase), −10.8° by the model", () => {
    const { c } = run({ ratio: 1, fundamentalDeg: 15, leadDeg: -10.8, secondHarmonic: 0.3, secondHarmonicPhaseDeg: 0 });
    expect(Math.abs(c.meanRelativePhaseDeg!)).toBeLessThan(30);
    expect(angleErrorDeg(c.meanRelativePhaseDeg!, -10.8)).toBeLessThan(5);
  });

  it("signed error and spread over 8 seeds and leads: bias and mean |error| stay under 5°", () => {
    const errors: number[] = [];
    for (let s = 0; s < 8; s++) {
      const lead = -150 + 40 * s;
      const { c } = run({ ratio: 1, fundamentalDeg: 10 + s, leadDeg: lead, secondHarmonic: 0.3 + 0.04 * s, secondHarmonicPhaseDeg: 30 * s }, { seed: 100 + s, durationS: 100 });
      errors.push((wrapPi(((c.meanRelativePhaseDeg! - lead) * Math.PI) / 180) * 180) / Math.PI);
    }
    const bias = errors.reduce((a, e) => a + e, 0) / errors.length;
    const mae = errors.reduce((a, e) => a + Math.abs(e), 0) / errors.length;
    expect(Math.abs(bias)).toBeLessThan(5);
    expect(mae).toBeLessThan(5);
  });
});
