export { countSaturatedSamples, SATURATION_MIN_RUN, SATURATION_FLOOR_ACC_M_S2, SATURATION_FLOOR_GYRO_DEG_S } from "./saturation";
export { MIN_STEADY_STRIDES_FOR_VARIABILITY, RATE_MISMATCH_FRACTION, MISALIGNMENT_INFO_DEG } from "./thresholds";
export { shankSwingAxisCheck, SHANK_SWING_AXIS_MIN_ANGLE_DEG, type ShankSwingAxisCheck } from "./shank-swing-axis";
