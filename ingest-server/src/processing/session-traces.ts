import {
  MIN_AXIS_SAMPLES,
  projectOnAxis,
  resampleToGrid,
  sagittalAxis,
  sessionGrid,
  type Analysis,
  type Placement,
  type SensorRecording,
} from "@pendula/signal";

/**
 * Sagittal angular velocity per placement for the portal's session chart, computed in the worker
 * from the same recordings and with signal's own time-base and orientation steps (session grid,
 * resampling, PCA axis, inversion) that analyze() uses. Stored at processing time rather than
 * recomputed per request because (1) the chart then always matches the events of the stored
 * analysis, even after the algorithm changes, until the session is reprocessed; (2) the chart route
 * only slices and decimates a Float32 array instead of re-reading and re-parsing megabytes of
 * text from object storage on every zoom.
 *
 * Samples outside a recording or inside a long gap are NaN, so the chart shows a break there.
 */
export interface SessionTrace {
  placement: Placement;
  sampleRateHz: number;
  /** Session time of sample 0. */
  startS: number;
  samples: Float32Array;
}

function walkingMask(length: number, sampleRateHz: number, analysis: Analysis, valid: Uint8Array): Uint8Array {
  const mask = new Uint8Array(length);
  for (const bout of analysis.bouts) {
    const from = Math.max(0, Math.floor(bout.startS * sampleRateHz));
    const to = Math.min(length - 1, Math.ceil(bout.endS * sampleRateHz));
    for (let i = from; i <= to; i++) mask[i] = valid[i]!;
  }
  return mask;
}

export function sagittalTraces(recordings: readonly SensorRecording[], analysis: Analysis): SessionTrace[] {
  if (recordings.length === 0) return [];
  const grid = sessionGrid(recordings);
  const traces: SessionTrace[] = [];
  recordings.forEach((rec, index) => {
    if (!rec.placement) return;
    const r = resampleToGrid(rec, grid, index);
    let mask = walkingMask(grid.length, grid.sampleRateHz, analysis, r.valid);
    if (mask.reduce((n, v) => n + v, 0) < MIN_AXIS_SAMPLES) mask = r.valid;
    const axis = sagittalAxis(r.gyroX, r.gyroY, r.gyroZ, mask);
    let omega = axis ? projectOnAxis(r.gyroX, r.gyroY, r.gyroZ, axis.axis) : Float64Array.from(r.gyroZ);
    // The analysis decides inversion (its `inverted-sensor` item); the chart follows that verdict
    // so the trace and the events drawn on it agree.
    if (analysis.quality.some((q) => q.code === "inverted-sensor" && q.placement === rec.placement)) {
      omega = omega.map((v) => -v);
    }
    const samples = new Float32Array(grid.length);
    for (let i = 0; i < grid.length; i++) samples[i] = r.valid[i] ? omega[i]! : Number.NaN;
    traces.push({ placement: rec.placement, sampleRateHz: grid.sampleRateHz, startS: 0, samples });
  });
  return traces;
}
