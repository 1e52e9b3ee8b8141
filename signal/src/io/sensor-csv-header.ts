import { type Placement, type SensorRecording, SignalInputError } from "../types";
import { parseDecimal } from "./parse-number";
import { placementFromLabel } from "./placement-names";

export const SENSOR_CSV_MAGIC = "# pendula-sensor:";
export const SENSOR_CSV_COLUMNS = ["t_s", "acc_x", "acc_y", "acc_z", "gyro_x", "gyro_y", "gyro_z"] as const;

const RAD_TO_DEG = 180 / Math.PI;
/** Standard gravity (CGPM 1901), for files that give acceleration in g. */
export const STANDARD_GRAVITY_M_S2 = 9.80665;

const ACC_UNITS: Record<string, number> = { "m/s2": 1, "m/s^2": 1, "m/s²": 1, g: STANDARD_GRAVITY_M_S2 };
const GYRO_UNITS: Record<string, number> = { "deg/s": 1, "°/s": 1, "rad/s": RAD_TO_DEG };

/** Throws the reader's SignalInputError: "<file>: line L, column C: reason". */
export type SensorCsvFail = (line: number | undefined, column: string | undefined, reason: string) => never;

export function sensorCsvFail(fileName: string): SensorCsvFail {
  return (line, column, reason) => {
    const where = [line === undefined ? null : `line ${line}`, column === undefined ? null : `column ${column}`]
      .filter(Boolean)
      .join(", ");
    throw new SignalInputError(`${fileName}${where ? `: ${where}` : ""}: ${reason}`, fileName, line, column);
  };
}

/** What the header comments and the column header line say about the data rows that follow. */
export interface SensorCsvLayout {
  deviceSerial: string;
  placement: Placement | null;
  nominalSampleRateHz: number;
  startUtc: string;
  /** Factors to m/s² and deg/s. */
  accScale: number;
  gyroScale: number;
  /** Column names as written (trimmed, lower-cased), for error messages. */
  names: string[];
  /** target[col] = output channel fed by column col (0 = t_s … 6 = gyro_z), −1 = ignored extra column. */
  target: Int32Array;
  /** 1-based number of the column header line (the last line read). */
  lineNo: number;
}

/**
 * Reads the header comments and the column header line, one line at a time from `nextLine` (a line
 * without its `\n` or `\r\n`, null at the end of the file; the first line without a BOM). Shared by
 * the text and the byte readers so both check the same things in the same order with the same words.
 */
