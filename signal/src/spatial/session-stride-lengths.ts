import type { PerSide, Side, Stride } from "../types";
import { signedSagittalAxis } from "./signed-sagittal-axis";
import { shankSensorAboveAnkleM } from "./shank-pendulum";
import { type StrideLengthOptions, type StrideLengthRejection, strideLengthsForSide } from "./stride-lengths";

/** A sensor's channels on the session grid (m/s² with gravity, deg/s) and its validity mask. */
export interface GridSensor {
  accX: ArrayLike<number>;
  accY: ArrayLike<number>;
  accZ: ArrayLike<number>;
  gyroX: ArrayLike<number>;
  gyroY: ArrayLike<number>;
  gyroZ: ArrayLike<number>;
  valid: Uint8Array;
}

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
}

/**
 * Stride lengths for every stride of a session. Per side, a foot sensor is used when worn (its
 * mid-stance is truly at rest, so the reset needs no body model), else the shank (Li et al. 2010
 * pendulum reset), which needs the ankle-to-sensor distance and so the person's height: without it a
 * shank side gives no lengths ("no-height"). Strides keep the timing the analysis built (IC → next IC).
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
    const sideOptions = kind === "shank" ? { ...options, shankSensorAboveAnkleM: options.shankSensorAboveAnkleM ?? shankSensorAboveAnkleM(options.heightCm!) } : options;
    const results = strideLengthsForSide({ segment: kind, ...pick(sensor), axis }, idx.map((i) => strides[i]!), finalContactsS[side], sideOptions);
    results.forEach((r, k) => {
      lengthsM[idx[k]!] = r.strideLengthM;
      if (r.rejection) reject(r.rejection);
    });
  }
  return { lengthsM, segment, rejected };
}

function pick(s: GridSensor): GridSensor {
  return { accX: s.accX, accY: s.accY, accZ: s.accZ, gyroX: s.gyroX, gyroY: s.gyroY, gyroZ: s.gyroZ, valid: s.valid };
}
