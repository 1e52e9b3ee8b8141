import type { Prng } from "./prng";

export interface Span {
  startS: number;
  endS: number;
}

export interface TurnSpan extends Span {
  angleDeg: number;
}

export type GaitEventKind = "ic" | "fc";

export interface GaitEvent {
  t: number;
  kind: GaitEventKind;
}

/** One leg's events, bout by bout: each bout alternates fc, ic, …, ends with an ic. */
export interface LegSchedule {
  bouts: GaitEvent[][];
  ic: number[];
  fc: number[];
  /** Consecutive same-side IC intervals inside a bout. */
  strideTimesS: number[];
}

export interface GaitScheduleParams {
  walkingBouts: Span[];
  turns: TurnSpan[];
  strideTimeS: number;
  strideTimeCvPct: number;
  stanceFraction: { left: number; right: number };
  /** Right IC as a fraction of the left stride after the left IC (0.5 = symmetric steps). */
  stepFraction: number;
  /** Strides overlapping a turn are this much longer (common practice: turning slows gait). */
  turnStrideFactor: number;
}

/**
 * Left and right initial/final contacts for each walking bout. The left leg leads: it lifts off
 * (FC) 50 ms into the bout; the right lifts off later. Stride times are drawn as
 * T·(1 + cv·N(0,1)), clamped to 0.7–1.4 T. The right IC of left stride k falls at
 * stepFraction of that stride, so step-time asymmetry comes from stepFraction ≠ 0.5.
 */
export function buildGaitSchedule(p: GaitScheduleParams, prng: Prng): { left: LegSchedule; right: LegSchedule } {
  const left: LegSchedule = { bouts: [], ic: [], fc: [], strideTimesS: [] };
  const right: LegSchedule = { bouts: [], ic: [], fc: [], strideTimesS: [] };
  const t0 = p.strideTimeS;
  const inTurn = (a: number, b: number) => p.turns.some((turn) => a < turn.endS && b > turn.startS);
  const draw = (at: number): number => {
    const base = t0 * Math.min(1.4, Math.max(0.7, 1 + (p.strideTimeCvPct / 100) * prng.normal()));
    return inTurn(at, at + base) ? base * p.turnStrideFactor : base;
  };
  const sL = p.stanceFraction.left;
  const sR = p.stanceFraction.right;

  for (const bout of p.walkingBouts) {
    const firstFc = bout.startS + 0.05;
    const icL: number[] = [];
    let t = firstFc + (1 - sL) * draw(firstFc);
    while (t <= bout.endS) {
      icL.push(t);
      t += draw(t);
    }
    // A bout needs at least two left strides and one complete right stride.
    if (icL.length < 3) continue;
    const icR: number[] = [];
    for (let k = 0; k + 1 < icL.length; k++) icR.push(icL[k]! + p.stepFraction * (icL[k + 1]! - icL[k]!));

    const evL: GaitEvent[] = [{ t: firstFc, kind: "fc" }];
    for (let k = 0; k < icL.length; k++) {
      evL.push({ t: icL[k]!, kind: "ic" });
      if (k + 1 < icL.length) evL.push({ t: icL[k]! + sL * (icL[k + 1]! - icL[k]!), kind: "fc" });
    }
    const firstStrideR = icR.length > 1 ? icR[1]! - icR[0]! : icL[1]! - icL[0]!;
    const evR: GaitEvent[] = [{ t: icR[0]! - (1 - sR) * firstStrideR, kind: "fc" }];
    for (let k = 0; k < icR.length; k++) {
      evR.push({ t: icR[k]!, kind: "ic" });
      if (k + 1 < icR.length) evR.push({ t: icR[k]! + sR * (icR[k + 1]! - icR[k]!), kind: "fc" });
    }
    addBout(left, evL);
    addBout(right, evR);
  }
  return { left, right };
}

function addBout(leg: LegSchedule, events: GaitEvent[]): void {
  leg.bouts.push(events);
  let prevIc: number | null = null;
  for (const e of events) {
    if (e.kind === "fc") leg.fc.push(e.t);
    else {
      if (prevIc !== null) leg.strideTimesS.push(e.t - prevIc);
      prevIc = e.t;
      leg.ic.push(e.t);
    }
  }
}