export function readSensorCsvHeader(nextLine: () => string | null, fail: SensorCsvFail): SensorCsvLayout {
  const header = new Map<string, { value: string; line: number }>();
  let columnLine: string | null = null;
  let lineNo = 0;
  for (;;) {
    const line = nextLine();
    if (line === null) break;
    lineNo++;
    if (lineNo === 1 && !line.startsWith(SENSOR_CSV_MAGIC)) {
      fail(1, undefined, `not a Pendula sensor CSV: the first line must start with "${SENSOR_CSV_MAGIC}"`);
    }
    if (line.trim() === "") continue;
    if (!line.startsWith("#")) {
      columnLine = line;
      break;
    }
    const body = line.slice(1);
    const colon = body.indexOf(":");
    if (colon < 0) fail(lineNo, undefined, `header line "${line}" is not "# key: value"`);
    const key = body.slice(0, colon).trim().toLowerCase();
    const value = body.slice(colon + 1).trim();
    if (header.has(key)) fail(lineNo, key, `header key "${key}" appears twice`);
    header.set(key, { value, line: lineNo });
  }

  const version = header.get("pendula-sensor")!;
  if (version.value !== "1") fail(version.line, "pendula-sensor", `unsupported format version "${version.value}" (expected 1)`);
  const required = (key: string): { value: string; line: number } => {
    const entry = header.get(key);
    if (!entry || entry.value === "") return fail(lineNo, key, `header "# ${key}:" is missing`);
    return entry;
  };

  const device = required("device");
  const rate = required("sample_rate_hz");
  const nominalSampleRateHz = parseDecimal(rate.value, 0, rate.value.length);
  if (!(nominalSampleRateHz > 0 && nominalSampleRateHz <= 10_000)) {
    fail(rate.line, "sample_rate_hz", `sample rate "${rate.value}" must be a number in (0, 10000] Hz`);
  }
  const start = required("start_utc");
  const startUtc = parseUtc(start.value);
  if (startUtc === null) fail(start.line, "start_utc", `start time "${start.value}" is not ISO 8601 UTC (e.g. 2026-11-23T09:15:02.120Z)`);

  let placement: Placement | null = null;
  const placementEntry = header.get("placement");
  if (placementEntry && placementEntry.value !== "") {
    placement = placementFromLabel(placementEntry.value);
    if (placement === null) fail(placementEntry.line, "placement", `unknown placement "${placementEntry.value}"`);
  }

  const unitsEntry = required("units");
  const units = parseUnits(unitsEntry.value);
  const accScale = ACC_UNITS[units.get("acc") ?? ""];
  const gyroScale = GYRO_UNITS[units.get("gyro") ?? ""];
  if (accScale === undefined) {
    fail(unitsEntry.line, "units", `unknown acceleration unit "${units.get("acc") ?? ""}" (use acc=m/s2 or acc=g)`);
  }
  if (gyroScale === undefined) {
    fail(unitsEntry.line, "units", `unknown gyroscope unit "${units.get("gyro") ?? ""}" (use gyro=deg/s or gyro=rad/s)`);
  }

  // --- column header ---
  if (columnLine === null) fail(lineNo + 1, undefined, "column header line (t_s,acc_x,…,gyro_z) is missing");
  const names = columnLine!.split(",").map((s) => s.trim().toLowerCase());
  const seen = new Set<string>();
  for (const name of names) {
    if (name === "") fail(lineNo, undefined, "column header has an empty column name");
    if (seen.has(name)) fail(lineNo, name, `column "${name}" appears twice`);
    seen.add(name);
  }
  const index = SENSOR_CSV_COLUMNS.map((c) => names.indexOf(c));
  SENSOR_CSV_COLUMNS.forEach((c, k) => {
    if (index[k]! < 0) {
      const kind = c.startsWith("gyro") ? "gyroscope" : c.startsWith("acc") ? "accelerometer" : "time";
      fail(lineNo, c, `${kind} column "${c}" is missing from the column header`);
    }
  });
  const target = new Int32Array(names.length).fill(-1);
  index.forEach((col, k) => (target[col] = k));

  return {
    deviceSerial: device.value,
    placement,
    nominalSampleRateHz,
    startUtc: startUtc!,
    accScale: accScale!,
    gyroScale: gyroScale!,
    names,
    target,
    lineNo,
  };
}

/** "acc=m/s2, gyro=rad/s" → Map { acc → m/s2, gyro → rad/s } (keys and values lower-cased). */
function parseUnits(value: string): Map<string, string> {
  const out = new Map<string, string>();
  for (const part of value.split(/[,;]/)) {
    const eq = part.indexOf("=");
    if (eq < 0) continue;
    out.set(part.slice(0, eq).trim().toLowerCase(), part.slice(eq + 1).trim().toLowerCase());
  }
  return out;
}

const UTC_PATTERN = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2}):(\d{2})(\.\d{1,9})?Z$/;

/** Strict ISO 8601 UTC ("Z" suffix) → millisecond-precision ISO string, or null. */
export function parseUtc(value: string): string | null {
  const m = UTC_PATTERN.exec(value);
  if (!m) return null;
  const ms = Date.parse(value);
  if (!Number.isFinite(ms)) return null;
  const iso = new Date(ms).toISOString();
  // Reject calendar overflow such as 2026-02-31 (Date.parse rolls it over).
  if (iso.slice(0, 19) !== value.slice(0, 19)) return null;
  return iso;
}

/** Time and the six sample columns of a sensor file, as the readers fill them. */
export type SensorSamples = Pick<SensorRecording, "timeS" | "accX" | "accY" | "accZ" | "gyroX" | "gyroY" | "gyroZ">;

/** The recording of a read file: its header's identity and views of the first `count` rows (no copy). */
export function sensorRecording(fileName: string, layout: SensorCsvLayout, samples: SensorSamples, count: number): SensorRecording {
  return {
    fileName,
    deviceSerial: layout.deviceSerial,
    placement: layout.placement,
    nominalSampleRateHz: layout.nominalSampleRateHz,
    startUtc: layout.startUtc,
    timeS: samples.timeS.subarray(0, count),
    accX: samples.accX.subarray(0, count),
    accY: samples.accY.subarray(0, count),
    accZ: samples.accZ.subarray(0, count),
    gyroX: samples.gyroX.subarray(0, count),
    gyroY: samples.gyroY.subarray(0, count),
    gyroZ: samples.gyroZ.subarray(0, count),
  };
}
