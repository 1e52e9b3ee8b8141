export { detectWalkingMask, maskToBouts, boutsToMask, WALKING_MEAN_GYRO_DEG_S, BOUT_MERGE_GAP_S, BOUT_MIN_DURATION_S } from "./walking-bouts";
export { yawRateAboutGravity, detectTurns, TURN_MIN_ANGLE_DEG, YAW_TARGET_RATE_HZ, type Turn, type YawTrace } from "./turns";
