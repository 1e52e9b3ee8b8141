import type { SensorRecording } from "../types";

export interface BidsMotionSet {
  /** File names share the BIDS entity stem, e.g. `sub-demo07_task-homewalk_tracksys-imu`. */
  motionFileName: string;
  channelsFileName: string;
  jsonFileName: string;
  motionTsv: string;
  channelsTsv: string;
  motionJson: string;
}

export interface BidsMotionTextOptions {
  stem?: string;
  /** Rows (1-based among data rows) whose cells of the first tracked point are written `n/a`. */
  missingRows?: readonly number[];
  /** Gyroscope unit of the channels file; the values are converted accordingly. */
  gyroUnit?: "deg/s" | "rad/s";
}

const TRACKED_POINT: Record<string, string> = {
  left_shank: "LeftShank",
  right_shank: "RightShank",
  left_wrist: "LeftWrist",
  right_wrist: "RightWrist",
  left_foot: "LeftFoot",
  right_foot: "RightFoot",
  lower_back: "LowerBack",
};

/**
 * One BIDS Motion tracking system (headerless `_motion.tsv`, `_channels.tsv`, `_motion.json`)
 * holding the given recordings as tracked points, for tests and the bench: a LATENCY channel
 * carries the first recording's time, row k of every tracked point is its sample k (a shorter
 * recording's cells are `n/a`). Layout from the BIDS specification's motion data section.
 */
export function bidsMotionText(recordings: readonly SensorRecording[], options: BidsMotionTextOptions = {}): BidsMotionSet {
  const stem = options.stem ?? "sub-demo07_ses-week03_task-homewalk_tracksys-imu";
  const gyroUnit = options.gyroUnit ?? "deg/s";
  const gyroScale = gyroUnit === "rad/s" ? Math.PI / 180 : 1;
  const first = recordings[0];
  if (!first) throw new Error("bidsMotionText needs at least one recording");
  const channelRows = ["name\tcomponent\ttype\ttracked_point\tunits", "time\tn/a\tLATENCY\tn/a\ts"];
  recordings.forEach((r, k) => {
    const point = (r.placement && TRACKED_POINT[r.placement]) || `Point${k + 1}`;
    for (const c of ["x", "y", "z"]) channelRows.push(`${point}_acc_${c}\t${c}\tACCEL\t${point}\tm/s^2`);
    for (const c of ["x", "y", "z"]) channelRows.push(`${point}_gyr_${c}\t${c}\tGYRO\t${point}\t${gyroUnit}`);
  });
  const missing = new Set(options.missingRows ?? []);
  const rows = first.timeS.length;
  const lines: string[] = new Array(rows);
  for (let i = 0; i < rows; i++) {
    const cells = [first.timeS[i]!.toFixed(5)];
    recordings.forEach((r, k) => {
      if (i >= r.timeS.length || (k === 0 && missing.has(i + 1))) {
        cells.push("n/a", "n/a", "n/a", "n/a", "n/a", "n/a");
        return;
      }
      cells.push(r.accX[i]!.toFixed(4), r.accY[i]!.toFixed(4), r.accZ[i]!.toFixed(4));
      cells.push((r.gyroX[i]! * gyroScale).toFixed(4), (r.gyroY[i]! * gyroScale).toFixed(4), (r.gyroZ[i]! * gyroScale).toFixed(4));
    });
    lines[i] = cells.join("\t");
  }
  return {
    motionFileName: `${stem}_motion.tsv`,
    channelsFileName: `${stem}_channels.tsv`,
    jsonFileName: `${stem}_motion.json`,
    motionTsv: `${lines.join("\n")}\n`,
    channelsTsv: `${channelRows.join("\n")}\n`,
    motionJson: JSON.stringify({ SamplingFrequency: first.nominalSampleRateHz, TrackingSystemName: "imu", DeviceSerialNumber: "DEMO-TS-07" }, null, 2),
  };
}
