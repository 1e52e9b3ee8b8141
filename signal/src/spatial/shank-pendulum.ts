import { STANDARD_GRAVITY_M_S2 } from "../io/read-sensor-csv";
import type { PlaneVector } from "./integrate-sagittal-stride";

/** Knee-to-ankle length as a fraction of standing height: Winter 2009, Fig. 4.1, after Drillis & Contini 1966. */
export const SHANK_LENGTH_PER_HEIGHT = 0.246;

/** Shank length (m), knee to ankle, of a person of `heightCm`: the farthest a shank sensor can sit above the ankle. */
export function shankLengthM(heightCm: number): number {
  if (!(heightCm > 0)) throw new RangeError("shankLengthM: heightCm must be positive");
  return (heightCm / 100) * SHANK_LENGTH_PER_HEIGHT;
}

export interface PendulumReset {
  /** Sensor velocity in the world sagittal plane (m/s). */
  velocity: PlaneVector;
  /** What the accelerometer should read in the world plane (m/s², gravity included). */
  specificForce: PlaneVector;
}

/**
 * State of a shank sensor at mid-stance, modelling the stance shank as an inverted pendulum about a
 * stationary ankle, the shank vertical at that instant (Li et al. 2010, J Biomech 43:1640; the same
 * tangential "update velocity" ω × r in Sci Rep 2021;11:1391). With r the ankle-to-sensor distance,
 * ω the sagittal rate (swing-positive, so ω < 0 as the shank rolls over the foot) and α its rate of
 * change: velocity = (−ω·r, 0); acceleration = tangential (−α·r, 0) + centripetal (0, −ω²·r), so the
 * accelerometer reads (−α·r, g − ω²·r). Using that reading, rather than pure gravity, to set the
 * orientation matters: α·r reaches 1–2 m/s² at mid-stance, a tilt of 6–12°.
 */
export function shankPendulumReset(omegaRadS: number, alphaRadS2: number, sensorAboveAnkleM: number): PendulumReset {
  const r = sensorAboveAnkleM;
  return {
    velocity: { forward: -omegaRadS * r, up: 0 },
    specificForce: { forward: -alphaRadS2 * r, up: STANDARD_GRAVITY_M_S2 - omegaRadS * omegaRadS * r },
  };
}
