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
  for (const tr of traces) addWhereValid(yaw, count, tr.yawDegS, tr.valid);
  divideByCount(yaw, count);
  return detectTurns(yaw, traces[0]!.sampleRateHz).map((t) => ({ startS: t.startS, endS: t.endS }));
}

// The sample loops are small functions of their own, so sessionTurns is not compiled in the middle
// of its first loop (and again when the code after the loops first runs).

/**
 * sum[i] += x[i] and count[i] += 1 where valid, in place. Every sample is read and the validity
 * picks x[i] or +0 to add (the same sums: a sum that starts at +0 is never −0), so the loop is not
 * first compiled before it has added anything when a recording starts invalid.
 */
function addWhereValid(sum: Float64Array, count: Uint8Array, x: Float64Array, valid: Uint8Array): void {
  for (let i = 0; i < sum.length; i++) {
    const on = valid[i]! > 0;
    sum[i] = sum[i]! + (on ? x[i]! : 0);
    count[i] = count[i]! + (on ? 1 : 0);
  }
}

/** sum[i] /= count[i] where more than one value was added (one value is its own mean). */
function divideByCount(sum: Float64Array, count: Uint8Array): void {
  for (let i = 0; i < sum.length; i++) if (count[i]! > 1) sum[i]! /= count[i]!;
}
