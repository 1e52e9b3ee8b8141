import type { Bout, PerSide, Side } from "../../types";
import type { Prng } from "../prng";
import { NORMATIVE_STANCE_FRACTION } from "./leg-pattern";

/** A bout as the schedule needs it (session times, resolved defaults). */
export interface ScheduleBout {
  /** Walking time without pauses, s. */
  walkingS: number;
  strideTimeS: number;
  strideTimeCvPct: number;
  romScale: number;
}

export interface ScheduleEpisode {
  boutIndex: number;
  startS: number;
  durationS: number;
  strideTimeScale: number;
  romScale: number;
  strideTimeCvPct: number;
}

export interface ScheduleHesitation {
  boutIndex: number;
  atS: number;
  durationS: number;
}

export interface ScheduleParams {
  /** Session time at which the first bout starts. */
  firstStartS: number;
  /** Quiet standing between one bout's fade-out and the next bout's start, s (≥ 2). */
  standingBetweenS: number;
  bouts: ScheduleBout[];
  stanceFraction: PerSide<number>;
  stepFraction: number;
  episodes: ScheduleEpisode[];
  hesitations: ScheduleHesitation[];
}

export interface ScheduledStride {
  side: Side;
  icS: number;
  nextIcS: number;
  fcS: number;
  boutIndex: number;
  boutEdge: boolean;
  containsPause: boolean;
}

/** Knots of a monotone phase clock (strictly increasing times). */
export interface PhaseKnots {
  t: number[];
  v: number[];
}

export interface ScheduledLeg {
  ic: number[];
  fc: number[];
  strides: ScheduledStride[];
  /** Normative phase: IC at integers, FC at integer + 0.6, flat through pauses and standing. */
  normativePhase: PhaseKnots;
  /** Stride phase: IC at integers only (even in time between ICs); the arms lock to it. */
  stridePhase: PhaseKnots;
}

export interface WalkingSpan {
  /** Gait starts (both feet down, the left foot about to lift). */
  startS: number;
  /** First left IC: the walking envelope is full from here. */
  fullS: number;
  /** Last IC of the bout (either side). */
  lastIcS: number;
  /** Envelope back to 0 (standing). */
  endS: number;
}

export interface GaitSchedule {
  left: ScheduledLeg;
  right: ScheduledLeg;
  /** Step phase: every IC of either side at consecutive integers (drives the pelvis). */
  stepPhase: PhaseKnots;
  /** ROM multiplier over time (bout and episode scales), linear between knots. */
  rom: PhaseKnots;
  spans: WalkingSpan[];
  hesitations: Bout[];
  /** Session time at which the last bout's envelope has returned to 0. */
  endS: number;
}

/** Seconds from bout start to the left foot's first lift-off (gait initiation; common practice ≈ 0.3 s). */
export const INITIATION_S = 0.3;
/** Seconds after a bout's last IC over which the gait pattern fades into standing (common practice). */
export const TERMINATION_S = 0.8;

/**
 * Contacts of both legs, bout by bout, from stride-time draws: the left leg leads; its stride k is
 * T_k = T·s_ep·(1 + cv·z), z ~ N(0, 1) clamped to ±3; the right IC falls at `stepFraction` of the
 * left stride; FC = IC + stance fraction × that side's stride. Hesitations insert a standing pause
 * just after an IC (both feet down); all later events shift by its length. Contacts are defined
 * here, by the schedule, and the segment angles follow them; nothing is read back from a signal.
 */
