import { existsSync, readFileSync, readdirSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { analyze } from "../../analyze";
import { readSensorCsv } from "../../io/read-sensor-csv";

// Real foot-IMU recordings of healthy adults (Voisard et al., IPOL 2023; AGPL-3.0), read from the
// shared data folder beside the repository and never copied into it. Reference events were produced
// by published IMU algorithms and checked by hand (see the folder's README), so scoring uses a
// ±100 ms matching window and the median absolute error, over straight walking only (0.5 s kept
// clear of the turn and of the walk's ends), as that README suggests.
const repoRoot = fileURLToPath(new URL("../../../../", import.meta.url));
const dataDir = join(repoRoot, "..", "shared", "data", "open-walks");
const available = existsSync(dataDir);
if (!available) console.warn(`open-walks data not found at ${dataDir}; skipping the real-data event checks`);

const WINDOW_S = 0.1;
const MARGIN_S = 0.5;

interface Reference {
  walk: [number, number];
  turns: Array<[number, number]>;
  events: { left: { ic: number[]; fc: number[] }; right: { ic: number[]; fc: number[] } };
}

/** Greedy one-to-one matching within ±WINDOW_S (nearest first). */
function score(detected: number[], reference: number[]) {
  const pairs: Array<[number, number, number]> = [];
  detected.forEach((d, i) => reference.forEach((r, j) => Math.abs(d - r) <= WINDOW_S && pairs.push([Math.abs(d - r), i, j])));
  pairs.sort((a, b) => a[0] - b[0]);
  const usedD = new Set<number>();
  const usedR = new Set<number>();
  const errors: number[] = [];
  for (const [e, i, j] of pairs) {
    if (usedD.has(i) || usedR.has(j)) continue;
    usedD.add(i);
    usedR.add(j);
    errors.push(e);
  }
  const tp = errors.length;
  const f1 = detected.length + reference.length === 0 ? 1 : (2 * tp) / (detected.length + reference.length);
  errors.sort((a, b) => a - b);
  const medianAbsMs = errors.length ? 1000 * (errors.length % 2 ? errors[errors.length >> 1]! : (errors[errors.length / 2 - 1]! + errors[errors.length / 2]!) / 2) : Number.NaN;
  return { f1, medianAbsMs, tp, nRef: reference.length, nDet: detected.length };
}

const trials = available ? readdirSync(dataDir).filter((d) => existsSync(join(dataDir, d, "reference.json"))).sort() : [];

describe.skipIf(!available)("open walking recordings (foot IMUs): events vs reference", () => {
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

  for (const trial of trials) {
    const ref = JSON.parse(readFileSync(join(dataDir, trial, "reference.json"), "utf8")) as Reference;
    const keep = (t: number) =>
      t > ref.walk[0] + MARGIN_S && t < ref.walk[1] - MARGIN_S && ref.turns.every(([a, b]) => t < a - MARGIN_S || t > b + MARGIN_S);
    const recordings = ["left_foot", "right_foot", "lower_back"]
      .filter((p) => existsSync(join(dataDir, trial, `${p}.csv`)))
      .map((p) => readSensorCsv(readFileSync(join(dataDir, trial, `${p}.csv`), "utf8"), `${trial}/${p}.csv`));
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
    const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
    rows.push(`mean F1: IC ${mean(results.map((r) => r.ic.f1)).toFixed(3)}, FC ${mean(results.map((r) => r.fc.f1)).toFixed(3)}`);
    console.log("\n" + rows.join("\n"));
    expect(results.length).toBe(2 * trials.length);
  });

  it("mean F1 within ±100 ms is at least 0.9 for initial and final contacts", () => {
    const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
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
    for (const trial of trials) expect(turnHits.get(trial), trial).toBe(true);
  });
});
