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
  shankLengthM,
  SHANK_LENGTH_PER_HEIGHT,
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
export {
  fitAnkleToSensorDistance,
  MIN_FIT_WINDOWS,
  MAX_FIT_STANDARD_ERROR_M,
  MAX_FIT_AXIS_ANGLE_DEG,
  type AnkleToSensorFit,
} from "./fit-ankle-to-sensor-distance";
export {
  shankSensorDistance,
  midStanceWindows,
  SHANK_SENSOR_DEFAULT_ABOVE_ANKLE_M,
  MIN_SHANK_SENSOR_ABOVE_ANKLE_M,
  MID_STANCE_FROM_FRACTION_OF_STANCE,
  MID_STANCE_TO_FRACTION_OF_STANCE,
  type ShankSensorDistance,
} from "./shank-sensor-distance";
