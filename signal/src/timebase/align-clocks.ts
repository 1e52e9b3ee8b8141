import { detectWalkingMask } from "../activity/walking-bouts";
import type { Placement, QualityItem, SensorRecording } from "../types";
import { estimateLegClockOffset } from "./clock-offset";
import { type ImpactEnvelope, impactEnvelope } from "./impact-signal";
import { strideTimeFromImpacts } from "./impact-stride-time";
import { shiftImpactEnvelope } from "./shift-envelope";
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
  /** The legs' impact signals for the wrist alignment (align-wrist-clocks.ts); null without walking in them. */
  impacts: LegImpacts | null;
}

export interface LegImpacts {
  left: ImpactEnvelope;
  /** The right leg's envelope on the left leg's clock (computed on first use after a correction). */
  readonly right: ImpactEnvelope;
  /** True when the right leg was put on the left leg's clock (or found on it) from strong evidence. */
  legsAligned: boolean;
  /** Walking bins (the analysis's walking rule on the legs' |ω|), bin rate, stride time. */
  active: Uint8Array;
  rateHz: number;
  strideS: number;
  /** Envelopes already computed for the bridge sensors (unchanged by the leg alignment). */
  bridges: Map<Placement, ImpactEnvelope>;
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
  const none = (message: string, impacts: LegImpacts | null = null): ClockAlignment => ({
    placement: null,
    offsetS: null,
    driftMsPerMin: null,
    corrected: false,
    quality: [{ code: "clock-unverified", severity: "info", message }],
    impacts,
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
  const env = (s: ResampledSensor): ImpactEnvelope => impactEnvelope(s.accX, s.accY, s.accZ, s.valid, fs);
  const eL = env(left);
  const eR = env(right);
  const rate = eL.rateHz;
  const bins = eL.envelope.length;
  // Walking, by the analysis's own rule (activity/walking-bouts.ts), on the bins' mean |ω|.
  const magL = gyroMagnitudeBins(left, eL.factor, bins);
  const magR = gyroMagnitudeBins(right, eL.factor, bins);
  const zeros = new Float32Array(bins);
  const active = detectWalkingMask(
    [magL, magR].map((mag) => ({ x: mag, y: zeros, z: zeros, valid: notNaN(mag) })),
    rate,
    bins,
  );
  const strideS = strideTimeFromImpacts(eL.envelope, eL.valid, active, rate) ?? strideTimeFromImpacts(eR.envelope, eR.valid, active, rate);
  if (strideS === null) return none("clock alignment between the legs could not be checked: no regular walking in the impact signals");
  const bridges = bridgePlacements.map((p) => env(sensors.get(p)!));
  const bridgeMap = new Map(bridgePlacements.map((p, i) => [p, bridges[i]!] as const));
  const impactsWith = (legsAligned: boolean, rightEnvelope: () => ImpactEnvelope): LegImpacts => {
    let cached: ImpactEnvelope | null = null;
    return {
      left: eL,
      get right() {
        return (cached ??= rightEnvelope());
      },
      legsAligned,
      active,
      rateHz: rate,
      strideS,
      bridges: bridgeMap,
    };
  };
  const memo = new Map<number, number>();
  const alternation = (offsetS: number) => {
    const k = Math.round(offsetS * rate);
    if (!memo.has(k)) memo.set(k, legAlternation(magL, magR, active, k, rate));
    return memo.get(k)!;
  };
  const est = estimateLegClockOffset(eL, eR, bridges, active, rate, strideS / 2, alternation);
  if (!est.fit) return none(`clock alignment between the legs could not be checked: ${est.reason} (start times were trusted)`, impactsWith(false, () => eR));
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
    impacts: impactsWith(true, () => shiftImpactEnvelope(eR, (t) => offsetS + slope * (t - centreS))),
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
 * Correlation of the two leg sensors' |ω| (per envelope bin) over walking with the right one's clock
 * moved by shiftBins.
 * Walking legs swing half a stride apart (Plotnik et al. 2007: left–right phase near 180° even in
 * impaired gait), so the true offset gives a negative value and an offset one step off a positive
 * one: a coarse, step-level check only (|ω| is independent of how the sensor is mounted).
 */
export function legAlternation(left: Float32Array, right: Float32Array, walking: Uint8Array, shiftBins: number, rateHz: number): number {
  const n = walking.length;
  let sx = 0;
  let sy = 0;
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  let c = 0;
  for (let i = Math.max(0, shiftBins); i < Math.min(n, n + shiftBins); i++) {
    const x = left[i]!;
    const y = right[i - shiftBins]!;
    if (!walking[i] || Number.isNaN(x) || Number.isNaN(y)) continue;
    sx += x;
    sy += y;
    sxx += x * x;
    syy += y * y;
    sxy += x * y;
    c++;
  }
  if (c < 2 * rateHz) return Number.NaN;
  const vx = sxx - (sx * sx) / c;
  const vy = syy - (sy * sy) / c;
  return vx > 0 && vy > 0 ? (sxy - (sx * sy) / c) / Math.sqrt(vx * vy) : Number.NaN;
}

/** |ω| (°/s) averaged over `factor` grid samples per bin; NaN where any sample is invalid. */
function gyroMagnitudeBins(s: ResampledSensor, factor: number, bins: number): Float32Array {
  const out = new Float32Array(bins);
  binnedMagnitude(s.gyroX, s.gyroY, s.gyroZ, s.valid, factor, out);
  return out;
}

// The sample loops are small functions of their own over plain arrays (no property reads per
// sample), compiled once rather than in the middle of a long first call.

function binnedMagnitude(gx: Float32Array, gy: Float32Array, gz: Float32Array, valid: Uint8Array, factor: number, out: Float32Array): void {
  for (let k = 0; k < out.length; k++) {
    let sum = 0;
    let ok = true;
    for (let i = k * factor; i < (k + 1) * factor; i++) {
      if (!valid[i]) ok = false;
      const x = gx[i]!;
      const y = gy[i]!;
      const z = gz[i]!;
      sum += Math.sqrt(x * x + y * y + z * z);
    }
    out[k] = ok ? sum / factor : Number.NaN;
  }
}

/** 1 where mag is a number, 0 where NaN (NaN marks an invalid bin). */
function notNaN(mag: Float32Array): Uint8Array {
  const v = new Uint8Array(mag.length);
  for (let k = 0; k < mag.length; k++) v[k] = mag[k] === mag[k] ? 1 : 0;
  return v;
}
