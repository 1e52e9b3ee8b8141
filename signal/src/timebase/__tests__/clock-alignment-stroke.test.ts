import { describe, expect, it } from "vitest";
import { analyze } from "../../analyze";
import {
  ALL_FIVE,
  SHANKS,
  strokeTreadmillAvailable,
  strokeTreadmillTrials,
} from "../../gait/__tests__/support/stroke-treadmill-trials";
import type { Analysis, Placement, SensorRecording } from "../../types";
import { alignLegClocks } from "../align-clocks";
import { impactLag, MAX_IMPACT_DELAY_S, STEP_FRACTION_SEARCH } from "../clock-offset";
import { resampleToGrid, type ResampledSensor } from "../resample-to-grid";
import { sessionGrid } from "../session-grid";

// Real stroke treadmill recordings (Ensink et al., Sensors 2024; shared data folder, see its README):
// all five sensors of a trial share one clock, so any offset the estimator finds on them is the
// method's own error. A clock error is simulated by moving one sensor's samples while keeping its
// start_utc and t_s: after a shift of +s the right shank's data describe a moment s later than its
// clock says.

function shifted(r: SensorRecording, shiftS: number): SensorRecording {
  const k = Math.round(shiftS * r.nominalSampleRateHz);
  const n = r.timeS.length;
  const cut = (a: Float32Array) => (k >= 0 ? a.subarray(k) : a.subarray(0, n + k));
  return {
    ...r,
    timeS: k >= 0 ? r.timeS.subarray(0, n - k) : r.timeS.subarray(-k),
    accX: cut(r.accX),
    accY: cut(r.accY),
    accZ: cut(r.accZ),
    gyroX: cut(r.gyroX),
    gyroY: cut(r.gyroY),
    gyroZ: cut(r.gyroZ),
  };
}

function withShift(recs: SensorRecording[], placement: Placement, shiftS: number): SensorRecording[] {
  return recs.map((r) => (r.placement === placement && shiftS !== 0 ? shifted(r, shiftS) : r));
}

function estimate(recs: SensorRecording[]) {
  const grid = sessionGrid(recs);
  const sensors = new Map<Placement, ResampledSensor>();
  recs.forEach((r, i) => sensors.set(r.placement!, resampleToGrid(r, grid, i)));
  return alignLegClocks(recs, grid, sensors, recs);
}

/** Fraction of `a` with an event of `b` within ±tolS, and the signed mean difference of the matches. */
function matchEvents(a: number[], b: number[], tolS: number): { matched: number; biasMs: number } {
  let hits = 0;
  let sum = 0;
  for (const t of a) {
    let best = Infinity;
    for (const u of b) if (Math.abs(u - t) < Math.abs(best)) best = u - t;
    if (Math.abs(best) <= tolS) {
      hits++;
      sum += best;
    }
  }
  return { matched: a.length ? hits / a.length : 1, biasMs: hits ? (1000 * sum) / hits : 0 };
}

const trials = strokeTreadmillTrials();
const SHIFTS_S = [0.05, -0.12, 0.3];

