export { sessionGrid, MAX_SESSION_DURATION_S, type SessionGrid } from "./session-grid";
export { resampleToGrid, MAX_INTERPOLATED_GAP_S, GAP_PERIOD_FACTOR, type ResampledSensor, type TimeGap } from "./resample-to-grid";
