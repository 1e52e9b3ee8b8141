import { detectInvertedFoot, detectInvertedShank } from "../orientation/detect-inverted-segment";
import { type SagittalAxis, projectOnAxis, sagittalAxis } from "../orientation/sagittal-axis";
import { shankSwingAxisCheck } from "../quality/shank-swing-axis";
import { MISALIGNMENT_INFO_DEG } from "../quality/thresholds";
import type { ResampledSensor } from "../timebase/resample-to-grid";
import type { Placement, QualityItem, Side } from "../types";
import { detectFootEvents } from "./detect-foot-events";
import { detectShankEvents } from "./detect-shank-events";
import type { LegEvents } from "./gait-events";

/** One leg's sagittal angular velocity (forward swing positive), its axis and its events. */
export interface LegSignal {
  side: Side;
  placement: Placement;
  omega: Float64Array;
  events: LegEvents;
  axis: SagittalAxis;
  inverted: boolean;
}

export interface LegSignalOutcome {
  /** Null when no sagittal axis could be found in walking (too little valid walking data). */
  leg: LegSignal | null;
  /** The shank's main rotation is not across its long axis: its events and left–right metrics are unreliable. */
  unreliable: boolean;
  /** Misalignment and inversion notes, in the order they were found. */
  quality: QualityItem[];
}

/**
 * One leg sensor, shank or foot, from its resampled channels to its events: the sagittal axis from
 * walking (`boutMask` and the sensor's own valid samples), the shank's strap check, the angular
 * velocity about that axis with its sign checked (worn upside down or back to front), then the
 * foot's or the shank's event detector.
 */
export function legSignal(side: Side, placement: Placement, s: ResampledSensor, boutMask: Uint8Array, sampleRateHz: number): LegSignalOutcome {
  const quality: QualityItem[] = [];
  const mask = andMask(boutMask, s.valid);
  const axis = sagittalAxis(s.gyroX, s.gyroY, s.gyroZ, mask);
  if (!axis) return { leg: null, unreliable: false, quality };
  if (axis.angleFromNominalDeg > MISALIGNMENT_INFO_DEG) {
    quality.push({ code: "misalignment", severity: "info", placement, message: `${placement} sagittal axis is ${axis.angleFromNominalDeg.toFixed(0)}° from the nominal +z axis; corrected from the walking data` });
  }
  const isFoot = placement.endsWith("_foot");
  const swingAxis = isFoot ? null : shankSwingAxisCheck(s.accX, s.accY, s.accZ, axis.axis, mask);
  const unreliable = swingAxis !== null && !swingAxis.plausible;
  if (swingAxis && !swingAxis.plausible) {
    quality.push({
      code: "misalignment",
      severity: "warning",
      placement,
      message: `${placement}: the main rotation is ${swingAxis.angleToLongAxisDeg!.toFixed(0)}° from the lower leg's long axis instead of about 90° (loose or rotated strap?); ${placement.replace("_shank", "")} events and left–right metrics from this sensor are unreliable — check the strap before the next walk`,
    });
  }
  const omega = projectOnAxis(s.gyroX, s.gyroY, s.gyroZ, axis.axis);
  const inversion = isFoot ? detectInvertedFoot(omega, mask) : detectInvertedShank(omega, mask);
  if (inversion.inverted) {
    for (let i = 0; i < omega.length; i++) omega[i] = -omega[i]!;
    quality.push({ code: "inverted-sensor", severity: "warning", placement, message: `${placement} appears to be worn upside down or back to front (swing rotation has the wrong sign); the signal was inverted before analysis` });
  }
  const events = isFoot ? detectFootEvents(omega, mask, sampleRateHz) : detectShankEvents(omega, mask, sampleRateHz, s);
  return { leg: { side, placement, omega, events, axis, inverted: inversion.inverted }, unreliable, quality };
}

function andMask(a: Uint8Array, b: Uint8Array): Uint8Array {
  const out = new Uint8Array(a.length);
  for (let i = 0; i < a.length; i++) out[i] = a[i]! & b[i]!;
  return out;
}