export function buildKinematicSchedule(p: ScheduleParams, prng: Prng): GaitSchedule {
  const legs: PerSide<ScheduledLeg> = {
    left: { ic: [], fc: [], strides: [], normativePhase: { t: [], v: [] }, stridePhase: { t: [], v: [] } },
    right: { ic: [], fc: [], strides: [], normativePhase: { t: [], v: [] }, stridePhase: { t: [], v: [] } },
  };
  const stepPhase: PhaseKnots = { t: [], v: [] };
  const rom: PhaseKnots = { t: [], v: [] };
  const spans: WalkingSpan[] = [];
  const hesitations: Bout[] = [];
  const counter = { left: 0, right: 0, step: 0 };
  const sL = p.stanceFraction.left;
  const sR = p.stanceFraction.right;
  const f = p.stepFraction;

  let nextStartS = p.firstStartS;
  p.bouts.forEach((spec, b) => {
    const bout = { ...spec, startS: nextStartS };
    const episodes = p.episodes.filter((e) => e.boutIndex === b);
    const scaleAt = (tau: number) => {
      let strideScale = 1;
      let romScale = 1;
      let cv = bout.strideTimeCvPct;
      for (const e of episodes) {
        if (tau < e.startS || tau > e.startS + e.durationS) continue;
        const ramp = Math.min(1, (tau - e.startS) / (0.3 * e.durationS));
        strideScale = 1 + ramp * (e.strideTimeScale - 1);
        romScale = 1 + ramp * (e.romScale - 1);
        cv = e.strideTimeCvPct;
      }
      return { strideScale, romScale, cv };
    };
    // Left contacts in walking time τ (pauses excluded), from the bout start.
    const draw = (tau: number) => {
      const s = scaleAt(tau);
      const z = Math.max(-3, Math.min(3, prng.normal()));
      return bout.strideTimeS * s.strideScale * (1 + (s.cv / 100) * z);
    };
    const fc0 = INITIATION_S;
    const icL: number[] = [];
    let tau = fc0 + (1 - sL) * draw(fc0);
    while (tau <= bout.walkingS) {
      icL.push(tau);
      tau += draw(tau);
    }
    if (icL.length < 3) throw new RangeError(`bout ${b} is too short for two strides (${bout.walkingS} s at ${bout.strideTimeS} s per stride)`);
    const fcL = [fc0];
    for (let k = 0; k + 1 < icL.length; k++) fcL.push(icL[k]! + sL * (icL[k + 1]! - icL[k]!));
    const icR: number[] = [];
    for (let k = 0; k + 1 < icL.length; k++) icR.push(icL[k]! + f * (icL[k + 1]! - icL[k]!));
    const firstStrideR = icR.length > 1 ? icR[1]! - icR[0]! : icL[1]! - icL[0]!;
    const fcR = [icR[0]! - (1 - sR) * firstStrideR];
    for (let k = 0; k + 1 < icR.length; k++) fcR.push(icR[k]! + sR * (icR[k + 1]! - icR[k]!));
    checkOrder(icL, fcL, icR, fcR, b);

    // Pauses: just after the first IC (either side) at or after atS, before the next contact.
    const allEvents = [...icL, ...fcL, ...icR, ...fcR].sort((x, y) => x - y);
    const pauses: { tau: number; durationS: number }[] = [];
    for (const h of p.hesitations.filter((x) => x.boutIndex === b)) {
      const ic = [...icL, ...icR].sort((x, y) => x - y).find((t) => t >= h.atS);
      if (ic === undefined) throw new RangeError(`hesitation at ${h.atS} s is after the last contact of bout ${b}`);
      const next = allEvents.find((t) => t > ic) ?? ic + 0.2;
      pauses.push({ tau: ic + 0.4 * (next - ic), durationS: h.durationS });
    }
    pauses.sort((x, y) => x.tau - y.tau);
    const real = (t: number) => bout.startS + t + pauses.filter((q) => q.tau < t).reduce((s, q) => s + q.durationS, 0);
    for (const q of pauses) hesitations.push({ startS: real(q.tau), endS: real(q.tau) + q.durationS });

    const lastIc = Math.max(icL[icL.length - 1]!, icR[icR.length - 1]!);
    const span: WalkingSpan = { startS: bout.startS, fullS: real(icL[0]!), lastIcS: real(lastIc), endS: real(lastIc) + TERMINATION_S };
    spans.push(span);
    nextStartS = span.endS + p.standingBetweenS;

    // Phase clocks, in walking time first, then mapped to session time with flat pause knots.
    const sides: [Side, number[], number[], number][] = [
      ["left", icL, fcL, sL],
      ["right", icR, fcR, sR],
    ];
    for (const [side, ic, fc, s] of sides) {
      const leg = legs[side];
      const base = counter[side] + 1;
      // Normative phase knots: FC_j at (base + j − 1) + 0.6, IC_k at base + k.
      const nt: number[] = [];
      const nv: number[] = [];
      const q0 = base - 1 + NORMATIVE_STANCE_FRACTION;
      // Before lift-off the leg stands in the stance posture it started from.
      const startPhase = q0 - Math.min(0.5, (NORMATIVE_STANCE_FRACTION * fc[0]!) / (s * bout.strideTimeS));
      nt.push(0);
      nv.push(startPhase);
      for (let j = 0; j < fc.length; j++) {
        nt.push(fc[j]!);
        nv.push(base - 1 + j + NORMATIVE_STANCE_FRACTION);
        nt.push(ic[j]!);
        nv.push(base + j);
      }
      for (let j = fc.length; j < ic.length; j++) {
        nt.push(ic[j]!);
        nv.push(base + j);
      }
      // After the last IC the leg moves a little further into stance and stops.
      const lastPhase = base + ic.length - 1;
      const stop = lastIc + 0.3;
      const lastT = ic[ic.length - 1]!;
      const endPhase = lastPhase + Math.min(0.45, (NORMATIVE_STANCE_FRACTION * (stop - lastT)) / (s * bout.strideTimeS));
      nt.push(stop);
      nv.push(endPhase);
      appendClock(leg.normativePhase, nt, nv, pauses, real, span);

      const ut = [0, ...ic, stop];
      const uv = [base - Math.min(0.9, (ic[0]! - 0) / bout.strideTimeS), ...ic.map((_, k) => base + k), lastPhase + Math.min(0.45, (stop - lastT) / bout.strideTimeS)];
      appendClock(leg.stridePhase, ut, uv, pauses, real, span);
      counter[side] = Math.ceil(endPhase) + 1;

      for (const t of ic) leg.ic.push(real(t));
      for (const t of fc) leg.fc.push(real(t));
      for (let k = 0; k + 1 < ic.length; k++) {
        const fcK = fc.find((t) => t > ic[k]! && t < ic[k + 1]!)!;
        leg.strides.push({
          side,
          icS: real(ic[k]!),
          nextIcS: real(ic[k + 1]!),
          fcS: real(fcK),
          boutIndex: b,
          boutEdge: k === 0 || k + 2 === ic.length,
          containsPause: pauses.some((q) => q.tau > ic[k]! && q.tau < ic[k + 1]!),
        });
      }
    }
    // Step clock: every IC of either side, in order.
    const steps = [...icL, ...icR].sort((x, y) => x - y);
    const base = counter.step + 1;
    const st = [0, ...steps, lastIc + 0.3];
    const sv = [base - 0.5, ...steps.map((_, j) => base + j), base + steps.length - 1 + 0.2];
    appendClock(stepPhase, st, sv, pauses, real, span);
    counter.step = base + steps.length + 1;

    // ROM multiplier: the bout's scale times the episode's, sampled every 0.25 s of walking.
    for (let t = 0; t <= bout.walkingS + 0.3; t += 0.25) {
      const at = real(t);
      if (rom.t.length && at <= rom.t[rom.t.length - 1]!) continue;
      rom.t.push(at);
      rom.v.push(bout.romScale * scaleAt(t).romScale);
    }
  });
  return { left: legs.left, right: legs.right, stepPhase, rom, spans, hesitations, endS: spans[spans.length - 1]!.endS };
}

