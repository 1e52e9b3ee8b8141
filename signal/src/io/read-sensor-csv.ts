import type { SensorRecording } from "../types";
import { readRowCells } from "./read-row-cells";
import { rowCapacity } from "./row-capacity";
import { scanDecimalRow } from "./scan-decimal-row";
import { SENSOR_CSV_COLUMNS, readSensorCsvHeader, sensorCsvFail, sensorRecording } from "./sensor-csv-header";

/** Largest sensor file accepted, in characters of text (= bytes for the ASCII format): 64 MiB. */
export const MAX_SENSOR_FILE_CHARS = 64 * 1024 * 1024;

export { SENSOR_CSV_COLUMNS, SENSOR_CSV_MAGIC, STANDARD_GRAVITY_M_S2, parseUtc } from "./sensor-csv-header";

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
  const fail = sensorCsvFail(fileName);

  if (text.length > maxChars) {
    fail(undefined, undefined, `file is larger than the ${Math.round(maxChars / 1048576)} MiB limit (${text.length} characters)`);
  }
  let pos = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  if (text.trim().length === 0) fail(1, undefined, "file is empty");

  const n = text.length;
  const nextLine = (): string | null => {
    if (pos >= n) return null;
    let end = text.indexOf("\n", pos);
    if (end < 0) end = n;
    const line = text.slice(pos, end > pos && text.charCodeAt(end - 1) === 13 ? end - 1 : end);
    pos = end + 1;
    return line;
  };

  const layout = readSensorCsvHeader(nextLine, fail);
  const { names, target, accScale, gyroScale } = layout;
  const nCols = names.length;
  let lineNo = layout.lineNo;

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
      const lineEnd = end > pos && text.charCodeAt(end - 1) === 13 ? end - 1 : end;
      if (!readRowCells(text, pos, lineEnd, lineNo, names, target, row, fail)) {
        pos = end + 1;
        continue;
      }
    }
    const t = row[0]!;
    if (!(t > prevT)) {
      fail(lineNo, "t_s", `time ${t} s does not increase (previous row ${prevT} s)`);
    }
    prevT = t;
    timeS[count] = t;
    ch[0]![count] = row[1]! * accScale;
    ch[1]![count] = row[2]! * accScale;
    ch[2]![count] = row[3]! * accScale;
    ch[3]![count] = row[4]! * gyroScale;
    ch[4]![count] = row[5]! * gyroScale;
    ch[5]![count] = row[6]! * gyroScale;
    // Samples are stored in single precision: a value beyond its range would become Infinity.
    for (let k = 0; k < 6; k++) {
      if (!Number.isFinite(ch[k]![count]!)) fail(lineNo, SENSOR_CSV_COLUMNS[k + 1], `value ${row[k + 1]} is beyond any sensor's range`);
    }
    count++;
    pos = end + 1;
  }
  if (count === 0) fail(lineNo, undefined, "file has a header but no data rows");

  return sensorRecording(fileName, layout, { timeS, accX: ch[0]!, accY: ch[1]!, accZ: ch[2]!, gyroX: ch[3]!, gyroY: ch[4]!, gyroZ: ch[5]! }, count);
}
