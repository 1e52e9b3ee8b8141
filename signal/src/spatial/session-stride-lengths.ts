import type { ImuSignals, PerSide, Side, Stride } from "../types";
import { signedSagittalAxis } from "./signed-sagittal-axis";
import { sagittalPlaneSignals } from "./sagittal-plane";
import { type ShankSensorDistance, shankSensorDistance } from "./shank-sensor-distance";
import { type StrideLengthOptions, type StrideLengthRejection, strideLengthsForSide } from "./stride-lengths";

/** A sensor's channels on the session grid (m/s² with gravity, deg/s) and its validity mask. */
export type GridSensor = ImuSignals;

export interface LegSensors {
  shank?: GridSensor;
  foot?: GridSensor;
}

export interface SessionStrideLengths {
  /** Stride length (m) per stride, aligned with the `strides` passed in; null when not computed. */
  lengthsM: Array<number | null>;
  /** Which sensor gave each side's lengths. */
  segment: PerSide<"shank" | "foot" | null>;
  /** Strides without a length, by reason. */
  rejected: Partial<Record<StrideLengthRejection | "no-sensor" | "no-height", number>>;
  /** Per side with a shank in use: the ankle-to-sensor distance used and how it was found. */
  shankSensorDistance: PerSide<ShankSensorDistance | null>;
  /** Caveats on the lengths that were computed (a side that fell back to the default distance). */
  notes: string[];
}

/**
 * Stride lengths for every stride of a session. Per side, a foot sensor is used when worn (its
 * mid-stance is truly at rest, so the reset needs no body model), else the shank (Li et al. 2010
 * pendulum reset), which needs the ankle-to-sensor distance: fitted per leg and session from the
 * shank's own mid-stance rotation (shank-sensor-distance.ts), bounded by the shank's length and so by
 * the person's height: without it a shank side gives no lengths ("no-height"). A side whose fit is not
 * accepted uses the documented placement and says so in `notes`. `options.shankSensorAboveAnkleM`, when
 * given, replaces the fit on both sides. Strides keep the timing the analysis built (IC → next IC).
 */
export function sessionStrideLengths(
  legs: PerSide<LegSensors>,
  strides: readonly Stride[],
  finalContactsS: PerSide<readonly number[]>,
  walkingMask: Uint8Array,
  options: StrideLengthOptions,
): SessionStrideLengths {
  const lengthsM: Array<number | null> = strides.map(() => null);
  const segment: PerSide<"shank" | "foot" | null> = { left: null, right: null };
  const rejected: SessionStrideLengths["rejected"] = {};
  const distances: PerSide<ShankSensorDistance | null> = { left: null, right: null };
  const notes: string[] = [];
  const reject = (why: StrideLengthRejection | "no-sensor" | "no-height", k = 1) => {
    rejected[why] = (rejected[why] ?? 0) + k;
  };
  for (const side of ["left", "right"] as const satisfies readonly Side[]) {
    const idx = strides.map((s, i) => (s.side === side ? i : -1)).filter((i) => i >= 0);
    if (idx.length === 0) continue;
    const kind = legs[side].foot ? "foot" : legs[side].shank ? "shank" : null;
    const sensor = kind ? legs[side][kind]! : null;
    if (!kind || !sensor) {
      reject("no-sensor", idx.length);
      continue;
    }
    if (kind === "shank" && options.heightCm === undefined) {
      reject("no-height", idx.length);
      continue;
    }
    const mask = new Uint8Array(walkingMask.length);
    for (let i = 0; i < mask.length; i++) mask[i] = walkingMask[i]! & sensor.valid[i]!;
    const axis = signedSagittalAxis(sensor.gyroX, sensor.gyroY, sensor.gyroZ, mask, kind);
    if (!axis) {
      reject("no-sensor", idx.length);
      continue;
    }
    segment[side] = kind;
    let sideOptions = options;
    if (kind === "shank" && options.shankSensorAboveAnkleM === undefined) {
      const plane = sagittalPlaneSignals(sensor.accX, sensor.accY, sensor.accZ, sensor.gyroX, sensor.gyroY, sensor.gyroZ, axis);
      const d = shankSensorDistance(plane, options.sampleRateHz, idx.map((i) => strides[i]!), mask, options.heightCm!);
      distances[side] = d;
      // Only a side whose steady strides enter the session numbers needs the caveat.
      if (d.source === "default" && idx.some((i) => strides[i]!.steady)) {
        notes.push(
          `${side} shank: ankle-to-sensor distance not measurable from this session (${d.fit.reason}); the documented placement, ${(d.distanceM * 100).toFixed(0)} cm above the ankle, was assumed, so its stride lengths are less certain`,
        );
      }
      sideOptions = { ...options, shankSensorAboveAnkleM: d.distanceM };
    }
    const results = strideLengthsForSide({ segment: kind, ...pick(sensor), axis }, idx.map((i) => strides[i]!), finalContactsS[side], sideOptions);
    results.forEach((r, k) => {
      lengthsM[idx[k]!] = r.strideLengthM;
      if (r.rejection) reject(r.rejection);
    });
  }
  return { lengthsM, segment, rejected, shankSensorDistance: distances, notes };
}

function pick(s: GridSensor): GridSensor {
  return { accX: s.accX, accY: s.accY, accZ: s.accZ, gyroX: s.gyroX, gyroY: s.gyroY, gyroZ: s.gyroZ, valid: s.valid };
}
