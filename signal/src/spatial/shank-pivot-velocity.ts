import type { PlaneVelocity } from "./integrate-sagittal-stride";

/**
 * Assumed distance (m) from the ankle joint up to a shank sensor strapped just above the ankle, the
 * placement Pendula asks for. Common practice (an assumed placement, not a measured value): each 5 cm
 * of error here changes a stride's length by about ω_reset·0.05·T (see signal/README.md).
 */
export const SHANK_SENSOR_ABOVE_ANKLE_M = 0.1;

/**
 * Velocity of a shank sensor at a mid-stance reset, modelling the stance shank as an inverted pendulum
 * about a stationary ankle (Li et al. 2010, J Biomech 43:1640; the same tangential "update velocity"
 * ω × r in Sci Rep 2021;11:1391). The shank is taken as vertical at that instant, so the velocity is
 * horizontal: v = −ω·r, forward when the shank rotates over the foot (ω < 0 in the swing-positive sign).
 */
export function shankPivotVelocity(omegaDegS: number, sensorAboveAnkleM = SHANK_SENSOR_ABOVE_ANKLE_M): PlaneVelocity {
  return { forwardMPerS: -((omegaDegS * Math.PI) / 180) * sensorAboveAnkleM, upMPerS: 0 };
}
