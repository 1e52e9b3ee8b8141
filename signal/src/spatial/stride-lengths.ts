import type { ImuSignals, Stride } from "../types";
import { AT_REST, integrateSagittalStride, type ResetState } from "./integrate-sagittal-stride";
import { leastRotationWindowCentre, MID_STANCE_WINDOW_S } from "./least-rotation-window";
import { sagittalPlaneSignals } from "./sagittal-plane";
import { shankPendulumReset } from "./shank-pendulum";

/** One shank or foot sensor on the session grid, with its signed sagittal axis. */
export interface SegmentSignals extends ImuSignals {
  segment: "shank" | "foot";
  /** Positive rotation about it moves the segment's lower end forward (see signedSagittalAxis). */
  axis: readonly [number, number, number];
}

/** Longest plausible stride (m) without a height: above any walking stride; common practice. */
export const MAX_STRIDE_LENGTH_M = 2.5;
/** With a height, a stride longer than this many body heights is taken as an integration failure; common practice. */
export const MAX_STRIDE_LENGTH_PER_HEIGHT = 1.5;
/** Gyro/gravity disagreement (deg) above which a stride's orientation is not trusted; common practice. */
export const MAX_ANGLE_DRIFT_DEG = 15;

export type StrideLengthRejection = "turn" | "no-stance" | "no-reset" | "invalid-data" | "angle-drift" | "implausible";

export interface StrideLengthResult {
  strideLengthM: number | null;
  rejection: StrideLengthRejection | null;
  /** Sample indices of the two reset instants (mid-stance of this stride and of the next). */
  resetIndices: [number, number] | null;
}

export interface StrideLengthOptions {
  sampleRateHz: number;
  /** Standing height (cm); bounds a plausible stride. */
  heightCm?: number;
  /** Ankle-to-sensor distance (m); required for a shank (shankSensorDistance(...), fitted per session). */
  shankSensorAboveAnkleM?: number;
}

/**
 * Stride length of each of one leg's strides from that leg's shank or foot sensor. Each stride is
 * integrated from the mid-stance that follows its IC to the mid-stance that follows the next IC (same
 * side): those two instants bracket the one swing of the stride, so the sensor's forward travel between
 * them is the stride's length. Foot: mid-stance = centre of the 100 ms of least gyro energy between IC
 * and the same-side FC (Rampp et al. 2015), where the foot is at rest (Mariani et al. 2010). Shank: the
 * shank never stops in stance, so mid-stance is the middle of IC…FC, where the foot is flat and the shank
 * turns about the ankle near vertical (Li et al. 2010), and the reset state is the pendulum's
 * (shank-pendulum.ts). On a treadmill the belt frame is inertial and
 * the foot rests on the belt, so the result is belt speed × stride time, as overground.
 *
 * `strides` are this side's strides; `finalContactsS` this side's FCs (sorted). Results are in the
 * order of `strides`.
 */
export function strideLengthsForSide(
  signals: SegmentSignals,
  strides: readonly Stride[],
  finalContactsS: readonly number[],
  options: StrideLengthOptions,
): StrideLengthResult[] {
  const fs = options.sampleRateHz;
  if (!(fs > 0)) throw new RangeError("strideLengthsForSide: sampleRateHz must be positive");
  const plane = sagittalPlaneSignals(signals.accX, signals.accY, signals.accZ, signals.gyroX, signals.gyroY, signals.gyroZ, signals.axis);
  const windowSamples = Math.max(1, Math.round(MID_STANCE_WINDOW_S * fs));
  const half = Math.floor(windowSamples / 2);
  const r = options.shankSensorAboveAnkleM;
  if (signals.segment === "shank" && !(r !== undefined && r > 0)) throw new RangeError("strideLengthsForSide: a shank needs shankSensorAboveAnkleM > 0");
  const maxLength = options.heightCm !== undefined ? Math.min(MAX_STRIDE_LENGTH_M, (MAX_STRIDE_LENGTH_PER_HEIGHT * options.heightCm) / 100) : MAX_STRIDE_LENGTH_M;
  const n = plane.omegaDegS.length;

  // Mid-stance after an IC, cached by IC time (each IC opens one stride and closes another).
  const resetCache = new Map<number, number>();
  const resetAfter = (icS: number, fcS: number | null): number => {
    if (fcS === null || !(fcS > icS)) return -1;
    const hit = resetCache.get(icS);
    if (hit !== undefined) return hit;
    let c: number;
    if (signals.segment === "foot") {
      c = leastRotationWindowCentre(signals.gyroX, signals.gyroY, signals.gyroZ, signals.valid, icS * fs, fcS * fs, windowSamples);
    } else {
      c = Math.round(((icS + fcS) / 2) * fs);
      if (c - half < 0 || c + half >= n) c = -1;
      else for (let i = c - half; i <= c + half; i++) if (!signals.valid[i]) c = -1;
    }
    resetCache.set(icS, c);
    return c;
  };
  const fcAfter = (icS: number, withinS: number): number | null => {
    for (const fc of finalContactsS) if (fc > icS && fc < icS + withinS) return fc;
    return null;
  };
  const stateAt = (centre: number): ResetState => {
    if (signals.segment === "foot") return AT_REST;
    // Mean rate and least-squares slope of the rate over the reset window.
    const deg = Math.PI / 180;
    let sw = 0;
    let stw = 0;
    let stt = 0;
    let count = 0;
    for (let k = -half; k <= half; k++) {
      const w = plane.omegaDegS[centre + k]! * deg;
      const t = k / fs;
      sw += w;
      stw += t * w;
      stt += t * t;
      count++;
    }
    const alpha = stt > 0 ? stw / stt : 0;
    return shankPendulumReset(sw / count, alpha, r!);
  };

  return strides.map((s): StrideLengthResult => {
    // In a turn the plane of the leg swings about the vertical, so a planar length means nothing.
    if (s.excludedReason === "turn") return { strideLengthM: null, rejection: "turn", resetIndices: null };
    const nextFc = fcAfter(s.nextIcS, s.strideTimeS);
    if (s.fcS === null || nextFc === null) return { strideLengthM: null, rejection: "no-stance", resetIndices: null };
    const i0 = resetAfter(s.icS, s.fcS);
    const i1 = resetAfter(s.nextIcS, nextFc);
    if (i0 < 0 || i1 <= i0) return { strideLengthM: null, rejection: "no-reset", resetIndices: null };
    for (let i = i0; i <= i1; i++) if (!signals.valid[i]) return { strideLengthM: null, rejection: "invalid-data", resetIndices: [i0, i1] };
    const out = integrateSagittalStride(plane, fs, i0, i1, stateAt(i0), stateAt(i1), half);
    if (Math.abs(out.angleDriftDeg) > MAX_ANGLE_DRIFT_DEG) return { strideLengthM: null, rejection: "angle-drift", resetIndices: [i0, i1] };
    if (!(out.strideLengthM > 0) || out.strideLengthM > maxLength) return { strideLengthM: null, rejection: "implausible", resetIndices: [i0, i1] };
    return { strideLengthM: out.strideLengthM, rejection: null, resetIndices: [i0, i1] };
  });
}
