import { existsSync, readFileSync, readdirSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { readSensorCsv } from "../../../io/read-sensor-csv";
import type { Placement, SensorRecording } from "../../../types";

// Real recordings of people with chronic stroke walking on a treadmill (Ensink et al., Sensors 2024,
// 24:710; data set SintMaartenskliniek/MovingReality, MIT licence), converted to sensor CSV v1 and
// read from the shared data folder beside the repository, never copied into it. The reference events
// come from the FOOT IMUs by a published foot-gyroscope rule (see the folder's README): they are not
// a gold standard, so scoring uses a ±100 ms matching window plus the median error, over the
// folder's `walk` window minus 0.5 s at each end, as that README suggests.
const repoRoot = fileURLToPath(new URL("../../../../../", import.meta.url));
export const STROKE_TREADMILL_DIR = join(repoRoot, "..", "shared", "data", "stroke-treadmill");
export const strokeTreadmillAvailable = existsSync(STROKE_TREADMILL_DIR);

export const STROKE_CLEAR_MARGIN_S = 0.5;

export interface StrokeTreadmillReference {
  walk: [number, number];
  events: { left: { ic: number[]; fc: number[] }; right: { ic: number[]; fc: number[] } };
  /** The participant's listed comfortable treadmill speed (not the logged belt speed of this trial). */
  treadmill_speed_m_s: number;
  subject: { age: number; height_cm: number; weight_kg: number; months_since_stroke: number; condition: string };
  crosscheck: { treadmill: { imu_speed_estimate_m_s: number; imu_over_listed_speed: number; zupt_stride_length_median_m: number } };
}

export interface StrokeTreadmillTrial {
  trial: string;
  reference: StrokeTreadmillReference;
  /** Reads the named placements' files of this trial (each file is read when asked for). */
  recordings: (placements: readonly Placement[]) => SensorRecording[];
  /** True for times inside `walk`, 0.5 s clear of its ends. */
  keep: (t: number) => boolean;
}

export const SHANKS: readonly Placement[] = ["left_shank", "right_shank"];
export const FEET: readonly Placement[] = ["left_foot", "right_foot"];
export const ALL_FIVE: readonly Placement[] = ["left_shank", "right_shank", "left_foot", "right_foot", "lower_back"];

export function strokeTreadmillTrials(): StrokeTreadmillTrial[] {
  if (!strokeTreadmillAvailable) return [];
  return readdirSync(STROKE_TREADMILL_DIR)
    .filter((d) => existsSync(join(STROKE_TREADMILL_DIR, d, "reference.json")))
    .sort()
    .map((trial) => {
      const dir = join(STROKE_TREADMILL_DIR, trial);
      const reference = JSON.parse(readFileSync(join(dir, "reference.json"), "utf8")) as StrokeTreadmillReference;
      const recordings = (placements: readonly Placement[]) =>
        placements.map((p) => readSensorCsv(readFileSync(join(dir, `${p}.csv`), "utf8"), `${trial}/${p}.csv`));
      const keep = (t: number) => t > reference.walk[0] + STROKE_CLEAR_MARGIN_S && t < reference.walk[1] - STROKE_CLEAR_MARGIN_S;
      return { trial, reference, recordings, keep };
    });
}

/** Stride times (s) between consecutive same-side reference ICs that both lie inside `walk`. */
export function referenceStrideTimesS(ref: StrokeTreadmillReference, side: "left" | "right"): number[] {
  const ic = ref.events[side].ic;
  const out: number[] = [];
  for (let i = 0; i + 1 < ic.length; i++) if (ic[i]! >= ref.walk[0] && ic[i + 1]! <= ref.walk[1]) out.push(ic[i + 1]! - ic[i]!);
  return out;
}
