export { sessionGrid, MAX_SESSION_DURATION_S, type SessionGrid } from "./session-grid";
export { resampleToGrid, MAX_INTERPOLATED_GAP_S, GAP_PERIOD_FACTOR, type ResampledSensor, type TimeGap } from "./resample-to-grid";
export { alignLegClocks, CLOCK_OFFSET_REPORT_S, type ClockAlignment } from "./align-clocks";
export { alignWristClocks, type WristClockAlignment } from "./align-wrist-clocks";
export { MAX_CLOCK_OFFSET_S } from "./clock-offset";
