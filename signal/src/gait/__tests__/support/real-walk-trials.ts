import { existsSync, readFileSync, readdirSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { readSensorCsv } from "../../../io/read-sensor-csv";
import type { SensorRecording } from "../../../types";

// Real foot-IMU recordings of healthy adults (Voisard et al., IPOL 2023; AGPL-3.0), read from the
// shared data folder beside the repository and never copied into it. Reference events were produced
// by published IMU algorithms and checked by hand (see the folder's README), so scoring uses a
// ±100 ms matching window and the median absolute error, over straight walking only (0.5 s kept
// clear of the turn and of the walk's ends), as that README suggests.
const repoRoot = fileURLToPath(new URL("../../../../../", import.meta.url));
export const OPEN_WALKS_DIR = join(repoRoot, "..", "shared", "data", "open-walks");
export const openWalksAvailable = existsSync(OPEN_WALKS_DIR);

export const MATCH_WINDOW_S = 0.1;
export const CLEAR_MARGIN_S = 0.5;

export interface OpenWalkReference {
  walk: [number, number];
  turns: Array<[number, number]>;
  events: { left: { ic: number[]; fc: number[] }; right: { ic: number[]; fc: number[] } };
}

export interface OpenWalkTrial {
  trial: string;
  reference: OpenWalkReference;
  recordings: SensorRecording[];
  /** True for times on straight walking, away from the turn and the walk's ends. */
  keep: (t: number) => boolean;
}

export function openWalkTrials(): OpenWalkTrial[] {
  if (!openWalksAvailable) return [];
  return readdirSync(OPEN_WALKS_DIR)
    .filter((d) => existsSync(join(OPEN_WALKS_DIR, d, "reference.json")))
    .sort()
    .map((trial) => {
      const reference = JSON.parse(readFileSync(join(OPEN_WALKS_DIR, trial, "reference.json"), "utf8")) as OpenWalkReference;
      const recordings = ["left_foot", "right_foot", "lower_back"]
        .filter((p) => existsSync(join(OPEN_WALKS_DIR, trial, `${p}.csv`)))
        .map((p) => readSensorCsv(readFileSync(join(OPEN_WALKS_DIR, trial, `${p}.csv`), "utf8"), `${trial}/${p}.csv`));
      const keep = (t: number) =>
        t > reference.walk[0] + CLEAR_MARGIN_S &&
        t < reference.walk[1] - CLEAR_MARGIN_S &&
        reference.turns.every(([a, b]) => t < a - CLEAR_MARGIN_S || t > b + CLEAR_MARGIN_S);
      return { trial, reference, recordings, keep };
    });
}

export interface EventScore {
  f1: number;
  medianAbsMs: number;
  tp: number;
  nRef: number;
  nDet: number;
}

/** Greedy one-to-one matching within ±MATCH_WINDOW_S (nearest first). */
export function scoreEvents(detected: number[], reference: number[]): EventScore {
  const pairs: Array<[number, number, number]> = [];
  detected.forEach((d, i) => reference.forEach((r, j) => Math.abs(d - r) <= MATCH_WINDOW_S && pairs.push([Math.abs(d - r), i, j])));
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

export const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
