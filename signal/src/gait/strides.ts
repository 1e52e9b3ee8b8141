import type { Bout, Side, Stride } from "../types";
import type { LegEvents } from "./gait-events";
import { labelSteadyState, pooledRobustSdS, steadyBand } from "./steady-state";
import { firstIndexAbove, firstIndexAtOrAbove } from "./sorted-search";

/**
 * Wide physiological limits on the time between same-side ICs (s). 0.25 s is the lower gate of a
 * public MATLAB implementation (docs/methods.md#steady-state-and-stride-selection). The upper limit
 * is common practice: 6 s is 20 steps/min, slower than the 35–40 steps/min of the slowest household
 * walkers, so any real stride stays in and only pauses (standing between two bouts' steps) fall
 * out. Inside these limits the session's own distribution decides (steady-state.ts).
 */
export const MIN_STRIDE_TIME_S = 0.25;
export const MAX_STRIDE_TIME_S = 6;
/** Strides this close to a turn are left out (s); strides next to turns differ (Kroneberg 2019), common-practice margin. */
export const TURN_MARGIN_S = 1;
/**
 * Left and right ICs must alternate plausibly: the step that opens a stride must last 15–85 % of the
 * stride (common practice; even markedly asymmetric gait stays inside, while a stray or missed IC of
 * the other leg falls outside).
 */
export const MIN_STEP_FRACTION = 0.15;
export const MAX_STEP_FRACTION = 0.85;

export interface StrideContext {
  bouts: readonly Bout[];
  turns: readonly Bout[];
  invalidSpans: readonly Bout[];
  /** Short gaps that were interpolated (≤ 150 ms): strides across them are reported, not measured. */
  gapSpans?: readonly Bout[];
  /**
   * Legs whose sensor the quality checks called unreliable (e.g. a loose strap): their strides are
   * reported as "unreliable-sensor" and their events are not used to check the other leg's.
   */
  unreliableSides?: readonly Side[];
}

const overlaps = (a0: number, a1: number, b: Bout, margin = 0) => a0 < b.endS + margin && a1 > b.startS - margin;

/**
 * Strides of one side from its events (IC to next IC), with stance/swing, double support against the
 * contralateral events, and the first part of the steady-state decision. Exclusion, in order:
 * stride time outside the physiological limits (0.25–6 s); any overlap with an invalid span; any
 * overlap with an interpolated gap; within TURN_MARGIN_S of a turn; an implausible opening step
 * (outside 15–85 % of the stride); first or last stride of its walking bout. A stride whose FC is
 * missing or breaks the order IC < FC_contra < IC_contra < FC < next IC keeps its timing but no
 * FC-derived values (`finalContactRejected`). The session-relative gate
 * (acceleration, deceleration, outliers) needs both legs: `gateSteadyStateInPlace`.
 */
export function buildStrides(side: Side, own: LegEvents, contra: LegEvents | null, ctx: StrideContext): Stride[] {
  const ic = own.initialContactsS;
  const fcs = own.finalContactsS;
  const strides: Stride[] = [];
  for (let k = 0; k + 1 < ic.length; k++) {
    const a = ic[k]!;
    const b = ic[k + 1]!;
    const strideTimeS = b - a;
    const inside = openRange(fcs, a, b);
    let fcS = inside.count === 1 ? fcs[inside.from]! : null;
    let doubleSupportPct: number | null = null;
    // Initial contacts decide the stride (timing, cadence, variability, PCI); the final contact only
    // adds stance, swing and double support. So a stride whose ICs alternate plausibly but whose FC
    // is missing or out of order keeps its timing and loses only its FC-derived values: initial
    // contacts are the more robust shank event in impaired gait (Trojaniello et al. 2014), and a
    // pre-swing without a clear minimum (stiff-knee gait) must not remove the walk's cadence.
    let icOrderOk = true;
    let fcOk = fcS !== null;
    let stepTimeS: number | null = null;
    if (contra) {
      const prevContra = lastBefore(contra.initialContactsS, a);
      if (prevContra !== null && a - prevContra < strideTimeS) stepTimeS = a - prevContra;
      if (stepTimeS === null || stepTimeS < MIN_STEP_FRACTION * strideTimeS || stepTimeS > MAX_STEP_FRACTION * strideTimeS) {
        icOrderOk = false;
      }
      if (fcS !== null) {
        const fcR = openRange(contra.finalContactsS, a, fcS);
        const icR = openRange(contra.initialContactsS, a, b);
        const fcC = contra.finalContactsS[fcR.from]!;
        const icC = contra.initialContactsS[icR.from]!;
        if (fcR.count === 1 && icR.count === 1 && fcC < icC && icC < fcS) {
          doubleSupportPct = (100 * (fcC - a + (fcS - icC))) / strideTimeS;
        } else fcOk = false;
      }
    }
    const finalContactRejected = icOrderOk && !fcOk;
    if (finalContactRejected) {
      fcS = null;
      doubleSupportPct = null;
    }
    const orderOk = icOrderOk;
    const stanceTimeS = fcS === null ? null : fcS - a;
    const swingTimeS = fcS === null ? null : b - fcS;
    let excludedReason: Stride["excludedReason"];
    if (strideTimeS < MIN_STRIDE_TIME_S || strideTimeS > MAX_STRIDE_TIME_S) excludedReason = "out-of-range";
    else if (ctx.invalidSpans.some((s) => overlaps(a, b, s))) excludedReason = "invalid-span";
    else if ((ctx.gapSpans ?? []).some((g) => overlaps(a, b, g))) excludedReason = "gap";
    else if (ctx.turns.some((t) => overlaps(a, b, t, TURN_MARGIN_S))) excludedReason = "turn";
    else if (!orderOk) excludedReason = "event-order";
    strides.push({
      side,
      icS: a,
      nextIcS: b,
      fcS,
      strideTimeS,
      stanceTimeS,
      swingTimeS,
      stancePct: stanceTimeS === null ? null : (100 * stanceTimeS) / strideTimeS,
      swingPct: swingTimeS === null ? null : (100 * swingTimeS) / strideTimeS,
      doubleSupportPct,
      stepTimeS,
      steady: excludedReason === undefined,
      ...(excludedReason ? { excludedReason } : {}),
      ...(finalContactRejected ? { finalContactRejected } : {}),
    });
  }
  // Each leg's first and last stride of a bout (and strides outside any bout) are bout edges. A
  // leg's first stride often also fails the order check only because the other leg has no step
  // before it yet; that is the bout edge, not an event problem, so it is reported as the edge.
  const boutOf = (s: Stride) => ctx.bouts.findIndex((bt) => s.icS >= bt.startS && s.nextIcS <= bt.endS);
  const byBoutSide = new Map<string, Stride[]>();
  for (const s of strides) {
    const i = boutOf(s);
    s.boutIndex = i;
    if (i < 0) {
      if (s.steady) markEdge(s);
      continue;
    }
    const key = `${i}:${s.side}`;
    const list = byBoutSide.get(key) ?? [];
    list.push(s);
    byBoutSide.set(key, list);
  }
  const edgeable = (s: Stride) => s.steady || s.excludedReason === "event-order";
  for (const list of byBoutSide.values()) {
    const first = list[0]!;
    const last = list[list.length - 1]!;
    if (edgeable(first)) markEdge(first);
    if (edgeable(last)) markEdge(last);
  }
  return strides;
}

