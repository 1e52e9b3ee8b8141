import { describe, expect, it } from "vitest";
import {
  MIN_AXIS_SAMPLES,
  analyze,
  projectOnAxis,
  readSensorCsv,
  resampleToGrid,
  sagittalAxis,
  sessionGrid,
  synthesizeSession,
  type Analysis,
  type SensorRecording,
  type SynthOptions,
} from "@pendula/signal";
import { sagittalTraces, type SessionTrace } from "../session-traces";

/**
 * The traces the worker stored before analyze() returned its own signals: recomputed here from the
 * recordings with signal's time-base and orientation steps, inversion read from the quality list.
 * Kept as the reference the stored traces must still match.
 */
function tracesAsBefore(recordings: readonly SensorRecording[], analysis: Analysis): SessionTrace[] {
  const grid = sessionGrid(recordings);
  const traces: SessionTrace[] = [];
  recordings.forEach((rec, index) => {
    if (!rec.placement) return;
    const r = resampleToGrid(rec, grid, index);
    let mask: Uint8Array = new Uint8Array(grid.length);
    for (const bout of analysis.bouts) {
      const from = Math.max(0, Math.floor(bout.startS * grid.sampleRateHz));
      const to = Math.min(grid.length - 1, Math.ceil(bout.endS * grid.sampleRateHz));
      for (let i = from; i <= to; i++) mask[i] = r.valid[i]!;
    }
    if (mask.reduce((n, v) => n + v, 0) < MIN_AXIS_SAMPLES) mask = r.valid;
    const axis = sagittalAxis(r.gyroX, r.gyroY, r.gyroZ, mask);
    let omega = axis ? projectOnAxis(r.gyroX, r.gyroY, r.gyroZ, axis.axis) : Float64Array.from(r.gyroZ);
    if (analysis.quality.some((q) => q.code === "inverted-sensor" && q.placement === rec.placement)) omega = omega.map((v) => -v);
    const samples = new Float32Array(grid.length);
    for (let i = 0; i < grid.length; i++) samples[i] = r.valid[i] ? omega[i]! : Number.NaN;
    traces.push({ placement: rec.placement, sampleRateHz: grid.sampleRateHz, startS: 0, samples });
  });
  return traces;
}

function compare(options: SynthOptions) {
  const recordings = synthesizeSession(options).files.map((f) => readSensorCsv(f.text, f.fileName));
  const analysis = analyze(recordings, { sagittalSignals: true });
  const now = sagittalTraces(analysis);
  const before = tracesAsBefore(recordings, analysis);
  expect(now.map((t) => t.placement)).toEqual(before.map((t) => t.placement));
  return now.map((t, k) => {
    const b = before[k]!;
    expect(t.sampleRateHz).toBe(b.sampleRateHz);
    expect(t.samples.length).toBe(b.samples.length);
    let maxDiff = 0;
    let peak = 0;
    for (let i = 0; i < t.samples.length; i++) {
      expect(Number.isNaN(t.samples[i]!), `${t.placement} gap at ${i}`).toBe(Number.isNaN(b.samples[i]!));
      if (Number.isNaN(b.samples[i]!)) continue;
      maxDiff = Math.max(maxDiff, Math.abs(t.samples[i]! - b.samples[i]!));
      peak = Math.max(peak, Math.abs(b.samples[i]!));
    }
    return { placement: t.placement, maxDiff, peak };
  });
}

describe("sagittalTraces(analysis)", () => {
  // Legs: the same projection as before, on a walking mask that differs by at most one sample at
  // each bout edge, so the axis moves by far less than a Float32 step of the trace; wrists likewise.
  // Measured: identical Float32 samples (difference 0) on both sessions below.
  it("stores the traces the worker stored before, on a generated four-sensor session with a gap", () => {
    const rows = compare({ seed: 21, durationS: 120, gaps: [{ placement: "right_shank", startS: 50, durationS: 2 }] });
    expect(rows).toHaveLength(4);
    for (const r of rows) {
      expect(r.peak, r.placement).toBeGreaterThan(50);
      expect(r.maxDiff / r.peak, `${r.placement}: ${r.maxDiff} deg/s`).toBeLessThan(1e-3);
    }
  }, 60_000);

  it("keeps a sensor worn upside down the right way up, as the analysis decided", () => {
    const rows = compare({ seed: 22, durationS: 90, invertedPlacement: "left_shank" });
    for (const r of rows) expect(r.maxDiff / r.peak, r.placement).toBeLessThan(1e-3);
  }, 60_000);

  it("a leg trace is the signal its events were found on", () => {
    const recordings = synthesizeSession({ seed: 23, durationS: 60 }).files.map((f) => readSensorCsv(f.text, f.fileName));
    const analysis = analyze(recordings, { sagittalSignals: true });
    const left = analysis.sagittal!.find((s) => s.placement === "left_shank")!;
    expect(left.usedForEvents).toBe(true);
    expect(analysis.sagittal!.find((s) => s.placement === "left_wrist")!.usedForEvents).toBe(false);
    // Mid-swing is the peak of forward shank rotation (Aminian et al. 2002): each detected
    // mid-swing sits on a positive peak of the stored trace.
    const trace = sagittalTraces(analysis).find((t) => t.placement === "left_shank")!;
    for (const ms of analysis.events.left.midSwings ?? []) {
      expect(trace.samples[Math.round(ms * trace.sampleRateHz)]!).toBeGreaterThan(100);
    }
    expect(() => sagittalTraces(analyze(recordings))).toThrow(/sagittalSignals/);
  }, 60_000);
});
