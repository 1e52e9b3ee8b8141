import { describe, expect, it } from "vitest";
import { analyze } from "../../analyze";
import { type KinematicOptions, synthesizeKinematicSession } from "../../synth/kinematic";
import type { Analysis } from "../../types";
import { wrapPi } from "../relative-phase";

// Whole-pipeline checks on the kinematic generator (segment angles from a body model, wrists with
// their own wear, body accelerations and heel-strike impacts). Truth: the model's angle-based ψ
// (its angle-based ψ) and its swing range per arm cycle; the analysis sees only the files.
const angleErrorDeg = (a: number, b: number) => (Math.abs(wrapPi(((a - b) * Math.PI) / 180)) * 180) / Math.PI;

// The generator's truth names its angle-based ψ `relativePhaseDeg` (rate-based: `relativePhaseRateDeg`);
// earlier versions called them `relativePhaseAngleDeg` / `relativePhaseDeg`. Read either.
function truthPsi(truth: object, on: "angle" | "rate"): number {
  const t = truth as Record<string, number | null | undefined>;
  const renamed = "relativePhaseRateDeg" in t;
  const v = on === "angle" ? (renamed ? t.relativePhaseDeg : t.relativePhaseAngleDeg) : renamed ? t.relativePhaseRateDeg : t.relativePhaseDeg;
  if (typeof v !== "number") throw new Error(`the generator's truth has no ${on}-based relative phase`);
  return v;
}

function session(options: KinematicOptions, walkingAid?: "none" | "cane" | "crutches" | "rollator" | "other") {
  const s = synthesizeKinematicSession({ seed: 3, placements: ["left_shank", "right_shank", "left_wrist", "right_wrist"], bouts: [{ durationS: 120 }], ...options });
  const a = analyze(s.recordings, walkingAid ? { walkingAid } : {});
  return { s, a };
}
const codes = (a: Analysis, code: string) => a.quality.filter((q) => q.code === code);

