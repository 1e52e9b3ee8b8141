export { readSensorCsv, MAX_SENSOR_FILE_CHARS, SENSOR_CSV_COLUMNS, STANDARD_GRAVITY_M_S2, parseUtc } from "./read-sensor-csv";
export { readSensorCsvBytes } from "./read-sensor-csv-bytes";
export { readBidsMotion, bidsSidecarNames, BIDS_DEFAULT_START_UTC, type BidsMotionTexts } from "./read-bids-motion";
export { readBidsMotionBytes, type BidsMotionBytes } from "./read-bids-motion-bytes";
export { sniffFormat, type SniffedFormat } from "./sniff";
export { TRACKED_POINT_ALIASES, placementFromLabel, normalizeLabel } from "./placement-names";
export { parseDecimal } from "./parse-number";
