import type { GaitEvent, LegSchedule, Span, TurnSpan } from "./gait-schedule";
import type { Prng } from "./prng";

/** Shank sagittal angular-velocity shape, deg/s, as multiples of the mid-swing peak. */
export interface ShankShape {
  midSwingPeakDegS: number;
  /** Depth of the dip at IC and at FC, and the small positive rebound just after IC. */
  icDipFraction: number;
  fcDipFraction: number;
  reboundFraction: number;
}

export const DEFAULT_SHANK_SHAPE: Omit<ShankShape, "midSwingPeakDegS"> = {
  icDipFraction: 0.3,
  fcDipFraction: 0.4,
  reboundFraction: 0.06,
};

/** Fraction of the stride after IC where the rebound peaks; of the swing where mid-swing peaks. */
const REBOUND_AT = 0.06;
const MID_SWING_AT = 0.45;

/**
 * Knots (time, value) of a shank's sagittal angular velocity, joined by half-cosine segments.
 * Every knot has zero slope, so each IC and FC knot is an exact local minimum of the noiseless
 * signal: the truth events are the dips (IC = first minimum after mid-swing, FC = last minimum
 * before it, Aminian et al. 2002; Salarian et al. 2004). Standing is 0 deg/s.
 */
export function shankKnots(
  leg: LegSchedule,
  shape: ShankShape,
  nominalStrideS: number,
  prng: Prng,
): { t: Float64Array; v: Float64Array } {
  const t: number[] = [];
  const v: number[] = [];
  const push = (time: number, value: number) => {
    if (t.length && time <= t[t.length - 1]!) return;
    t.push(time);
    v.push(value);
  };
  for (const bout of leg.bouts) {
    bout.forEach((e: GaitEvent, idx: number) => {
      const scale = shape.midSwingPeakDegS * (1 + 0.05 * prng.normal());
      if (e.kind === "fc") {
        const nextIc = bout[idx + 1]!.t;
        if (idx === 0) push(e.t - 0.25 * nominalStrideS, 0);
        push(e.t, -shape.fcDipFraction * scale);
        push(e.t + MID_SWING_AT * (nextIc - e.t), scale);
      } else {
        // Events alternate ic, fc, ic: the next IC of this leg is two entries on.
        const nextIcEvent = bout[idx + 2];
        const stride = nextIcEvent ? nextIcEvent.t - e.t : nominalStrideS;
        push(e.t, -shape.icDipFraction * scale);
        push(e.t + REBOUND_AT * stride, shape.reboundFraction * scale);
        if (idx === bout.length - 1) push(e.t + 0.4 * nominalStrideS, 0);
      }
    });
  }
  return { t: Float64Array.from(t), v: Float64Array.from(v) };
}

/**
 * Phase (radians) of the first Fourier component of the shank template, so that the template is
 * ≈ a·cos(2π·g + θ) for gait phase g (cycles since IC). Arms are built on 2π·g + θ, making the
 * expected Hilbert relative phase equal to the arm's configured offset.
 */
export function shankFundamentalPhase(stanceFraction: number, shape: Omit<ShankShape, "midSwingPeakDegS">): number {
  const s = stanceFraction;
  const kt = [0, REBOUND_AT, s, s + MID_SWING_AT * (1 - s), 1];
  const kv = [-shape.icDipFraction, shape.reboundFraction, -shape.fcDipFraction, 1, -shape.icDipFraction];
  const n = 4096;
  let re = 0;
  let im = 0;
  let j = 0;
  for (let i = 0; i < n; i++) {
    const p = i / n;
    while (j < kt.length - 2 && p >= kt[j + 1]!) j++;
    const u = (p - kt[j]!) / (kt[j + 1]! - kt[j]!);
    const w = kv[j]! + (kv[j + 1]! - kv[j]!) * 0.5 * (1 - Math.cos(Math.PI * u));
    re += w * Math.cos(2 * Math.PI * p);
    im -= w * Math.sin(2 * Math.PI * p);
  }
  return Math.atan2(im, re);
}

/** Evaluates half-cosine knot interpolation at increasing times (pointer walk, O(n + knots)). */
export function evaluateKnots(knots: { t: Float64Array; v: Float64Array }, times: Float64Array, out: Float64Array): void {
  const kt = knots.t;
  const kv = knots.v;
  const m = kt.length;
  let j = 0;
  for (let i = 0; i < times.length; i++) {
    const x = times[i]!;
    if (m === 0) {
      out[i] = 0;
      continue;
    }
    while (j < m - 1 && x >= kt[j + 1]!) j++;
    if (x <= kt[0]!) out[i] = kv[0]!;
    else if (j >= m - 1) out[i] = kv[m - 1]!;
    else {
      const u = (x - kt[j]!) / (kt[j + 1]! - kt[j]!);
      out[i] = kv[j]! + (kv[j + 1]! - kv[j]!) * 0.5 * (1 - Math.cos(Math.PI * u));
    }
  }
}

/** Gait phase in cycles (0 at the first IC, +1 per stride), linear between ICs, extrapolated at T. */
export function evaluateGaitPhase(ic: readonly number[], nominalStrideS: number, times: Float64Array, out: Float64Array): void {
  const m = ic.length;
  let j = 0;
  for (let i = 0; i < times.length; i++) {
    const x = times[i]!;
    if (m === 0) {
      out[i] = x / nominalStrideS;
      continue;
    }
    while (j < m - 1 && x >= ic[j + 1]!) j++;
    if (x < ic[0]!) out[i] = (x - ic[0]!) / nominalStrideS;
    else if (j >= m - 1) out[i] = m - 1 + (x - ic[m - 1]!) / nominalStrideS;
    else out[i] = j + (x - ic[j]!) / (ic[j + 1]! - ic[j]!);
  }
}

/** 1 inside walking bouts, 0 outside, with 1 s raised-cosine ramps inside each bout's ends. */
export function walkingEnvelope(bouts: readonly Span[], times: Float64Array, out: Float64Array): void {
  const ramp = 1;
  let j = 0;
  for (let i = 0; i < times.length; i++) {
    const x = times[i]!;
    while (j < bouts.length - 1 && x > bouts[j]!.endS) j++;
    const b = bouts[j];
    if (!b || x < b.startS || x > b.endS) {
      out[i] = 0;
      continue;
    }
    const edge = Math.min(x - b.startS, b.endS - x);
    out[i] = edge >= ramp ? 1 : 0.5 * (1 - Math.cos((Math.PI * edge) / ramp));
  }
}

/** Yaw rate about the vertical, deg/s: each turn a raised-cosine pulse integrating to its angle. */
export function turnRate(turns: readonly TurnSpan[], times: Float64Array, out: Float64Array): void {
  out.fill(0);
  for (const turn of turns) {
    const d = turn.endS - turn.startS;
    for (let i = lowerBound(times, turn.startS); i < times.length && times[i]! < turn.endS; i++) {
      const x = times[i]!;
      out[i] = out[i]! + (turn.angleDeg / d) * (1 - Math.cos((2 * Math.PI * (x - turn.startS)) / d));
    }
  }
}

/** First index with times[i] ≥ x (times increasing). */
export function lowerBound(times: Float64Array, x: number): number {
  let lo = 0;
  let hi = times.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (times[mid]! < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
