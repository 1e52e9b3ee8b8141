import type { Analysis, SensorRecording } from "@pendula/signal";
import { plainQuality } from "./plain-words";
import type { PrecheckFile, PrecheckNotice, PrecheckSummary, PrecheckVerdict } from "./precheck-types";

/** Published minimum for reliable stride-time variability (Galna et al. 2013: at least 30 steps). */
const MIN_STEADY_STRIDES_FOR_READY = 15;

export function recordingDurationS(r: SensorRecording): number | null {
  const n = r.timeS.length;
  if (n < 2) return null;
  return (r.timeS[n - 1] ?? 0) - (r.timeS[0] ?? 0);
}

/**
 * Turns the analysis into what a person at home needs to decide whether to send the files or
 * record again: "redo" when nothing can be measured, "check" when something may need attention,
 * "ready" otherwise. The server re-runs the same analysis; this only catches bad recordings early.
 */
export function summarize(files: PrecheckFile[], analysis: Analysis | null, analysisProblem: string | null): PrecheckSummary {
  const notices: PrecheckNotice[] = (analysis?.quality ?? [])
    .filter((q) => q.severity !== "info")
    .map((q) => ({ severity: q.severity, text: plainQuality(q), code: q.code, detail: q.message }));

  for (const f of files) {
    if (f.problem) {
      notices.unshift({
        severity: "error",
        text: `${f.fileName} could not be read. It may not be a sensor file, or it was cut short while copying.`,
        code: "unreadable-file",
        detail: f.problem,
      });
    }
  }

  const steady = analysis?.metrics.steadyStrideCount ?? 0;
  let verdict: PrecheckVerdict = "ready";
  if (!analysis || analysis.quality.some((q) => q.code === "no-walking" || q.severity === "error") || (analysis.strides.length === 0)) {
    verdict = "redo";
  } else if (notices.some((n) => n.severity !== "info") || steady < MIN_STEADY_STRIDES_FOR_READY) {
    verdict = "check";
  }
  if (files.some((f) => f.problem) && verdict === "ready") verdict = "check";

  return {
    files,
    placements: analysis?.session.placements ?? [],
    durationS: analysis?.session.durationS ?? null,
    strideCount: analysis?.strides.length ?? 0,
    steadyStrideCount: steady,
    cadenceStepsPerMin: analysis?.metrics.cadenceStepsPerMin ?? null,
    notices,
    verdict,
    analysisProblem,
  };
}
