import { describe, expect, it } from "vitest";
import { refineContactsToImpact, shankImpactMagnitude } from "../shank-impact";

// Constructed signals (physics, no recording): gravity on y, a 1 Hz swing acceleration, white-ish
// noise from a fixed sequence, and heel strikes as damped 20 Hz transients e^(−t/15 ms)·sin(2π·20·t)
// of 20 m/s² along the long axis at known times. The impact magnitude must peak at the strike, and
// the refinement must move a gyroscope IC placed after it back to it, within one 20 Hz quarter
// period (12.5 ms; the transient's first peak is at that delay at most).

const FS = 100;

function shankAcc(n: number, strikesS: number[]): { accX: Float64Array; accY: Float64Array; accZ: Float64Array } {
  const accX = new Float64Array(n);
  const accY = new Float64Array(n);
  const accZ = new Float64Array(n);
  let seed = 7;
  const noise = () => {
    seed = (seed * 1103515245 + 12345) % 2147483648;
    return (seed / 2147483648 - 0.5) * 0.2;
  };
  for (let i = 0; i < n; i++) {
    const t = i / FS;
    accX[i] = 3 * Math.sin(2 * Math.PI * t) + noise();
    accY[i] = 9.81 + 2 * Math.cos(2 * Math.PI * t) + noise();
    accZ[i] = noise();
    for (const s of strikesS) {
      if (t < s) continue;
      const u = t - s;
      accY[i]! += 20 * Math.exp(-u / 0.015) * Math.sin(2 * Math.PI * 20 * u);
      accX[i]! += 6 * Math.exp(-u / 0.015) * Math.sin(2 * Math.PI * 20 * u);
    }
  }
  return { accX, accY, accZ };
}

describe("heel-strike impact refinement of shank ICs", () => {
  const n = 20 * FS;
  const strikes = [2.0, 4.0, 6.0, 8.0, 10.0, 12.0, 14.0, 16.0];
  const mask = new Uint8Array(n).fill(1);

  it("moves each gyroscope IC that follows a strike by the loading response back to the strike", () => {
    const impact = shankImpactMagnitude(shankAcc(n, strikes), mask, FS)!;
    const gyroIc = strikes.map((s) => Math.round((s + 0.08) * FS));
    const midSwing = strikes.map((s) => Math.round((s - 0.3) * FS));
    const stride = strikes.map(() => 2 * FS);
    const refined = refineContactsToImpact(gyroIc, midSwing, stride, impact, mask, FS);
    for (let k = 0; k < strikes.length; k++) {
      const errS = refined[k]! / FS - strikes[k]!;
      expect(errS).toBeGreaterThanOrEqual(0);
      expect(errS).toBeLessThanOrEqual(0.0125);
    }
  });

  it("keeps the gyroscope IC when there is no impact (smooth landing: only swing and noise)", () => {
    const impact = shankImpactMagnitude(shankAcc(n, []), mask, FS)!;
    const gyroIc = strikes.map((s) => Math.round((s + 0.08) * FS));
    const refined = refineContactsToImpact(gyroIc, gyroIc.map((g) => g - 30), strikes.map(() => 2 * FS), impact, mask, FS);
    expect(refined).toEqual(gyroIc);
  });

  it("keeps the gyroscope IC when the strike lies outside the window (10 % of the stride before it)", () => {
    const impact = shankImpactMagnitude(shankAcc(n, strikes), mask, FS)!;
    // Strike 300 ms before the gyroscope IC on a 1 s stride: beyond the 100 ms the rule allows.
    const gyroIc = strikes.map((s) => Math.round((s + 0.3) * FS));
    const refined = refineContactsToImpact(gyroIc, strikes.map((s) => Math.round((s - 0.5) * FS)), strikes.map(() => FS), impact, mask, FS);
    expect(refined).toEqual(gyroIc);
  });

  it("has no impact band at 30 Hz (the 15 Hz high-pass needs a higher rate)", () => {
    expect(shankImpactMagnitude(shankAcc(300, []), new Uint8Array(300).fill(1), 30)).toBeNull();
  });
});
