import { type Placement, type SensorRecording, SignalInputError } from "../types";
import { parseDecimal } from "./parse-number";
import { placementFromLabel } from "./placement-names";
import { rowCapacity } from "./row-capacity";
import { scanDecimalRow } from "./scan-decimal-row";

/** Largest sensor file accepted, in characters of text (= bytes for the ASCII format): 64 MiB. */
export const MAX_SENSOR_FILE_CHARS = 64 * 1024 * 1024;

export const SENSOR_CSV_MAGIC = "# pendula-sensor:";
export const SENSOR_CSV_COLUMNS = ["t_s", "acc_x", "acc_y", "acc_z", "gyro_x", "gyro_y", "gyro_z"] as const;

const RAD_TO_DEG = 180 / Math.PI;
/** Standard gravity (CGPM 1901), for files that give acceleration in g. */
export const STANDARD_GRAVITY_M_S2 = 9.80665;

const ACC_UNITS: Record<string, number> = { "m/s2": 1, "m/s^2": 1, "m/s²": 1, g: STANDARD_GRAVITY_M_S2 };
const GYRO_UNITS: Record<string, number> = { "deg/s": 1, "°/s": 1, "rad/s": RAD_TO_DEG };

export interface ReadSensorCsvOptions {
  /** Override of MAX_SENSOR_FILE_CHARS (tests, the portal's pre-check). */
  maxChars?: number;
}

/**
 * Reads a Pendula sensor CSV v1 text (format in signal/README.md) into a SensorRecording with gyro in
 * deg/s and acceleration in m/s². All-or-nothing: any problem throws a SignalInputError naming the
 * file, the 1-based line and the column; nothing is returned half-read.
 */
