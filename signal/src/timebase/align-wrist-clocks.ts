import type { Placement, QualityItem, SensorRecording } from "../types";
import { type ClockAlignment, CLOCK_OFFSET_REPORT_S } from "./align-clocks";
import { impactEnvelope } from "./impact-signal";
import { type ResampledSensor, resampleToGrid } from "./resample-to-grid";
import type { SessionGrid } from "./session-grid";
import { estimateWristClockOffset, type WristClockEstimate } from "./wrist-clock-offset";

const WRISTS: readonly Placement[] = ["left_wrist", "right_wrist"];

export interface WristClockAlignment {
  placement: Placement;
  /** Added to the wrist's clock (s); null when not estimated. */
  offsetS: number | null;
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
    for (const p of present) unverified(p, why);
    return { wrists: present.map((placement) => ({ placement, offsetS: null, corrected: false, estimate: null })), quality };
  }
  const fs = grid.sampleRateHz;
  const wrists = present.map((p): WristClockAlignment => {
    const s = sensors.get(p)!;
    const env = imp.bridges.get(p) ?? impactEnvelope(s.accX, s.accY, s.accZ, s.valid, fs);
    const est = estimateWristClockOffset(imp.left, imp.right, env, imp.active, imp.rateHz, imp.strideS / 2);
    if (!est || !est.strong) {
      unverified(p, est?.reason ?? "too little walking with both the wrist and the legs recording");
      return { placement: p, offsetS: null, corrected: false, estimate: est };
    }
    const index = allRecordings.findIndex((r) => r.placement === p);
    const rec = recordings.find((r) => r.placement === p)!;
    const timeS = new Float64Array(rec.timeS.length);
    for (let i = 0; i < timeS.length; i++) timeS[i] = rec.timeS[i]! + est.offsetS;
    sensors.set(p, resampleToGrid({ ...rec, timeS }, grid, index));
    // Strong evidence is applied even below the report threshold, as for the legs.
    if (Math.abs(est.offsetS) > CLOCK_OFFSET_REPORT_S) {
      const ms = (est.offsetS * 1000).toFixed(0);
      quality.push({
        code: "clock-offset",
        severity: "warning",
        placement: p,
        message: `${rec.fileName} (${p}): its clock differs from the legs' by ${ms} ms (from heel-strike impacts felt at the wrist); corrected by ${est.offsetS >= 0 ? "+" : ""}${ms} ms`,
      });
    }
    return { placement: p, offsetS: est.offsetS, corrected: true, estimate: est };
  });
  return { wrists, quality };
}
