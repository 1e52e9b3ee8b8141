import type { ResampledSensor } from "../timebase/resample-to-grid";
import type { Bout } from "../types";
import { detectTurns, yawRateAboutGravity } from "./turns";

/**
 * Turns of a session from the yaw rate about gravity: the lower back's when it is worn (it turns with
 * the body and carries no leg swing), else the mean over the leg
 * sensors valid at each sample. No sources, no turns.
 */
export function sessionTurns(back: ResampledSensor | undefined, legSensors: readonly ResampledSensor[], sampleRateHz: number): Bout[] {
  const yawSources = back ? [back] : legSensors;
  if (yawSources.length === 0) return [];
  const traces = yawSources.map((s) => yawRateAboutGravity(s, sampleRateHz));
  const m = traces[0]!.yawDegS.length;
  const yaw = new Float64Array(m);
  const count = new Uint8Array(m);
  for (const tr of traces) {
    for (let i = 0; i < m; i++) if (tr.valid[i]) {
      yaw[i]! += tr.yawDegS[i]!;
      count[i]!++;
    }
  }
  for (let i = 0; i < m; i++) if (count[i]! > 1) yaw[i]! /= count[i]!;
  return detectTurns(yaw, traces[0]!.sampleRateHz).map((t) => ({ startS: t.startS, endS: t.endS }));
}
