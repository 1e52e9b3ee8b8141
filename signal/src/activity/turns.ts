import { butterworthSections } from "../filter/butterworth-sections";
import { lowPassZeroPhaseSegments, zeroPhaseSegments3 } from "../filter/zero-phase-butterworth";
import type { Bout, ImuSignals } from "../types";
import { hypot3 } from "./hypot3";

/** Gravity direction: accelerometer low-passed at this cut-off (Hz, 2nd order, zero phase). */
export const GRAVITY_LOW_PASS_HZ = 0.5;
/** Yaw rate low-passed at this cut-off to remove the stride oscillation (Hz). */
export const YAW_LOW_PASS_HZ = 1;
/** A turn starts where |yaw rate| exceeds this (°/s, common practice) … */
export const TURN_ONSET_DEG_S = 15;
/** … and is extended while |yaw rate| stays above this (°/s, common practice). */
export const TURN_EXTEND_DEG_S = 5;
/** Sub-turns in the same direction closer than this are merged (s) — Sensors 2020;20(18):5377. */
export const TURN_MERGE_GAP_S = 0.5;
/** A turn must total at least this much rotation (°) and last 0.5–10 s — Sensors 2020;20(18):5377. */
export const TURN_MIN_ANGLE_DEG = 90;
export const TURN_MIN_DURATION_S = 0.5;
export const TURN_MAX_DURATION_S = 10;

export interface Turn extends Bout {
  angleDeg: number;
}

/** Yaw is computed at about this rate (block means); turns last seconds, so 20 Hz is ample. */
export const YAW_TARGET_RATE_HZ = 20;

export interface YawTrace {
  yawDegS: Float64Array;
  valid: Uint8Array;
  sampleRateHz: number;
  /** Grid samples per yaw sample. */
  factor: number;
}

/**
 * Angular rate about the gravity axis (°/s): gyro · ĝ, with ĝ the unit low-passed accelerometer
 * vector (at rest the accelerometer points up, so positive = counter-clockwise seen from above).
 * Mounting-independent. Computed on block means at ~YAW_TARGET_RATE_HZ (a block is valid only when
 * all its samples are), low-passed at YAW_LOW_PASS_HZ. Invalid samples are 0.
 */
export function yawRateAboutGravity(
  s: ImuSignals,
  sampleRateHz: number,
): YawTrace {
  const factor = Math.max(1, Math.floor(sampleRateHz / YAW_TARGET_RATE_HZ));
  const rate = sampleRateHz / factor;
  const m = Math.floor(s.valid.length / factor);
  const valid = blockValid(s.valid, factor, m);
  const ch = [...blockMeans3(s.accX, s.accY, s.accZ, valid, factor), ...blockMeans3(s.gyroX, s.gyroY, s.gyroZ, valid, factor)];
  const gravity = butterworthSections("lowpass", 2, GRAVITY_LOW_PASS_HZ, rate);
  const [gx, gy, gz] = zeroPhaseSegments3([ch[0]!, ch[1]!, ch[2]!], [gravity, gravity, gravity], valid);
  const yaw = rateAlong(ch[3]!, ch[4]!, ch[5]!, gx, gy, gz, valid);
  return { yawDegS: lowPassZeroPhaseSegments(yaw, valid, rate, YAW_LOW_PASS_HZ, 2), valid, sampleRateHz: rate, factor };
}

// The sample loops are small functions of their own: each is compiled once for all its channels and
// sensors, rather than yawRateAboutGravity being compiled (filters inlined) in the middle of its
// first long loop and again when the code after it first runs.

/** 1 for each block of `factor` samples that are all valid (blocks k = 0 … m − 1). */
function blockValid(sampleValid: Uint8Array, factor: number, m: number): Uint8Array {
  const valid = new Uint8Array(m);
  for (let k = 0; k < m; k++) {
    let ok = 1;
    const o = k * factor;
    for (let i = 0; i < factor; i++) ok &= sampleValid[o + i]!;
    valid[k] = ok;
  }
  return valid;
}