describe.skipIf(!strokeTreadmillAvailable)("clock alignment on real stroke recordings (one shared clock)", () => {
  it.each(trials.map((t) => [t.trial, t] as const))("%s: a shifted right shank is recovered through the lower back", (_name, trial) => {
    const recs = trial.recordings(ALL_FIVE);
    const base = estimate(recs);
    if (base.offsetS === null) {
      // Weak or ambiguous evidence must be said, never guessed, whatever the shift.
      expect(base.quality.map((q) => q.code)).toEqual(["clock-unverified"]);
      for (const s of SHIFTS_S) expect(estimate(withShift(recs, "right_shank", s)).quality.map((q) => q.code)).toEqual(["clock-unverified"]);
      console.log(`${trial.trial}: clock alignment unverified (${base.quality[0]!.message})`);
      return;
    }
    const lines = [`${trial.trial}: unshifted estimate ${(1000 * base.offsetS).toFixed(1)} ms`];
    // Unshifted, the method's error comes from any left–right asymmetry of the impact path to the
    // back; it must stay well under the smallest step fraction that matters (50 ms; common practice).
    expect(Math.abs(base.offsetS)).toBeLessThan(0.05);
    for (const s of SHIFTS_S) {
      const est = estimate(withShift(recs, "right_shank", s));
      expect(est.offsetS).not.toBeNull();
      const errMs = 1000 * (est.offsetS! - base.offsetS - s);
      lines.push(`shift ${(1000 * s).toFixed(0)} ms → ${(1000 * est.offsetS!).toFixed(1)} ms (recovered shift error ${errMs.toFixed(1)} ms)`);
      expect(Math.abs(errMs)).toBeLessThanOrEqual(10);
    }
    console.log(lines.join("; "));
  });

  it.each(trials.map((t) => [t.trial, t] as const))("%s: events and PCI do not depend on the simulated clock error", (_name, trial) => {
    const recs = trial.recordings(ALL_FIVE);
    const base = analyze(recs);
    if (base.quality.some((q) => q.code === "clock-unverified")) return; // covered above
    const compare = (a: Analysis, label: string) => {
      for (const side of ["left", "right"] as const) {
        const ic = matchEvents(base.events[side].initialContacts, a.events[side].initialContacts, 0.02);
        const fc = matchEvents(base.events[side].finalContacts, a.events[side].finalContacts, 0.02);
        expect(ic.matched, `${label} ${side} IC`).toBeGreaterThanOrEqual(0.95);
        expect(fc.matched, `${label} ${side} FC`).toBeGreaterThanOrEqual(0.95);
      }
      const p0 = base.metrics.phaseCoordinationIndexPct;
      const p1 = a.metrics.phaseCoordinationIndexPct;
      expect(p1 === null).toBe(p0 === null);
      if (p0 !== null && p1 !== null) expect(Math.abs(p1 - p0), `${label} PCI ${p0.toFixed(2)} vs ${p1.toFixed(2)}`).toBeLessThanOrEqual(0.5);
    };
    for (const s of SHIFTS_S) {
      const a = analyze(withShift(recs, "right_shank", s));
      expect(a.quality.some((q) => q.code === "clock-unverified")).toBe(false);
      compare(a, `shift ${s * 1000} ms`);
    }
  });

  it.each(trials.map((t) => [t.trial, t] as const))("%s: the feet pair (no shanks) follows a shifted right foot the same way", (_name, trial) => {
    const recs = trial.recordings(["left_foot", "right_foot", "lower_back"]);
    const base = estimate(recs);
    const moved = estimate(withShift(recs, "right_foot", 0.1));
    if (base.offsetS === null) {
      expect(moved.offsetS).toBeNull();
      expect(moved.quality.map((q) => q.code)).toEqual(["clock-unverified"]);
      return;
    }
    console.log(`${trial.trial} feet: unshifted estimate ${(1000 * base.offsetS).toFixed(1)} ms`);
    expect(base.placement).toBe("right_foot");
    expect(Math.abs(1000 * (moved.offsetS! - base.offsetS - 0.1))).toBeLessThanOrEqual(10);
  });

  // The wrist alignment (align-wrist-clocks.ts) reads the whole lag of the impact at the wrist as clock
  // offset. These recordings have no wrists, but the lower back on the same clock shows how late an
  // impact envelope peaks away from the leg: that delay is what the wrist estimate would carry as bias.
  // Physics only is asserted: the trunk cannot feel a strike before the shank, and both legs' strikes
  // arrive within a plausible impact delay (MAX_IMPACT_DELAY_S).
  it.each(trials.map((t) => [t.trial, t] as const))("%s: the impact reaches the lower back after the shank, within a plausible delay", (_name, trial) => {
    const est = estimate(trial.recordings(ALL_FIVE));
    if (!est.impacts?.legsAligned) return; // covered above (unverified)
    const back = est.impacts.bridges.get("lower_back")!;
    const { active, rateHz, strideS } = est.impacts;
    const lag = (leg: typeof back) => impactLag(leg, back, active, rateHz, STEP_FRACTION_SEARCH * (strideS / 2));
    const l = lag(est.impacts.left);
    const r = lag(est.impacts.right);
    console.log(`${trial.trial}: shank → lower back impact delay left ${(1000 * l!.lagS).toFixed(1)} ms, right ${(1000 * r!.lagS).toFixed(1)} ms`);
    for (const x of [l, r]) {
      expect(x?.strong).toBe(true);
      expect(x!.lagS).toBeGreaterThanOrEqual(0);
      expect(x!.lagS).toBeLessThanOrEqual(MAX_IMPACT_DELAY_S);
    }
  });

  it.each(trials.map((t) => [t.trial, t] as const))("%s: with the shanks alone the offset cannot be told and is reported as unverified", (_name, trial) => {
    for (const s of [0, 0.05, -0.12, 0.3]) {
      const est = estimate(withShift(trial.recordings(SHANKS), "right_shank", s));
      expect(est.offsetS).toBeNull();
      expect(est.quality.map((q) => q.code)).toEqual(["clock-unverified"]);
    }
  });
});
