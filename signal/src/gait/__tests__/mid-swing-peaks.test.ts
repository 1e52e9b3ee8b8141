import { describe, expect, it } from "vitest";
import { SALARIAN_MIN_PEAK_DISTANCE_S, findPeaks, mergeSwingsWithoutStance } from "../mid-swing-peaks";

// A shank's sagittal angle over very slow strides, built from the body's kinematics rather than from
// the event rule: each 3.4 s stride (35 steps/min) swings the shank forward by 60° and the stance
// takes the 60° back (docs/methods.md#shank-kinematics-over-a-stride: the angle returns to its
// start every stride). A hesitant swing is split in two forward pushes, 45° then 15°, with a 1°
// backward sag between them; the pushes are 0.7 s apart, more than the 0.5 s peak distance. ω is
// the angle's exact derivative.
const FS = 100;
const STRIDE_S = 3.4;
const STRIDES = 12;

/** Rate of a raised-cosine step from 0 to 1 over [a, b] (its integral is exactly 1). */
function rampRate(t: number, a: number, b: number): number {
  if (t <= a || t >= b) return 0;
  return ((0.5 * Math.PI) / (b - a)) * Math.sin((Math.PI * (t - a)) / (b - a));
}

/** ω (deg/s) of one stride, t from the stride's toe-off: swing in [0, 1.3] s, stance after. */
function strideOmega(t: number, hesitant: boolean): number {
  if (!hesitant) return 60 * rampRate(t, 0, 1.1) - 60 * rampRate(t, 1.1, STRIDE_S);
  return 46 * rampRate(t, 0, 0.55) - 1 * rampRate(t, 0.55, 0.75) + 15 * rampRate(t, 0.75, 1.3) - 60 * rampRate(t, 1.3, STRIDE_S);
}

function session(hesitant: boolean): { omega: Float64Array; mask: Uint8Array; swingStartsS: number[] } {
  const n = Math.round(STRIDES * STRIDE_S * FS);
  const omega = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = i / FS;
    omega[i] = strideOmega(t - STRIDE_S * Math.floor(t / STRIDE_S), hesitant);
  }
  return { omega, mask: new Uint8Array(n).fill(1), swingStartsS: Array.from({ length: STRIDES }, (_, k) => k * STRIDE_S) };
}

describe("one mid-swing per stride at 35 steps/min", () => {
  it("the model's angle returns to its start every stride (ω integrates to 0)", () => {
    for (const hesitant of [false, true]) {
      const { omega } = session(hesitant);
      let sum = 0;
      for (let i = 0; i < Math.round(STRIDE_S * FS); i++) sum += omega[i]! / FS;
      expect(Math.abs(sum)).toBeLessThan(0.5);
    }
  });

  it("merges the two pushes of a hesitant swing (no stance between them) into one mid-swing", () => {
    const { omega, mask, swingStartsS } = session(true);
    const raw = findPeaks(omega, mask, 10, Math.round(SALARIAN_MIN_PEAK_DISTANCE_S * FS));
    expect(raw.length).toBe(2 * STRIDES); // the 0.5 s distance alone keeps both pushes
    const merged = mergeSwingsWithoutStance(raw, omega, omega, mask, FS);
    expect(merged.length).toBe(STRIDES);
    // The taller (first) push is kept: inside each stride's swing, before the second push starts.
    merged.forEach((p, k) => {
      const t = p / FS - swingStartsS[k]!;
      expect(t).toBeGreaterThan(0);
      expect(t).toBeLessThan(0.55);
    });
  });

  it("leaves one-push swings alone, and never merges across a pause outside the mask", () => {
    const { omega, mask } = session(false);
    const raw = findPeaks(omega, mask, 10, Math.round(SALARIAN_MIN_PEAK_DISTANCE_S * FS));
    expect(mergeSwingsWithoutStance(raw, omega, omega, mask, FS)).toEqual(raw);
    const hesitant = session(true);
    const cut = hesitant.mask.slice();
    const first = findPeaks(hesitant.omega, cut, 10, Math.round(SALARIAN_MIN_PEAK_DISTANCE_S * FS));
    // A gap between the two pushes of stride 3: they may not be joined.
    const a = first[6]!;
    const b = first[7]!;
    cut.fill(0, a + 5, b - 5);
    const kept = mergeSwingsWithoutStance(first, hesitant.omega, hesitant.omega, cut, FS);
    expect(kept).toContain(a);
    expect(kept).toContain(b);
    expect(kept.length).toBe(STRIDES + 1);
  });
});