export function readSensorCsv(text: string, fileName: string, options: ReadSensorCsvOptions = {}): SensorRecording {
  const maxChars = options.maxChars ?? MAX_SENSOR_FILE_CHARS;
  const fail = (line: number | undefined, column: string | undefined, reason: string): never => {
    const where = [line === undefined ? null : `line ${line}`, column === undefined ? null : `column ${column}`]
      .filter(Boolean)
      .join(", ");
    throw new SignalInputError(`${fileName}${where ? `: ${where}` : ""}: ${reason}`, fileName, line, column);
  };

  if (text.length > maxChars) {
    fail(undefined, undefined, `file is larger than the ${Math.round(maxChars / 1048576)} MiB limit (${text.length} characters)`);
  }
  let pos = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  if (text.trim().length === 0) fail(1, undefined, "file is empty");

  const n = text.length;
  let lineNo = 0;
  const nextLine = (): string | null => {
    if (pos >= n) return null;
    let end = text.indexOf("\n", pos);
    if (end < 0) end = n;
    const line = text.slice(pos, end > pos && text.charCodeAt(end - 1) === 13 ? end - 1 : end);
    pos = end + 1;
    lineNo++;
    return line;
  };

  // --- header comments ---
  const header = new Map<string, { value: string; line: number }>();
  let columnLine: string | null = null;
  for (;;) {
    const line = nextLine();
    if (line === null) break;
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
  const headerLineNo = lineNo;
  const names = columnLine!.split(",").map((s) => s.trim().toLowerCase());
  const seen = new Set<string>();
  for (const name of names) {
    if (name === "") fail(headerLineNo, undefined, "column header has an empty column name");
    if (seen.has(name)) fail(headerLineNo, name, `column "${name}" appears twice`);
    seen.add(name);
  }
  const index = SENSOR_CSV_COLUMNS.map((c) => names.indexOf(c));
  SENSOR_CSV_COLUMNS.forEach((c, k) => {
    if (index[k]! < 0) {
      const kind = c.startsWith("gyro") ? "gyroscope" : c.startsWith("acc") ? "accelerometer" : "time";
      fail(headerLineNo, c, `${kind} column "${c}" is missing from the column header`);
    }
  });
  const nCols = names.length;
  // target[k] = which output channel column k feeds (−1 = ignored extra column)
  const target = new Int8Array(nCols).fill(-1);
  index.forEach((col, k) => (target[col] = k));

  // --- data rows ---
  // A row holds nCols − 1 commas and a number in each of the 7 columns read (extra ones may be empty).
  const capacity = rowCapacity(text, pos, nCols - 1 + SENSOR_CSV_COLUMNS.length);
  const timeS = new Float64Array(capacity);
  const ch = Array.from({ length: 6 }, () => new Float32Array(capacity));
  const row = new Float64Array(7);
  let count = 0;
  let prevT = Number.NEGATIVE_INFINITY;

  while (pos < n) {
    lineNo++;
    // Plain rows take the fast scanner; anything else (blank, comment, spaces, a bad cell) the
    // general path below, which skips or reports it exactly as before.
    let end = text.charCodeAt(pos) === 35 ? -1 : scanDecimalRow(text, pos, nCols, target, row);
    if (end < 0) {
      end = text.indexOf("\n", pos);
      if (end < 0) end = n;
      let lineEnd = end;
      if (lineEnd > pos && text.charCodeAt(lineEnd - 1) === 13) lineEnd--;
      if (lineEnd === pos || isBlank(text, pos, lineEnd)) {
        pos = end + 1;
        continue;
      }
      if (text.charCodeAt(pos) === 35) fail(lineNo, undefined, "comment line after the column header");
      let cellStart = pos;
      for (let col = 0; col < nCols; col++) {
        const cellEnd = col === nCols - 1 ? lineEnd : text.indexOf(",", cellStart);
        if (cellEnd < 0 || cellEnd > lineEnd) {
          fail(lineNo, names[col], `expected ${nCols} cells, found ${col + 1}`);
        }
        if (col === nCols - 1 && text.indexOf(",", cellStart) >= 0 && text.indexOf(",", cellStart) < lineEnd) {
          fail(lineNo, undefined, `expected ${nCols} cells, found more`);
        }
        const k = target[col]!;
        if (k >= 0) {
          const v = parseDecimal(text, cellStart, cellEnd);
          if (Number.isNaN(v)) {
            fail(lineNo, names[col], `"${text.slice(cellStart, cellEnd).trim()}" is not a number`);
          }
          row[k] = v;
        }
        cellStart = cellEnd + 1;
      }
    }
    const t = row[0]!;
    if (!(t > prevT)) {
      fail(lineNo, "t_s", `time ${t} s does not increase (previous row ${prevT} s)`);
    }
    prevT = t;
    timeS[count] = t;
    ch[0]![count] = row[1]! * accScale!;
    ch[1]![count] = row[2]! * accScale!;
    ch[2]![count] = row[3]! * accScale!;
    ch[3]![count] = row[4]! * gyroScale!;
    ch[4]![count] = row[5]! * gyroScale!;
    ch[5]![count] = row[6]! * gyroScale!;
    // Samples are stored in single precision: a value beyond its range would become Infinity.
    for (let k = 0; k < 6; k++) {
      if (!Number.isFinite(ch[k]![count]!)) fail(lineNo, SENSOR_CSV_COLUMNS[k + 1], `value ${row[k + 1]} is beyond any sensor's range`);
    }
    count++;
    pos = end + 1;
  }
  if (count === 0) fail(lineNo, undefined, "file has a header but no data rows");

  return {
    fileName,
    deviceSerial: device.value,
    placement,
    nominalSampleRateHz,
    startUtc: startUtc!,
    timeS: timeS.subarray(0, count),
    accX: ch[0]!.subarray(0, count),
    accY: ch[1]!.subarray(0, count),
    accZ: ch[2]!.subarray(0, count),
    gyroX: ch[3]!.subarray(0, count),
    gyroY: ch[4]!.subarray(0, count),
    gyroZ: ch[5]!.subarray(0, count),
  };
}

function isBlank(text: string, from: number, to: number): boolean {
  for (let i = from; i < to; i++) {
    const c = text.charCodeAt(i);
    if (c !== 32 && c !== 9) return false;
  }
  return true;
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
