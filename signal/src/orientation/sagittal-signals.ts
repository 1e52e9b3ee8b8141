import type { ResampledSensor } from "../timebase/resample-to-grid";
import type { Placement, SagittalSignal } from "../types";
import { MIN_AXIS_SAMPLES, type SagittalAxis, projectOnAxis, sagittalAxis } from "./sagittal-axis";

/** A leg's signal as the event step used it: projected on its walking axis, sign already corrected. */
export interface LegSagittal {
  placement: Placement;
  omega: Float64Array;
  axis: SagittalAxis;
  inverted: boolean;
}

export interface SagittalSignalsInput {
  /** Sensors on the session grid (after clock alignment), in the order of the recordings. */
  sensors: ReadonlyMap<Placement, ResampledSensor>;
  sampleRateHz: number;
  /** 1 inside a walking bout. */
  boutMask: Uint8Array;
  legs: readonly LegSagittal[];
  /** Placements whose sign the analysis reversed outside the leg step (a wrist worn the other way). */
  invertedElsewhere: ReadonlySet<Placement>;
}

/**
 * The sagittal angular velocity of every placed sensor, for charts: a leg's is the very signal its
 * events were found on; any other sensor (wrists, lower back, a leg without enough walking for its
 * axis) is projected on the main rotation axis of its walking samples (all its valid samples when
 * fewer than MIN_AXIS_SAMPLES walk, its z axis when even those are too few), with the sign the
 * analysis decided for it.
 */
export function sagittalSignals(input: SagittalSignalsInput): SagittalSignal[] {
  const { sensors, sampleRateHz, boutMask, legs, invertedElsewhere } = input;
  const out: SagittalSignal[] = [];
  for (const [placement, s] of sensors) {
    const leg = legs.find((l) => l.placement === placement);
    if (leg) {
      out.push({ placement, sampleRateHz, startS: 0, omegaDegS: leg.omega, valid: s.valid, axis: leg.axis.axis, axisFrom: "walking", inverted: leg.inverted, usedForEvents: true });
      continue;
    }
    let mask = walkingAndValid(boutMask, s.valid);
    let axisFrom: SagittalSignal["axisFrom"] = "walking";
    if (countOnes(mask) < MIN_AXIS_SAMPLES) {
      mask = s.valid;
      axisFrom = "recording";
    }
    const axis = sagittalAxis(s.gyroX, s.gyroY, s.gyroZ, mask);
    const omega = axis ? projectOnAxis(s.gyroX, s.gyroY, s.gyroZ, axis.axis) : Float64Array.from(s.gyroZ);
    const inverted = invertedElsewhere.has(placement);
    if (inverted) for (let i = 0; i < omega.length; i++) omega[i] = -omega[i]!;
    out.push({ placement, sampleRateHz, startS: 0, omegaDegS: omega, valid: s.valid, axis: axis?.axis ?? null, axisFrom: axis ? axisFrom : "nominal", inverted, usedForEvents: false });
  }
  return out;
}

function walkingAndValid(walking: Uint8Array, valid: Uint8Array): Uint8Array {
  const out = new Uint8Array(valid.length);
  for (let i = 0; i < valid.length; i++) out[i] = walking[i]! & valid[i]!;
  return out;
}

function countOnes(mask: Uint8Array): number {
  let n = 0;
  for (let i = 0; i < mask.length; i++) n += mask[i]!;
  return n;
}
