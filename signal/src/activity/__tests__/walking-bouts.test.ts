import { describe, expect, it } from "vitest";
import { hypot3 } from "../hypot3";
import { WALKING_MEAN_GYRO_DEG_S, detectWalkingMask } from "../walking-bouts";

/** Small seeded LCG (Numerical Recipes constants), so every run sees the same numbers. */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

describe("hypot3(x, y, z)", () => {
  // Reference: ECMAScript Math.hypot (ECMA-262 §21.3.2.18) as the running engine computes it.
  it("is bit-identical to Math.hypot on float32 gyro triples of every scale, and on the special values", () => {
    const rnd = lcg(42);
    const f = new Float32Array(3);
    const mismatches: number[][] = [];
    for (let i = 0; i < 200_000; i++) {
      const scale = [1e-3, 1, 30, 500, 1e5][i % 5]!;
      f[0] = (rnd() - 0.5) * scale;
      f[1] = i % 7 === 0 ? 0 : (rnd() - 0.5) * scale;
      f[2] = (rnd() - 0.5) * scale;
      if (!Object.is(hypot3(f[0], f[1], f[2]), Math.hypot(f[0], f[1], f[2]))) mismatches.push(Array.from(f));
    }
    expect(mismatches).toEqual([]);
    for (const [x, y, z] of [
      [0, 0, 0],
      [-0, -0, 0],
      [3, 4, 12],
      [Number.NaN, 1, 2],
      [Number.POSITIVE_INFINITY, Number.NaN, 1],
      [1, Number.NEGATIVE_INFINITY, 0],
      [1e308, 1e308, 1e308],
      [5e-324, 0, 5e-324],
    ] as const) {
      expect(Object.is(hypot3(x, y, z), Math.hypot(x, y, z)), `${x},${y},${z}`).toBe(true);
    }
    expect(hypot3(3, 4, 12)).toBe(13);
  });
});

describe("detectWalkingMask(legGyro, sampleRateHz, length)", () => {
  // Definition (signal/README.md): centred 1 s mean of the gyro magnitude over valid samples > 15 °/s.
  it("marks exactly the valid samples whose centred 1 s mean |ω| exceeds the threshold (brute-force window)", () => {
    const fs = 50;
    const n = 3000;
    const rnd = lcg(7);
    const sensors = [0, 1].map(() => {
      const x = new Float32Array(n);
      const y = new Float32Array(n);
      const z = new Float32Array(n);
      const valid = new Uint8Array(n);
      for (let i = 0; i < n; i++) {
        const walking = Math.floor(i / 400) % 2 === 1;
        const amp = walking ? 60 : 8;
        x[i] = (rnd() - 0.5) * amp;
        y[i] = (rnd() - 0.5) * amp;
        z[i] = amp * Math.sin((2 * Math.PI * i) / fs) + (rnd() - 0.5) * 4;
        valid[i] = i % 997 < 940 ? 1 : 0;
      }
      return { x, y, z, valid };
    });
    const mask = detectWalkingMask(sensors, fs, n);
    const half = Math.round(fs / 2);
    const expected = new Uint8Array(n);
    for (const s of sensors) {
      for (let i = 0; i < n; i++) {
        if (!s.valid[i]) continue;
        let sum = 0;
        let c = 0;
        for (let k = Math.max(0, i - half); k <= Math.min(n - 1, i + half); k++) {
          if (!s.valid[k]) continue;
          sum += Math.hypot(s.x[k]!, s.y[k]!, s.z[k]!);
          c++;
        }
        if (c > 0 && sum / c > WALKING_MEAN_GYRO_DEG_S) expected[i] = 1;
      }
    }
    expect(Array.from(mask)).toEqual(Array.from(expected));
    const walkingShare = mask.reduce((a, v) => a + v, 0) / n;
    expect(walkingShare).toBeGreaterThan(0.3);
    expect(walkingShare).toBeLessThan(0.6);
  });
});
