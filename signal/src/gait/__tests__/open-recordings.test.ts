import { describe, expect, it } from "vitest";
import { analyze } from "../../analyze";
import { mean, openWalksAvailable, openWalkTrials, OPEN_WALKS_DIR, scoreEvents as score } from "./support/real-walk-trials";

// Real foot-IMU recordings (see support/real-walk-trials.ts for the source, licence and scoring rules).
if (!openWalksAvailable) console.warn(`open-walks data not found at ${OPEN_WALKS_DIR}; skipping the real-data event checks`);
const trials = openWalkTrials();

describe.skipIf(!openWalksAvailable)("open walking recordings (foot IMUs): events vs reference", () => {
  const rows: string[] = [];
  const turnHits = new Map<string, boolean>();
  const results: Array<{
    trial: string;
    side: string;
    ic: ReturnType<typeof score>;
    fc: ReturnType<typeof score>;
    cadence: number | null;
    detectedCadence: number;
    refCadence: number;
  }> = [];
  /** 60 / mean step time over straight-walking steps (consecutive ICs of both feet, both ends kept). */
  const cadenceOf = (left: number[], right: number[], keep: (t: number) => boolean) => {
    const all = [...left, ...right].sort((a, b) => a - b);
    const steps: number[] = [];
    for (let i = 1; i < all.length; i++) if (keep(all[i - 1]!) && keep(all[i]!)) steps.push(all[i]! - all[i - 1]!);
    return 60 / (steps.reduce((a, b) => a + b, 0) / steps.length);
  };

  for (const { trial, reference: ref, recordings, keep } of trials) {
    const analysis = analyze(recordings);
    turnHits.set(trial, ref.turns.every(([a, b]) => analysis.turns.some((t) => t.startS < b && t.endS > a)));
    const refCadence = cadenceOf(ref.events.left.ic, ref.events.right.ic, keep);
    const detectedCadence = cadenceOf(analysis.events.left.initialContacts, analysis.events.right.initialContacts, keep);
    for (const side of ["left", "right"] as const) {
      const ic = score(analysis.events[side].initialContacts.filter(keep), ref.events[side].ic.filter(keep));
      const fc = score(analysis.events[side].finalContacts.filter(keep), ref.events[side].fc.filter(keep));
      results.push({ trial, side, ic, fc, cadence: analysis.metrics.cadenceStepsPerMin, detectedCadence, refCadence });
    }
  }

  it("prints the per-trial table", () => {
    rows.push("trial side | IC F1  TP/ref/det  med|err| ms | FC F1  TP/ref/det  med|err| ms | cadence steady / straight / reference, steps/min");
    for (const r of results) {
      rows.push(
        `${r.trial.padEnd(5)} ${r.side.padEnd(5)}| ${r.ic.f1.toFixed(3)}  ${`${r.ic.tp}/${r.ic.nRef}/${r.ic.nDet}`.padEnd(10)}  ${r.ic.medianAbsMs.toFixed(0).padStart(4)}        | ${r.fc.f1.toFixed(3)}  ${`${r.fc.tp}/${r.fc.nRef}/${r.fc.nDet}`.padEnd(10)}  ${r.fc.medianAbsMs.toFixed(0).padStart(4)}        | ${r.cadence?.toFixed(1) ?? "—"} / ${r.detectedCadence.toFixed(1)} / ${r.refCadence.toFixed(1)}`,
      );
    }
    rows.push(`mean F1: IC ${mean(results.map((r) => r.ic.f1)).toFixed(3)}, FC ${mean(results.map((r) => r.fc.f1)).toFixed(3)}`);
    console.log("\n" + rows.join("\n"));
    expect(results.length).toBe(2 * trials.length);
  });

  it("mean F1 within ±100 ms is at least 0.9 for initial and final contacts", () => {
    expect(mean(results.map((r) => r.ic.f1))).toBeGreaterThanOrEqual(0.9);
    expect(mean(results.map((r) => r.fc.f1))).toBeGreaterThanOrEqual(0.9);
  });

  it("every trial and side has F1 ≥ 0.75 and a median absolute timing error ≤ 60 ms", () => {
    for (const r of results) {
      expect(r.ic.f1, `${r.trial} ${r.side} IC`).toBeGreaterThanOrEqual(0.75);
      expect(r.fc.f1, `${r.trial} ${r.side} FC`).toBeGreaterThanOrEqual(0.75);
      expect(r.ic.medianAbsMs, `${r.trial} ${r.side} IC`).toBeLessThanOrEqual(60);
      expect(r.fc.medianAbsMs, `${r.trial} ${r.side} FC`).toBeLessThanOrEqual(60);
    }
  });

  it("steady-state cadence (a smaller set: turn margins, bout edges, event-order checks) is within 8 % of the reference", () => {
    for (const r of results) {
      expect(r.cadence, r.trial).not.toBeNull();
      expect(Math.abs(r.cadence! - r.refCadence) / r.refCadence, r.trial).toBeLessThan(0.08);
    }
  });

  it("finds a turn overlapping each reference 180° turn", () => {
    for (const { trial } of trials) expect(turnHits.get(trial), trial).toBe(true);
  });
});
