export { sagittalPlaneSignals, type SagittalPlaneSignals } from "./sagittal-plane";
export { leastRotationWindowCentre, MID_STANCE_WINDOW_S } from "./least-rotation-window";
export { integrateSagittalStride, STANDARD_GRAVITY_M_S2, type PlaneVelocity, type SagittalStride } from "./integrate-sagittal-stride";
export { shankPivotVelocity, SHANK_SENSOR_ABOVE_ANKLE_M } from "./shank-pivot-velocity";
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