describe("analyze() arm section on kinematic sessions", { timeout: 60_000 }, () => {
  it("standard wear, 1:1 with a 40 % 2nd harmonic → ratio 1, ψ within 15° of the model's angle ψ, range within 10 %", () => {
    const { s, a } = session({ arms: { coupling: "1:1", secondHarmonicPct: 40 } });
    for (const [key, side] of [["leftArmRightLeg", "left"], ["rightArmLeftLeg", "right"]] as const) {
      const c = a.metrics.armLeg[key];
      const truth = s.truth.arms[side]!;
      expect(c.frequencyRatio).toBe(1);
      expect(c.couplingStrength!).toBeGreaterThan(0.9);
      expect(angleErrorDeg(c.meanRelativePhaseDeg!, truthPsi(truth, "angle"))).toBeLessThan(15);
      expect(a.metrics.armSwing![side].amplitudeDeg! / truth.swingRangeDeg).toBeGreaterThan(0.9);
      expect(a.metrics.armSwing![side].amplitudeDeg! / truth.swingRangeDeg).toBeLessThan(1.1);
    }
    expect(codes(a, "arm-sign-unverified")).toHaveLength(0);
    expect(codes(a, "inverted-sensor")).toHaveLength(0);
    expect(a.metrics.counts.armSwing).toBeGreaterThanOrEqual(40);
  });

  it("left watch mirrored, right upside down → both reported as inverted-sensor with the placement, ψ unchanged", () => {
    const { s, a } = session({ arms: { coupling: "1:1", wear: { left: "mirrored", right: "upside-down" } } });
    const inverted = codes(a, "inverted-sensor");
    expect(inverted.map((q) => q.placement).sort()).toEqual(["left_wrist", "right_wrist"]);
    expect(inverted.find((q) => q.placement === "left_wrist")!.message).toMatch(/turned around/);
    expect(inverted.find((q) => q.placement === "right_wrist")!.message).toMatch(/upside down/);
    expect(angleErrorDeg(a.metrics.armLeg.leftArmRightLeg.meanRelativePhaseDeg!, truthPsi(s.truth.arms.left!, "angle"))).toBeLessThan(15);
    expect(angleErrorDeg(a.metrics.armLeg.rightArmLeftLeg.meanRelativePhaseDeg!, truthPsi(s.truth.arms.right!, "angle"))).toBeLessThan(15);
  });

  it("both wrists turned around → placement-swap, mean phases withheld with a reason, R kept", () => {
    const { a } = session({ arms: { coupling: "1:1", wear: { left: "mirrored", right: "mirrored" } } });
    expect(codes(a, "placement-swap")).toHaveLength(1);
    for (const c of [a.metrics.armLeg.leftArmRightLeg, a.metrics.armLeg.rightArmLeftLeg]) {
      expect(c.meanRelativePhaseDeg).toBeNull();
      expect(c.reason).toMatch(/swapped/);
      expect(c.couplingStrength!).toBeGreaterThan(0.9);
    }
  });

  it("slow 2:1 walking → ratio 2 and the angle-based n:1 ψ within 15° of the model (the rate-based value differs by 90°)", () => {
    const { s, a } = session({ strideTimeS: 1.8, arms: { coupling: "2:1" } });
    const c = a.metrics.armLeg.leftArmRightLeg;
    const truth = s.truth.arms.left!;
    expect(c.frequencyRatio).toBe(2);
    expect(angleErrorDeg(c.meanRelativePhaseDeg!, truthPsi(truth, "angle"))).toBeLessThan(15);
    expect(angleErrorDeg(c.meanRelativePhaseDeg!, truthPsi(truth, "rate"))).toBeGreaterThan(60);
  });

  it("reduced swing on one side → amplitudes follow the model and the asymmetry matches the symmetry-angle formula on the truth", () => {
    const { s, a } = session({ arms: { coupling: "1:1", rangeDeg: { left: 32, right: 12 } } });
    const l = s.truth.arms.left!.swingRangeDeg;
    const r = s.truth.arms.right!.swingRangeDeg;
    // Zifchock et al. 2008 symmetry angle (magnitude), applied by hand to the model's ranges.
    const expected = (Math.abs(45 - (Math.atan(l / r) * 180) / Math.PI) / 90) * 100;
    expect(a.metrics.armSwing!.asymmetryPct!).toBeGreaterThan(expected - 3);
    expect(a.metrics.armSwing!.asymmetryPct!).toBeLessThan(expected + 3);
    expect(a.metrics.armSwing!.right.amplitudeDeg!).toBeGreaterThan(0.85 * r);
    expect(a.metrics.armSwing!.right.amplitudeDeg!).toBeLessThan(1.15 * r);
  });

  it("an arm held still (as on a cane) → no-arm-swing for that wrist, its coupling null with the reason; the other arm unaffected", () => {
    const { s, a } = session({ arms: { coupling: "1:1", heldStill: ["left"] } });
    const item = codes(a, "no-arm-swing");
    expect(item.map((q) => q.placement)).toEqual(["left_wrist"]);
    expect(a.metrics.armLeg.leftArmRightLeg).toMatchObject({ frequencyRatio: null, meanRelativePhaseDeg: null, couplingStrength: null });
    expect(a.metrics.armLeg.leftArmRightLeg.reason).toMatch(/no arm swing/);
    expect(a.metrics.armSwing!.left.amplitudeDeg!).toBeLessThan(5);
    expect(angleErrorDeg(a.metrics.armLeg.rightArmLeftLeg.meanRelativePhaseDeg!, truthPsi(s.truth.arms.right!, "angle"))).toBeLessThan(15);
  });

  it("walking aid recorded → both couplings null with 'walking aid used', a no-arm-swing item, amplitudes still shown", () => {
    const { a } = session({ arms: { coupling: "1:1" } }, "rollator");
    for (const c of [a.metrics.armLeg.leftArmRightLeg, a.metrics.armLeg.rightArmLeftLeg]) {
      expect(c.couplingStrength).toBeNull();
      expect(c.reason).toMatch(/walking aid used/);
    }
    expect(codes(a, "no-arm-swing").length).toBeGreaterThan(0);
    expect(a.metrics.armSwing!.left.amplitudeDeg!).toBeGreaterThan(20);
  });

  // Clock alignment between a wrist and the legs belongs to the time base (timebase/align-wrist-clocks.ts);
  // this part must not be fooled by the offset (the sign is timed by the wrist's own impacts). The time
  // base corrects the wrist, so ψ follows the model instead of carrying 360° × 0.1 s / stride time.
  it("wrist clock 100 ms early → sign still right (no inverted-sensor), clock-offset on that wrist, ψ within 15° of the model", () => {
    const { s, a } = session({ arms: { coupling: "1:1" }, clockOffsetS: { left_wrist: 0.1 } });
    expect(codes(a, "inverted-sensor")).toHaveLength(0);
    expect(codes(a, "clock-offset").map((q) => q.placement)).toEqual(["left_wrist"]);
    expect(angleErrorDeg(a.metrics.armLeg.leftArmRightLeg.meanRelativePhaseDeg!, truthPsi(s.truth.arms.left!, "angle"))).toBeLessThan(15);
  });

  it("a wrist mounted 30° off its nominal axes and upside down → axis found, sign corrected, ψ within 15°", () => {
    const { s, a } = session({ arms: { coupling: "1:1", wear: { left: "upside-down" } }, misalignmentDeg: { left_wrist: 30 } });
    expect(codes(a, "inverted-sensor").map((q) => q.placement)).toEqual(["left_wrist"]);
    expect(angleErrorDeg(a.metrics.armLeg.leftArmRightLeg.meanRelativePhaseDeg!, truthPsi(s.truth.arms.left!, "angle"))).toBeLessThan(15);
    expect(a.metrics.armSwing!.left.amplitudeDeg! / s.truth.arms.left!.swingRangeDeg).toBeGreaterThan(0.85);
  });

  it("signed ψ error and range error over 6 seeds and phases (standard wear): |bias| < 5°, mean |error| < 8°, range bias < 5 %", () => {
    const psiErrors: number[] = [];
    const rangeErrors: number[] = [];
    for (let k = 0; k < 6; k++) {
      const { s, a } = session({ seed: 20 + k, bouts: [{ durationS: 80 }], arms: { coupling: "1:1", relativePhaseDeg: -60 + 25 * k, secondHarmonicPct: 30 + 5 * k } });
      const truth = s.truth.arms.left!;
      const c = a.metrics.armLeg.leftArmRightLeg;
      psiErrors.push((wrapPi(((c.meanRelativePhaseDeg! - truthPsi(truth, "angle")) * Math.PI) / 180) * 180) / Math.PI);
      rangeErrors.push(a.metrics.armSwing!.left.amplitudeDeg! / truth.swingRangeDeg - 1);
    }
    const mean = (x: number[]) => x.reduce((p, q) => p + q, 0) / x.length;
    expect(Math.abs(mean(psiErrors))).toBeLessThan(5);
    expect(mean(psiErrors.map(Math.abs))).toBeLessThan(8);
    expect(Math.abs(mean(rangeErrors))).toBeLessThan(0.05);
  }, 60_000);
});