/**
 * Both legs' strides of a session, in time order, with the full steady-state decision: buildStrides
 * per side, then `gateSteadyStateInPlace`. A leg in `ctx.unreliableSides` keeps its strides in the
 * list (reason "unreliable-sensor") but lends no events to the other leg's checks, so the reliable
 * leg is measured on its own events (stride, stance and swing; no step time or double support).
 */
export function buildSessionStrides(left: LegEvents | null, right: LegEvents | null, ctx: StrideContext): Stride[] {
  const unreliable = new Set(ctx.unreliableSides ?? []);
  const trusted = (side: Side, ev: LegEvents | null) => (unreliable.has(side) ? null : ev);
  const strides = [
    ...(left ? buildStrides("left", left, trusted("right", right), ctx) : []),
    ...(right ? buildStrides("right", right, trusted("left", left), ctx) : []),
  ];
  for (const s of strides) {
    if (!unreliable.has(s.side)) continue;
    s.steady = false;
    s.excludedReason = "unreliable-sensor";
  }
  strides.sort((a, b) => a.icS - b.icS || (a.side === "left" ? -1 : 1));
  gateSteadyStateInPlace(strides);
  return strides;
}

/**
 * Session-relative gate, in place: among the strides still steady, per walking bout (both legs, in
 * time order), the band of steady-state.ts (bout median ± max(3 robust SDs pooled within bouts,
 * 5.8 % of the median)); the leading and trailing runs outside it become "unsteady" (acceleration
 * and deceleration), other strides outside it "out-of-range". Strides must carry `boutIndex`.
 */
export function gateSteadyStateInPlace(strides: Stride[]): void {
  const byBout = new Map<number, Stride[]>();
  for (const s of strides) {
    if (!s.steady || s.boutIndex === undefined || s.boutIndex < 0) continue;
    const list = byBout.get(s.boutIndex) ?? [];
    list.push(s);
    byBout.set(s.boutIndex, list);
  }
  const groups = [...byBout.values()].map((list) => list.sort((a, b) => a.icS - b.icS));
  const robustSdS = pooledRobustSdS(groups.map((g) => g.map((s) => s.strideTimeS)));
  if (robustSdS === null) return;
  for (const g of groups) {
    const times = g.map((s) => s.strideTimeS);
    const band = steadyBand(times, robustSdS);
    if (!band) continue;
    const labels = labelSteadyState(times, band);
    g.forEach((s, i) => {
      const label = labels[i]!;
      if (label === "steady") return;
      s.steady = false;
      s.excludedReason = label;
    });
  }
}

function markEdge(s: Stride): void {
  s.steady = false;
  s.excludedReason = "bout-edge";
}

/** Index of the first element > a and the number of elements in (a, b) of a sorted array (binary search). */
function openRange(sorted: readonly number[], a: number, b: number): { from: number; count: number } {
  const from = firstIndexAbove(sorted, a);
  return { from, count: firstIndexAtOrAbove(sorted, b, from) - from };
}


function lastBefore(sorted: readonly number[], t: number): number | null {
  let lo = 0;
  let hi = sorted.length - 1;
  let ans: number | null = null;
  while (lo <= hi) {
    const mid = (lo + hi) >> 1;
    if (sorted[mid]! < t) {
      ans = sorted[mid]!;
      lo = mid + 1;
    } else hi = mid - 1;
  }
  return ans;
}
