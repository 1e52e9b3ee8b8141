import { describe, expect, it } from "vitest";
import { detectInvertedShank } from "../detect-inverted-segment";
import { projectOnAxis, sagittalAxis } from "../sagittal-axis";

// Simulated shank gyro: a swing-like waveform about a tilted axis plus small off-axis motion.
function simulate(axis: [number, number, number], n = 3000, fs = 100) {
  const gx = new Float64Array(n);
  const gy = new Float64Array(n);
  const gz = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const p = (2 * Math.PI * i) / (1.1 * fs);
    const w = 300 * Math.max(0, Math.sin(p)) ** 3 - 60 * Math.max(0, -Math.sin(p));
    const off = 15 * Math.sin(2 * p + 1);
    gx[i] = w * axis[0] + off * 0.6;
    gy[i] = w * axis[1] - off * 0.8;
    gz[i] = w * axis[2];
  }
  return { gx, gy, gz };
}

describe("sagittalAxis(gyro, mask)", () => {
  it("recovers a 25°-tilted axis within 2° (docs/methods.md#sagittal-axis: PCA axis recovery < 2°, computed)", () => {
    const t = (25 * Math.PI) / 180;
    const truth: [number, number, number] = [Math.sin(t) * 0.6, Math.sin(t) * 0.8, Math.cos(t)];
    const { gx, gy, gz } = simulate(truth);
    const r = sagittalAxis(gx, gy, gz, new Uint8Array(gx.length).fill(1))!;
    const dot = r.axis[0] * truth[0] + r.axis[1] * truth[1] + r.axis[2] * truth[2];
    expect((Math.acos(Math.min(1, dot)) * 180) / Math.PI).toBeLessThan(2);
    expect(r.axis[2]).toBeGreaterThan(0);
    expect(r.explainedVariance).toBeGreaterThan(0.9);
  });

  it("returns null with too few masked samples", () => {
    const { gx, gy, gz } = simulate([0, 0, 1]);
    expect(sagittalAxis(gx, gy, gz, new Uint8Array(gx.length))).toBeNull();
  });

  it("detectInvertedShank flags a shank whose dominant excursion is negative", () => {
    const { gx, gy, gz } = simulate([0, 0, 1]);
    const mask = new Uint8Array(gx.length).fill(1);
    expect(detectInvertedShank(projectOnAxis(gx, gy, gz, [0, 0, 1]), mask).inverted).toBe(false);
    expect(detectInvertedShank(projectOnAxis(gx, gy, gz, [0, 0, 1], -1), mask).inverted).toBe(true);
  });
});