/**
 * Mean of each valid block of `factor` samples of three channels (each summed in sample order, then
 * divided); 0 for invalid blocks. Three channels per pass: a block is only `factor` samples, and the
 * short inner loop's exit costs as much as its work when it carries one channel.
 */
function blockMeans3(x: ArrayLike<number>, y: ArrayLike<number>, z: ArrayLike<number>, valid: Uint8Array, factor: number): [Float64Array, Float64Array, Float64Array] {
  const m = valid.length;
  const mx = new Float64Array(m);
  const my = new Float64Array(m);
  const mz = new Float64Array(m);
  for (let k = 0; k < m; k++) {
    let sx = 0;
    let sy = 0;
    let sz = 0;
    const o = k * factor;
    for (let i = o; i < o + factor; i++) {
      sx += x[i]!;
      sy += y[i]!;
      sz += z[i]!;
    }
    const ok = valid[k]! > 0;
    mx[k] = ok ? sx / factor : 0;
    my[k] = ok ? sy / factor : 0;
    mz[k] = ok ? sz / factor : 0;
  }
  return [mx, my, mz];
}

/**
 * Angular rate about the direction of (gx, gy, gz): (ω · g) / |g| per valid sample, 0 where invalid
 * or |g| < 1e-6. Every sample is computed and the validity then picks the value or 0, so the loop
 * is not first compiled before it has computed a single one (a recording may start invalid).
 */
function rateAlong(
  wx: Float64Array,
  wy: Float64Array,
  wz: Float64Array,
  gx: Float64Array,
  gy: Float64Array,
  gz: Float64Array,
  valid: Uint8Array,
): Float64Array {
  const m = valid.length;
  const yaw = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    const norm = hypot3(gx[i]!, gy[i]!, gz[i]!);
    const rate = (wx[i]! * gx[i]! + wy[i]! * gy[i]! + wz[i]! * gz[i]!) / norm;
    yaw[i] = !valid[i] || norm < 1e-6 ? 0 : rate;
  }
  return yaw;
}

/** Turns from a yaw-rate trace (°/s): onset/extension thresholds, same-direction merging, angle and duration limits. */
export function detectTurns(yawRateDegS: ArrayLike<number>, sampleRateHz: number): Turn[] {
  const n = yawRateDegS.length;
  const dt = 1 / sampleRateHz;
  const raw: Turn[] = [];
  let i = 0;
  while (i < n) {
    i = nextOnset(yawRateDegS, i);
    if (i >= n) break;
    const sign = Math.sign(yawRateDegS[i]!);
    let a = i;
    while (a > 0 && yawRateDegS[a - 1]! * sign > TURN_EXTEND_DEG_S) a--;
    let b = i;
    while (b < n - 1 && yawRateDegS[b + 1]! * sign > TURN_EXTEND_DEG_S) b++;
    let angle = 0;
    for (let k = a; k <= b; k++) angle += yawRateDegS[k]! * dt;
    raw.push({ startS: a * dt, endS: b * dt, angleDeg: angle });
    i = b + 1;
  }
  const merged: Turn[] = [];
  for (const t of raw) {
    const prev = merged[merged.length - 1];
    if (prev && Math.sign(prev.angleDeg) === Math.sign(t.angleDeg) && t.startS - prev.endS < TURN_MERGE_GAP_S) {
      prev.endS = t.endS;
      prev.angleDeg += t.angleDeg;
    } else merged.push({ ...t });
  }
  return merged.filter((t) => {
    const d = t.endS - t.startS;
    return Math.abs(t.angleDeg) >= TURN_MIN_ANGLE_DEG && d >= TURN_MIN_DURATION_S && d <= TURN_MAX_DURATION_S;
  });
}

/**
 * First index ≥ from whose |yaw rate| is not at or below TURN_ONSET_DEG_S (n when none). The scan
 * over the quiet samples between turns is a small loop of its own, so detectTurns is not compiled
 * in the middle of it before the code for a turn has run.
 */
function nextOnset(yawRateDegS: ArrayLike<number>, from: number): number {
  const n = yawRateDegS.length;
  let i = from;
  while (i < n && Math.abs(yawRateDegS[i]!) <= TURN_ONSET_DEG_S) i++;
  return i;
}
