import type { Stride } from "../types";
import { type AnkleToSensorFit, fitAnkleToSensorDistance } from "./fit-ankle-to-sensor-distance";
import type { SagittalPlaneSignals } from "./sagittal-plane";
import { shankLengthM } from "./shank-pendulum";

/**
 * Pendula's documented shank placement: strap on the lateral shank just above the ankle, sensor centre
 * about 0.10 m above the ankle joint. Used only when the per-session fit is not accepted; common
 * practice (a placement convention, not a measured value).
 */
export const SHANK_SENSOR_DEFAULT_ABOVE_ANKLE_M = 0.1;
/** Closest a strapped sensor's centre can sit to the ankle joint (malleoli, strap width); common practice. */
export const MIN_SHANK_SENSOR_ABOVE_ANKLE_M = 0.03;
/**
 * The fit uses each stance's mid-stance phase, when the foot is flat and the shank turns about the
 * ankle: 10–30 % of the gait cycle of a 60 % stance (Perry & Burnfield 2010, Gait Analysis: Normal and
 * Pathological Function, phase boundaries), i.e. from 1/6 to 1/2 of the time from IC to FC. Earlier the
 * foot is still being lowered; later the heel rises and the pivot moves to the forefoot.
 */
export const MID_STANCE_FROM_FRACTION_OF_STANCE = 10 / 60;
export const MID_STANCE_TO_FRACTION_OF_STANCE = 30 / 60;

export interface ShankSensorDistance {
  /** Ankle-to-sensor distance used for this leg (m). */
  distanceM: number;
  source: "fit" | "default";
  fit: AnkleToSensorFit;
}

/** Inclusive sample windows of the mid-stance phase of each steady stride that has an FC, all samples valid. */
export function midStanceWindows(strides: readonly Stride[], valid: Uint8Array, sampleRateHz: number): Array<[number, number]> {
  const out: Array<[number, number]> = [];
  for (const s of strides) {
    if (!s.steady || s.fcS === null || !(s.fcS > s.icS)) continue;
    const stance = s.fcS - s.icS;
    // The 1e-9 keeps a boundary that falls on a sample from being lost to floating-point rounding.
    const a = Math.ceil((s.icS + MID_STANCE_FROM_FRACTION_OF_STANCE * stance) * sampleRateHz - 1e-9);
    const b = Math.floor((s.icS + MID_STANCE_TO_FRACTION_OF_STANCE * stance) * sampleRateHz + 1e-9);
    if (a < 0 || b >= valid.length || b - a < 3) continue;
    let ok = true;
    for (let i = a; i <= b && ok; i++) if (!valid[i]) ok = false;
    if (ok) out.push([a, b]);
  }
  return out;
}

/**
 * The ankle-to-sensor distance of one leg's shank sensor for this session: fitted from the data
 * (fitAnkleToSensorDistance over the mid-stance windows of the leg's steady strides), bounded by
 * MIN_SHANK_SENSOR_ABOVE_ANKLE_M and the shank's length (0.246·H, Winter 2009); when the fit is not
 * accepted, the documented placement SHANK_SENSOR_DEFAULT_ABOVE_ANKLE_M, with the fit's reason.
 */
export function shankSensorDistance(
  plane: SagittalPlaneSignals,
  sampleRateHz: number,
  strides: readonly Stride[],
  valid: Uint8Array,
  heightCm: number,
): ShankSensorDistance {
  const windows = midStanceWindows(strides, valid, sampleRateHz);
  const fit = fitAnkleToSensorDistance(plane, sampleRateHz, windows, { minM: MIN_SHANK_SENSOR_ABOVE_ANKLE_M, maxM: shankLengthM(heightCm) });
  if (fit.accepted && fit.distanceM !== null) return { distanceM: fit.distanceM, source: "fit", fit };
  return { distanceM: SHANK_SENSOR_DEFAULT_ABOVE_ANKLE_M, source: "default", fit };
}