/**
 * Appends one bout's clock knots (walking time → session time). A pause becomes two knots of equal
 * phase (the clock stops); the clock is held flat from 1 s before the bout and through its fade-out.
 */
function appendClock(
  out: PhaseKnots,
  t: number[],
  v: number[],
  pauses: { tau: number; durationS: number }[],
  real: (tau: number) => number,
  span: WalkingSpan,
): void {
  const knots: [number, number][] = t.map((x, i) => [x, v[i]!]);
  for (const q of pauses) {
    const i = knots.findIndex(([x]) => x > q.tau);
    const [x0, v0] = knots[i - 1]!;
    const [x1, v1] = knots[i]!;
    const phase = v0 + ((v1 - v0) * (q.tau - x0)) / (x1 - x0);
    knots.splice(i, 0, [q.tau, phase]);
  }
  // Session times: a pause knot appears at its start and again at its end.
  const times: number[] = [];
  const values: number[] = [];
  for (const [x, val] of knots) {
    const pause = pauses.find((q) => q.tau === x);
    if (pause) {
      times.push(real(x));
      values.push(val);
      times.push(real(x) + pause.durationS);
      values.push(val);
    } else {
      times.push(real(x));
      values.push(val);
    }
  }
  const first = values[0]!;
  const last = values[values.length - 1]!;
  push(out, span.startS - 1, first);
  for (let i = 0; i < times.length; i++) push(out, times[i]!, values[i]!);
  push(out, span.endS + 0.5, last);
}

function push(k: PhaseKnots, t: number, v: number): void {
  const n = k.t.length;
  if (n && t <= k.t[n - 1]!) throw new RangeError(`phase knots out of order at ${t.toFixed(3)} s`);
  if (n && v < k.v[n - 1]!) {
    // A new bout's clock restarts from a higher count; it may not run backwards.
    throw new RangeError(`phase clock would run backwards at ${t.toFixed(3)} s`);
  }
  k.t.push(t);
  k.v.push(v);
}

/** IC_L < FC_R < IC_R < FC_L < next IC_L: each foot lifts only after the other has landed. */
function checkOrder(icL: number[], fcL: number[], icR: number[], fcR: number[], bout: number): void {
  for (let k = 0; k + 1 < icL.length; k++) {
    const order = [icL[k]!, fcR[k]!, icR[k]!, fcL[k + 1]!, icL[k + 1]!];
    for (let i = 1; i < order.length; i++) {
      if (!(order[i]! > order[i - 1]!)) {
        throw new RangeError(`bout ${bout}: stance/step settings leave no double support (stride ${k}); raise the stance fraction or move stepFraction toward 0.5`);
      }
    }
  }
}
