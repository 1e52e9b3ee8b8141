import type { Side } from "../../types";
import type { BodyModel } from "./body-model";

const SAMPLES = 256;

/** Phase (degrees) of harmonic k of f over [t0, t1), sampled evenly: f ≈ |c| cos(2πk(t − t0)/(t1 − t0) + phase). */
export function harmonicPhaseDeg(f: (t: number) => number, t0: number, t1: number, k: number): number {
  let re = 0;
  let im = 0;
  for (let i = 0; i < SAMPLES; i++) {
    const v = f(t0 + ((t1 - t0) * i) / SAMPLES);
    const w = (2 * Math.PI * k * i) / SAMPLES;
    re += v * Math.cos(w);
    im -= v * Math.sin(w);
  }
  return (Math.atan2(im, re) * 180) / Math.PI;
}

export function wrapDeg(d: number): number {
  let x = d - 360 * Math.floor((d + 180) / 360);
  if (x <= -180) x += 360;
  return x;
}

export function circularMeanDeg(values: readonly number[]): number {
  let s = 0;
  let c = 0;
  for (const v of values) {
    s += Math.sin((v * Math.PI) / 180);
    c += Math.cos((v * Math.PI) / 180);
  }
  return wrapDeg((Math.atan2(s, c) * 180) / Math.PI);
}

/**
 * Relative phase of an arm to the contralateral leg over one contralateral stride [t0, t1), from the
 * model's angles: ψ_angle = phase of the arm angle's harmonic n − n × phase of the shank angle's first
 * harmonic. On angular rates every harmonic k gains +90°, so ψ_rate = ψ_angle + 90°·(1 − n).
 */
export function strideRelativePhaseDeg(model: BodyModel, arm: Side, n: 1 | 2, t0: number, t1: number): { angle: number; rate: number } {
  const leg: Side = arm === "left" ? "right" : "left";
  const armPhase = harmonicPhaseDeg((t) => model.armAngleDeg(arm, t), t0, t1, n);
  const legPhase = harmonicPhaseDeg((t) => model.legAngles(leg, t).shank, t0, t1, 1);
  const angle = wrapDeg(armPhase - n * legPhase);
  return { angle, rate: wrapDeg(angle + 90 * (1 - n)) };
}

/** Range (max − min) of the arm angle within [t0, t1), degrees. */
export function armRangeDeg(model: BodyModel, arm: Side, t0: number, t1: number): number {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < SAMPLES; i++) {
    const v = model.armAngleDeg(arm, t0 + ((t1 - t0) * i) / SAMPLES);
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  return hi - lo;
}
