import type { LegEvents } from "../../gait-events";

// A walker's contact times from a pace model, for testing the stride rules without any detector:
// stride time T(t) = T_ss·(1 + startExcess·e^(−t/τ_start) + endExcess·e^(−(t_end − t)/τ_end))·(1 + c·z),
// z ~ N(0, 1). Slower strides while speeding up from standing and while slowing to a stop are the
// acceleration and deceleration phases (Lindemann et al. 2008); the truth of which stride is in
// them comes from this model (its deterministic excess), not from the rule under test. The right
// IC follows the left one by stepFraction of the stride, each FC ends a stance of stanceFraction.

export interface PaceModel {
  startS?: number;
  strides: number;
  steadyStrideTimeS: number;
  /** Multiplicative stride-to-stride variation (CV as a fraction, e.g. 0.02). */
  cv: number;
  startExcess?: number;
  startTauS?: number;
  endExcess?: number;
  endTauS?: number;
  stepFraction?: number;
  stanceFraction?: number;
  seed: number;
}

export interface PacedWalk {
  left: LegEvents;
  right: LegEvents;
  /** Left stride k: its start and the model's deterministic excess over the steady pace (fraction). */
  leftStrides: { icS: number; excess: number; strideTimeS: number }[];
  endS: number;
}

export function gaussianStream(seed: number): () => number {
  let s = seed >>> 0;
  const u = () => {
    s = (s + 0x6d2b79f5) >>> 0;
    let t = s;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return (((t ^ (t >>> 14)) >>> 0) + 0.5) / 4294967296;
  };
  return () => Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
}

export function pacedWalk(m: PaceModel): PacedWalk {
  const z = gaussianStream(m.seed);
  const t0 = m.startS ?? 0;
  const step = m.stepFraction ?? 0.5;
  const stance = m.stanceFraction ?? 0.62;
  const nominalEnd = t0 + m.strides * m.steadyStrideTimeS;
  const left: LegEvents = { initialContactsS: [], finalContactsS: [], midSwingsS: [] };
  const right: LegEvents = { initialContactsS: [], finalContactsS: [], midSwingsS: [] };
  const leftStrides: PacedWalk["leftStrides"] = [];
  let t = t0;
  for (let k = 0; k < m.strides; k++) {
    const excess =
      (m.startExcess ?? 0) * Math.exp(-(t - t0) / (m.startTauS ?? 1)) + (m.endExcess ?? 0) * Math.exp(-Math.max(0, nominalEnd - t) / (m.endTauS ?? 1));
    const T = m.steadyStrideTimeS * (1 + excess) * (1 + m.cv * z());
    left.initialContactsS.push(t);
    left.finalContactsS.push(t + stance * T);
    right.initialContactsS.push(t + step * T);
    right.finalContactsS.push(t + (step + stance - 1) * T + (step + stance - 1 < 0 ? T : 0));
    leftStrides.push({ icS: t, excess, strideTimeS: T });
    t += T;
  }
  left.initialContactsS.push(t);
  return { left, right, leftStrides, endS: t };
}
