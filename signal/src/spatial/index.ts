export { sagittalPlaneSignals, type SagittalPlaneSignals } from "./sagittal-plane";
export { leastRotationWindowCentre, MID_STANCE_WINDOW_S } from "./least-rotation-window";
export {
  integrateSagittalStride,
  AT_REST,
  type PlaneVector,
  type ResetState,
  type SagittalStride,
} from "./integrate-sagittal-stride";
export {
  shankPendulumReset,
  shankSensorAboveAnkleM,
  SHANK_LENGTH_PER_HEIGHT,
  SHANK_SENSOR_FRACTION_ABOVE_ANKLE,
  type PendulumReset,
} from "./shank-pendulum";
export { signedSagittalAxis } from "./signed-sagittal-axis";
export {
  strideLengthsForSide,
  MAX_STRIDE_LENGTH_M,
  MAX_STRIDE_LENGTH_PER_HEIGHT,
  MAX_ANGLE_DRIFT_DEG,
  type SegmentSignals,
  type StrideLengthOptions,
  type StrideLengthResult,
  type StrideLengthRejection,
} from "./stride-lengths";
export { walkingSpeedFromStrides, MIN_STRIDES_FOR_SPEED, type WalkingSpeed } from "./walking-speed";
export { sessionStrideLengths, type GridSensor, type LegSensors, type SessionStrideLengths } from "./session-stride-lengths";
