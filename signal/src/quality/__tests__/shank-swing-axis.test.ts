import { describe, expect, it } from "vitest";
import { SHANK_SWING_AXIS_MIN_ANGLE_DEG, shankSwingAxisCheck } from "../shank-swing-axis";

// Gravity along the sensor's y axis (the shank's long axis when the strap sits as intended), the
// swing about z; a rotated strap is modelled by turning the rotation axis towards y by a known angle.
function sensor(rotationFromLongAxisDeg: number) {
  const n = 500;
  const ones = (v: number) => new Float32Array(n).fill(v);
  const a = (rotationFromLongAxisDeg * Math.PI) / 180;
  const axis: [number, number, number] = [0, Math.cos(a), Math.sin(a)];
  return { accX: ones(0.3), accY: ones(9.81), accZ: ones(-0.2), axis, mask: new Uint8Array(n).fill(1) };
}

describe("shank swing-axis plausibility", () => {
  it("accepts a swing axis at right angles to the long axis", () => {
    const s = sensor(90);
    const r = shankSwingAxisCheck(s.accX, s.accY, s.accZ, s.axis, s.mask);
    expect(r.plausible).toBe(true);
    // Expected angle from the geometry: atan2 of the mean acceleration's component along z.
    const expected = 90 - (Math.atan2(0.2, Math.hypot(9.81, 0.3)) * 180) / Math.PI;
    expect(r.angleToLongAxisDeg).toBeCloseTo(expected, 6);
  });

  it("flags a sensor whose main rotation is about the long axis (twisted strap)", () => {
    const s = sensor(20);
    const r = shankSwingAxisCheck(s.accX, s.accY, s.accZ, s.axis, s.mask);
    expect(r.plausible).toBe(false);
    expect(r.angleToLongAxisDeg!).toBeLessThan(SHANK_SWING_AXIS_MIN_ANGLE_DEG);
  });

  it("switches at the stated angle, either sign of the axis", () => {
    for (const deg of [40, 50]) {
      const s = sensor(deg);
      const neg: [number, number, number] = [-s.axis[0], -s.axis[1], -s.axis[2]];
      const r1 = shankSwingAxisCheck(s.accX, s.accY, s.accZ, s.axis, s.mask);
      const r2 = shankSwingAxisCheck(s.accX, s.accY, s.accZ, neg, s.mask);
      expect(r1.plausible).toBe(deg >= SHANK_SWING_AXIS_MIN_ANGLE_DEG + 2);
      expect(r2.angleToLongAxisDeg).toBeCloseTo(r1.angleToLongAxisDeg!, 9);
    }
  });

  it("gives no verdict without masked samples", () => {
    const s = sensor(20);
    const r = shankSwingAxisCheck(s.accX, s.accY, s.accZ, s.axis, new Uint8Array(500));
    expect(r).toEqual({ plausible: true, angleToLongAxisDeg: null });
  });
});
