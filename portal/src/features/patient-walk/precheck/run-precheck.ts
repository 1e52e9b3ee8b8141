import { analyze, readUploadSet, type SensorRecording, type UploadSetFile } from "@pendula/signal";
import { recordingDurationS, summarize } from "./summarize";
import type { PrecheckFile, PrecheckFormat, PrecheckInputFile, PrecheckProgress, PrecheckSummary } from "./precheck-types";

function messageOf(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}

const FORMAT: Record<UploadSetFile["role"], PrecheckFormat> = {
  "pendula-csv-v1": "pendula-csv-v1",
  "bids-motion-tsv": "bids-motion",
  "bids-channels-tsv": "bids-sidecar",
  "bids-motion-json": "bids-sidecar",
  unknown: "unknown",
};

/**
 * Reads the dropped files with signal's readUploadSet — the grouping, readers and messages of the
 * upload and the worker — and runs the same `analyze()` the server runs. Runs in a Web Worker in
 * the browser (see precheck.worker.ts) and inline in tests. No clock time is asked for BIDS sets
 * here: the upload asks for it, and the check does not depend on it.
 */
export function runPrecheck(input: PrecheckInputFile[], onProgress: (p: PrecheckProgress) => void = () => {}): PrecheckSummary {
  const fileCount = input.length;
  onProgress({ stage: "parsing", fileCount, fraction: 0.4 });
  const set = readUploadSet(input.map((f) => ({ name: f.name, bytes: f.bytes })));
  const files: PrecheckFile[] = set.files.map((f, i) => {
    const recs: SensorRecording[] = f.recordingIndexes.map((r) => set.recordings[r]!);
    const durations = recs.map(recordingDurationS).filter((d): d is number => d !== null);
    const bids = f.role === "bids-motion-tsv";
    return {
      fileName: f.name,
      sizeBytes: input[i]!.sizeBytes,
      format: FORMAT[f.role],
      recognised: recs.length > 0 || f.bidsMotionFile !== undefined,
      // One BIDS file holds several sensors of one tracking system ("<serial>:<tracked point>"
      // each): show the system's serial, the positions column lists the sensors.
      deviceSerial: recs.length ? (bids ? recs[0]!.deviceSerial.replace(/:[^:]*$/, "") : recs[0]!.deviceSerial) : null,
      placement: recs.length ? recs.map((r) => r.placement ?? "unknown").join(", ") : null,
      durationS: durations.length ? Math.max(...durations) : null,
      problem: f.error?.message ?? null,
    };
  });
  if (set.recordings.length === 0) {
    return summarize(files, null, "None of these files could be read as a sensor recording.");
  }
  onProgress({ stage: "analysing", fileCount, fraction: 0.55 });
  try {
    return summarize(files, analyze(set.recordings), null);
  } catch (error) {
    return summarize(files, null, messageOf(error));
  }
}
