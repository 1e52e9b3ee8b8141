import { analyze, bidsSidecarNames, readBidsMotion, readSensorCsv, sniffFormat, type SensorRecording } from "@pendula/signal";
import { recordingDurationS, summarize } from "./summarize";
import type { PrecheckFile, PrecheckInputFile, PrecheckSummary } from "./precheck-types";

/** Larger than any real weekly walk, small enough that a phone does not run out of memory. */
export const PRECHECK_MAX_CHARS = 64 * 1024 * 1024;

function messageOf(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}

/**
 * Reads the dropped files with signal's own readers and runs the same `analyze()` the server
 * runs. Runs in a Web Worker in the browser (see precheck.worker.ts) and inline in tests.
 */
export function runPrecheck(input: PrecheckInputFile[]): PrecheckSummary {
  const byName = new Map(input.map((f) => [f.name, f]));
  const files = new Map<string, PrecheckFile>();
  const recordings: SensorRecording[] = [];
  const base = (f: PrecheckInputFile): PrecheckFile => ({
    fileName: f.name,
    sizeBytes: f.sizeBytes,
    format: "unknown",
    recognised: false,
    deviceSerial: null,
    placement: null,
    durationS: null,
    problem: null,
  });

  for (const f of input) {
    const entry = base(f);
    files.set(f.name, entry);
    const format = sniffFormat(f.text);
    if (format === "pendula-csv-v1") {
      entry.format = "pendula-csv-v1";
      try {
        const rec = readSensorCsv(f.text, f.name, { maxChars: PRECHECK_MAX_CHARS });
        recordings.push(rec);
        Object.assign(entry, { recognised: true, deviceSerial: rec.deviceSerial, placement: rec.placement, durationS: recordingDurationS(rec) });
      } catch (error) {
        entry.problem = messageOf(error);
      }
    } else if (format === "bids-channels-tsv" || format === "bids-motion-json") {
      entry.format = "bids-sidecar";
    } else if (format === "bids-motion-tsv" || f.name.endsWith("_motion.tsv")) {
      entry.format = "bids-motion";
    } else {
      entry.problem = `${f.name}: not a Pendula sensor file or a BIDS Motion file`;
    }
  }

  for (const entry of files.values()) {
    if (entry.format !== "bids-motion") continue;
    const sidecars = bidsSidecarNames(entry.fileName);
    const channels = byName.get(sidecars.channels);
    const json = byName.get(sidecars.json);
    if (!channels || !json) {
      entry.problem = `${entry.fileName}: add ${sidecars.channels} and ${sidecars.json} from the same folder`;
      continue;
    }
    try {
      const recs = readBidsMotion({
        motionTsv: byName.get(entry.fileName)!.text,
        motionFileName: entry.fileName,
        channelsTsv: channels.text,
        channelsFileName: channels.name,
        motionJson: json.text,
        jsonFileName: json.name,
        maxChars: PRECHECK_MAX_CHARS,
      });
      recordings.push(...recs);
      const durations = recs.map(recordingDurationS).filter((d): d is number => d !== null);
      Object.assign(entry, {
        recognised: true,
        placement: recs.map((r) => r.placement ?? "unknown").join(", ") || null,
        // One BIDS file holds several sensors of one tracking system ("<serial>:<tracked point>"
        // each): show the system's serial, the positions column lists the sensors.
        deviceSerial: recs[0]?.deviceSerial.replace(/:[^:]*$/, "") ?? null,
        durationS: durations.length ? Math.max(...durations) : null,
      });
      for (const side of [channels.name, json.name]) {
        const s = files.get(side);
        if (s) s.recognised = true;
      }
    } catch (error) {
      entry.problem = messageOf(error);
    }
  }
  for (const entry of files.values()) {
    if (entry.format === "bids-sidecar" && !entry.recognised && !entry.problem) {
      entry.problem = `${entry.fileName}: a BIDS sidecar without its *_motion.tsv`;
    }
  }

  const list = [...files.values()];
  if (recordings.length === 0) {
    return summarize(list, null, "None of these files could be read as a sensor recording.");
  }
  try {
    return summarize(list, analyze(recordings), null);
  } catch (error) {
    return summarize(list, null, messageOf(error));
  }
}
