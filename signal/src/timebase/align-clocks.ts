import { detectWalkingMask } from "../activity/walking-bouts";
import type { Placement, QualityItem, SensorRecording } from "../types";
import { estimateLegClockOffset } from "./clock-offset";
import { type ImpactEnvelope, impactEnvelope } from "./impact-signal";
import { strideTimeFromImpacts } from "./own-impacts";
import { type ResampledSensor, resampleToGrid } from "./resample-to-grid";
import type { SessionGrid } from "./session-grid";

/** Offsets beyond this are reported as `clock-offset` (s); any strong estimate is corrected. */
export const CLOCK_OFFSET_REPORT_S = 0.02;

export interface ClockAlignment {
  /** The right leg sensor that was moved, when one was. */
  placement: Placement | null;
  /** Added to that sensor's clock at the session's centre (s); null when not estimated. */
  offsetS: number | null;
  driftMsPerMin: number | null;
  corrected: boolean;
  quality: QualityItem[];
}

const BRIDGES: readonly Placement[] = ["lower_back", "left_wrist", "right_wrist"];

/**
 * Aligns the right leg sensor's clock to the left one's (the pair the events come from: shanks,
 * else feet) from heel-strike impacts felt by the lower back or wrists (method and assumptions in
 * clock-offset.ts). Corrects by re-resampling the right recording with its clock moved, replacing
 * it in `sensors`. Only the left–right pair is aligned: between different body segments the impact
 * arrives with a physical delay that cannot be told apart from a clock offset.
 */
export function alignLegClocks(
  recordings: readonly SensorRecording[],
  grid: SessionGrid,
  sensors: Map<Placement, ResampledSensor>,
  allRecordings: readonly SensorRecording[],
): ClockAlignment {
  const none = (message: string): ClockAlignment => ({
    placement: null,
    offsetS: null,
    driftMsPerMin: null,
    corrected: false,
    quality: [{ code: "clock-unverified", severity: "info", message }],
  });
  const pair = (["shank", "foot"] as const).map((seg) => [`left_${seg}`, `right_${seg}`] as [Placement, Placement]).find(([l, r]) => sensors.has(l) && sensors.has(r));
  if (!pair) return none("clock alignment between the legs not checked: it needs a left and a right leg sensor");
  const [leftP, rightP] = pair;
  const bridgePlacements = BRIDGES.filter((p) => sensors.has(p));
  if (bridgePlacements.length === 0) {
    return none("clock alignment between the legs could not be checked: no lower-back or wrist sensor feels both feet (start times were trusted)");
  }
  const fs = grid.sampleRateHz;
  const left = sensors.get(leftP)!;
  const right = sensors.get(rightP)!;
  const walking = detectWalkingMask(
    [left, right].map((s) => ({ x: s.gyroX, y: s.gyroY, z: s.gyroZ, valid: s.valid })),
    fs,
    grid.length,
  );
  const env = (s: ResampledSensor): ImpactEnvelope => impactEnvelope(s.accX, s.accY, s.accZ, s.valid, fs);
  const eL = env(left);
  const eR = env(right);
  const rate = eL.rateHz;
  const active = new Uint8Array(eL.envelope.length);
  for (let k = 0; k < active.length; k++) active[k] = walking[k * eL.factor]!;
  const strideS = strideTimeFromImpacts(eL.envelope, eL.valid, active, rate) ?? strideTimeFromImpacts(eR.envelope, eR.valid, active, rate);
  if (strideS === null) return none("clock alignment between the legs could not be checked: no regular walking in the impact signals");
  const bridges = bridgePlacements.map((p) => env(sensors.get(p)!));
  const memo = new Map<number, number>();
  const alternation = (offsetS: number) => {
    const k = Math.round(offsetS * fs);
    if (!memo.has(k)) memo.set(k, legAlternation(left, right, walking, k / fs, fs));
    return memo.get(k)!;
  };
  const est = estimateLegClockOffset(eL, eR, bridges, active, rate, strideS / 2, alternation);
  if (!est.fit) return none(`clock alignment between the legs could not be checked: ${est.reason} (start times were trusted)`);
  const { offsetS, driftSPerS, centreS, corrected: driftCorrected } = est.fit;
  const driftMsPerMin = driftSPerS * 60_000;
  // Strong evidence is applied even below the report threshold (a few ms still move PCI); only
  // offsets beyond CLOCK_OFFSET_REPORT_S are worth a warning.
  const big = Math.abs(offsetS) > CLOCK_OFFSET_REPORT_S || (driftCorrected && Math.abs(driftSPerS) * grid.durationS > CLOCK_OFFSET_REPORT_S);
  const index = allRecordings.findIndex((r) => r.placement === rightP);
  const rec = recordings.find((r) => r.placement === rightP)!;
  const gridOffsetS = grid.offsetsS[index] ?? 0;
  const timeS = new Float64Array(rec.timeS.length);
  const slope = driftCorrected ? driftSPerS : 0;
  for (let i = 0; i < timeS.length; i++) timeS[i] = rec.timeS[i]! + offsetS + slope * (gridOffsetS + rec.timeS[i]! - centreS);
  sensors.set(rightP, resampleToGrid({ ...rec, timeS }, grid, index));
  const driftText = driftCorrected ? `, drifting ${driftMsPerMin.toFixed(2)} ms/min (corrected along the session)` : "";
  return {
    placement: rightP,
    offsetS,
    driftMsPerMin,
    corrected: true,
    quality: !big ? [] : [
      {
        code: "clock-offset",
        severity: "warning",
        placement: rightP,
        message: `${rec.fileName}: its clock differs from ${leftP}'s by ${(offsetS * 1000).toFixed(0)} ms${driftText} (from heel-strike impacts felt by ${bridgePlacements.join(", ")}); corrected by ${offsetS >= 0 ? "+" : ""}${(offsetS * 1000).toFixed(0)} ms`,
      },
    ],
  };
}

/**
 * Correlation of the two leg sensors' |ω| over walking with the right one's clock moved by offsetS.
 * Walking legs swing half a stride apart (Plotnik et al. 2007: left–right phase near 180° even in
 * impaired gait), so the true offset gives a negative value and an offset one step off a positive
 * one: a coarse, step-level check only (|ω| is independent of how the sensor is mounted).
 */
export function legAlternation(left: ResampledSensor, right: ResampledSensor, walking: Uint8Array, offsetS: number, fs: number): number {
  const shift = Math.round(offsetS * fs);
  const n = walking.length;
  const mag = (s: ResampledSensor, i: number) => Math.hypot(s.gyroX[i]!, s.gyroY[i]!, s.gyroZ[i]!);
  let sl = 0;
  let sr = 0;
  let c = 0;
  for (let i = 0; i < n; i++) {
    const j = i - shift;
    if (j < 0 || j >= n || !walking[i] || !left.valid[i] || !right.valid[j]) continue;
    sl += mag(left, i);
    sr += mag(right, j);
    c++;
  }
  if (c < 2 * fs) return Number.NaN;
  const ml = sl / c;
  const mr = sr / c;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    const j = i - shift;
    if (j < 0 || j >= n || !walking[i] || !left.valid[i] || !right.valid[j]) continue;
    const x = mag(left, i) - ml;
    const y = mag(right, j) - mr;
    sxy += x * y;
    sxx += x * x;
    syy += y * y;
  }
  return sxx > 0 && syy > 0 ? sxy / Math.sqrt(sxx * syy) : Number.NaN;
}
