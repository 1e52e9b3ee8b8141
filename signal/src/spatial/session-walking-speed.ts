import type { ResampledSensor } from "../timebase/resample-to-grid";
import type { PerSide, Placement, QualityItem, Stride } from "../types";
import { sessionStrideLengths } from "./session-stride-lengths";
import { type WalkingSpeed, walkingSpeedFromStrides } from "./walking-speed";

export interface SessionWalkingSpeed {
  speed: WalkingSpeed;
  /** Why speed and stride length are missing, when there were strides to measure; else null. */
  quality: QualityItem | null;
}

/**
 * Stride length and walking speed of a session: per side the foot sensor when worn, else the shank
 * (session-stride-lengths.ts), over the walking bouts. Sets each stride's `strideLengthM` in place
 * (null where none was computed), then summarises the steady strides (walking-speed.ts).
 */
export function sessionWalkingSpeed(
  sensors: ReadonlyMap<Placement, ResampledSensor>,
  strides: Stride[],
  finalContactsS: PerSide<readonly number[]>,
  boutMask: Uint8Array,
  sampleRateHz: number,
  heightCm: number | undefined,
): SessionWalkingSpeed {
  const spatial = sessionStrideLengths(
    {
      left: { shank: sensors.get("left_shank"), foot: sensors.get("left_foot") },
      right: { shank: sensors.get("right_shank"), foot: sensors.get("right_foot") },
    },
    strides,
    finalContactsS,
    boutMask,
    { sampleRateHz, heightCm },
  );
  spatial.lengthsM.forEach((len, i) => {
    strides[i]!.strideLengthM = len;
  });
  const speed = walkingSpeedFromStrides(strides, spatial.rejected, spatial.notes);
  const quality: QualityItem | null =
    speed.walkingSpeedMPerS === null && strides.length > 0
      ? { code: "speed-unavailable", severity: "info", message: `walking speed and stride length not computed: ${speed.reason}` }
      : null;
  return { speed, quality };
}
