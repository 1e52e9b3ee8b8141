import type { Placement, QualityItem, SensorRecording } from "../types";
import { type ClockAlignment, CLOCK_OFFSET_REPORT_S } from "./align-clocks";
import { impactEnvelope } from "./impact-signal";
import { type ResampledSensor, resampleToGrid } from "./resample-to-grid";
import type { SessionGrid } from "./session-grid";
import { estimateWristClockOffset, type WristClockEstimate, wristClockDrift } from "./wrist-clock-offset";

const WRISTS: readonly Placement[] = ["left_wrist", "right_wrist"];

export interface WristClockAlignment {
  placement: Placement;
  /** Added to the wrist's clock (s; at the drift fit's centre when drifting); null when not estimated. */
  offsetS: number | null;
  /** Drift corrected along the session (ms/min); null when none was kept. */
  driftMsPerMin: number | null;
  corrected: boolean;
  estimate: WristClockEstimate | null;
}

/**
 * Aligns each wrist sensor's clock to the legs' (the left leg's clock, the right leg already aligned to
 * it by alignLegClocks) from the heel-strike impacts both feel (method and assumptions in
 * wrist-clock-offset.ts). Arm–leg relative phase compares a wrist with a leg sample by sample, so a
 * wrist clock error goes straight into it (100 ms ≈ 33° at a 1.1 s stride). A strong estimate is
 * applied by re-resampling the wrist recording with its clock moved, replacing it in `sensors`;
 * offsets beyond CLOCK_OFFSET_REPORT_S are reported as `clock-offset`, weak ones as `clock-unverified`.
 */
/**
 * Wrist offsets up to this size are left uncorrected (s). The model behind the estimate assumes the
 * wrist feels a heel strike when the leg does, but impacts reach the trunk 13–37 ms after the shank
 * on recorded stroke walks (lower-back sensor, see signal/README.md "Clock alignment"), and the arm
 * is further up the chain; a correction inside that delay could add the error it means to remove.
 * 50 ms is that delay plus a margin (common practice); a 50 ms clock error moves arm–leg phase by
 * ≈ 16° at a 1.1 s stride, so larger errors are still caught.
 */
export const WRIST_TRANSMISSION_MARGIN_S = 0.05;

export function alignWristClocks(
  recordings: readonly SensorRecording[],
  grid: SessionGrid,
  sensors: Map<Placement, ResampledSensor>,
  allRecordings: readonly SensorRecording[],
  legs: ClockAlignment,
): { wrists: WristClockAlignment[]; quality: QualityItem[] } {
  const present = WRISTS.filter((p) => sensors.has(p));
  const quality: QualityItem[] = [];
  if (present.length === 0) return { wrists: [], quality };
  const unverified = (p: Placement, why: string) =>
    quality.push({ code: "clock-unverified", severity: "info", placement: p, message: `${sensors.get(p)!.fileName}: wrist clock not checked against the legs: ${why}; its start time was trusted (arm–leg phase moves ≈ 3.3° per 10 ms at a 1.1 s stride)` });
  const imp = legs.impacts;
  if (!imp || !imp.legsAligned) {
    const why = !imp ? "no regular walking in the legs' impact signals, or no left and right leg sensor" : "the two leg sensors' clocks could not be aligned to each other first";
    // One item for the shared cause (the legs' own item says why in detail), not one per wrist.
    quality.push({ code: "clock-unverified", severity: "info", message: `wrist clocks (${present.join(", ")}) not checked against the legs: ${why}; their start times were trusted` });
    return { wrists: present.map((placement) => ({ placement, offsetS: null, driftMsPerMin: null, corrected: false, estimate: null })), quality };
  }
  const fs = grid.sampleRateHz;
  const wrists = present.map((p): WristClockAlignment => {
    const s = sensors.get(p)!;
    const env = imp.bridges.get(p) ?? impactEnvelope(s.accX, s.accY, s.accZ, s.valid, fs);
    const est = estimateWristClockOffset(imp.left, imp.right, env, imp.active, imp.rateHz, imp.strideS / 2);
    if (!est || !est.strong) {
      unverified(p, est?.reason ?? "too little walking with both the wrist and the legs recording");
      return { placement: p, offsetS: null, driftMsPerMin: null, corrected: false, estimate: est };
    }
    const drift = wristClockDrift(imp.left, imp.right, env, imp.active, imp.rateHz, est.offsetS);
    const driftOn = drift?.corrected === true;
    if (!driftOn && Math.abs(est.offsetS) <= WRIST_TRANSMISSION_MARGIN_S) {
      // Within the delay a heel strike takes to reach the arm, an estimate cannot tell a clock error
      // from the body's own transmission, so the recording is left as it is (and said so once the
      // estimate is large enough to matter).
      if (Math.abs(est.offsetS) > CLOCK_OFFSET_REPORT_S) quality.push({
        code: "clock-unverified",
        severity: "info",
        placement: p,
        message: `${s.fileName}: wrist clock ${(est.offsetS * 1000).toFixed(0)} ms from the legs', within the delay with which heel-strike impacts travel up the body; left as recorded`,
      });
      return { placement: p, offsetS: est.offsetS, driftMsPerMin: null, corrected: false, estimate: est };
    }
    // offset(t) = a + b·(t − centre) in session seconds; a constant when no drift was kept.
    const offsetS = driftOn ? drift.offsetS : est.offsetS;
    const slope = driftOn ? drift.driftSPerS : 0;
    const centreS = driftOn ? drift.centreS : 0;
    const index = allRecordings.findIndex((r) => r.placement === p);
    const rec = recordings.find((r) => r.placement === p)!;
    const gridOffsetS = grid.offsetsS[index] ?? 0;
    const timeS = new Float64Array(rec.timeS.length);
    for (let i = 0; i < timeS.length; i++) timeS[i] = rec.timeS[i]! + offsetS + slope * (gridOffsetS + rec.timeS[i]! - centreS);
    sensors.set(p, resampleToGrid({ ...rec, timeS }, grid, index));
    const driftMsPerMin = driftOn ? drift.driftSPerS * 60_000 : null;
    if (Math.abs(offsetS) > CLOCK_OFFSET_REPORT_S || (driftOn && Math.abs(slope) * grid.durationS > CLOCK_OFFSET_REPORT_S)) {
      const ms = (offsetS * 1000).toFixed(0);
      const driftText = driftMsPerMin === null ? "" : `, drifting ${driftMsPerMin.toFixed(2)} ms/min (corrected along the session)`;
      quality.push({
        code: "clock-offset",
        severity: "warning",
        placement: p,
        message: `${rec.fileName} (${p}): its clock differs from the legs' by ${ms} ms${driftText} (from heel-strike impacts felt at the wrist); corrected by ${offsetS >= 0 ? "+" : ""}${ms} ms`,
      });
    }
    return { placement: p, offsetS, driftMsPerMin, corrected: true, estimate: est };
  });
  return { wrists, quality };
}
