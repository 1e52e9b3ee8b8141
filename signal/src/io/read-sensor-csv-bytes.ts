import type { SensorRecording } from "../types";
import { MAX_SENSOR_FILE_CHARS, type ReadSensorCsvOptions, readSensorCsv } from "./read-sensor-csv";
import { readRowCells } from "./read-row-cells";
import { rowCapacityBytes } from "./row-capacity";
import { COMMA, scanDecimalRowBytes } from "./scan-decimal-row-bytes";
import { SENSOR_CSV_COLUMNS, type SensorCsvFail, type SensorCsvLayout, readSensorCsvHeader, sensorCsvFail } from "./sensor-csv-header";

/**
 * UTF-8 as Node's `readFileSync(path, "utf8")` decodes a file: bad sequences become U+FFFD and a
 * BOM stays (the reader skips it itself).
 */
const UTF8 = new TextDecoder("utf-8", { ignoreBOM: true });

/**
 * Reads a sensor CSV v1 file from its bytes, with the result and the errors of
 * `readSensorCsv(<the bytes decoded as UTF-8>, fileName, options)`, bit for bit and word for word,
 * but without building the text: data rows are scanned from the bytes straight into the typed
 * arrays. Only the header lines, and a data row the fast scanner hands back, are decoded.
 *
 * The two questions the bytes alone cannot answer cheaply go to the text reader on the decoded
 * file: a file over the size limit (the limit and its message count characters) and one whose
 * first visible character is not ASCII ("empty" means only Unicode white space).
 */
export function readSensorCsvBytes(bytes: Uint8Array, fileName: string, options: ReadSensorCsvOptions = {}): SensorRecording {
  const maxChars = options.maxChars ?? MAX_SENSOR_FILE_CHARS;
  const n = bytes.length;
  let pos = n >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0;
  let firstVisible = pos;
  while (firstVisible < n && isAsciiWhiteSpace(bytes[firstVisible]!)) firstVisible++;
  if (n > maxChars || (firstVisible < n && bytes[firstVisible]! >= 0x80)) {
    return readSensorCsv(UTF8.decode(bytes), fileName, options);
  }
  const fail = sensorCsvFail(fileName);
  if (firstVisible === n) fail(1, undefined, "file is empty");

  const nextLine = (): string | null => {
    if (pos >= n) return null;
    let end = bytes.indexOf(10, pos);
    if (end < 0) end = n;
    const lineEnd = end > pos && bytes[end - 1] === 13 ? end - 1 : end;
    // A run of blank lines needs no decoding: "" is as blank and as far from the magic line.
    const line = isAsciiBlank(bytes, pos, lineEnd) ? "" : UTF8.decode(bytes.subarray(pos, lineEnd));
    pos = end + 1;
    return line;
  };

  const layout = readSensorCsvHeader(nextLine, fail);
  // A row holds nCols − 1 commas and a number in each of the 7 columns read (extra ones may be empty).
  const capacity = rowCapacityBytes(bytes, pos, layout.names.length - 1 + SENSOR_CSV_COLUMNS.length);
  const samples: Samples = {
    timeS: new Float64Array(capacity),
    accX: new Float32Array(capacity),
    accY: new Float32Array(capacity),
    accZ: new Float32Array(capacity),
    gyroX: new Float32Array(capacity),
    gyroY: new Float32Array(capacity),
    gyroZ: new Float32Array(capacity),
  };
  const count = readDataRows(bytes, pos, layout, samples, fail);
  if (count === 0) fail(layout.lineNo + linesFrom(bytes, pos), undefined, "file has a header but no data rows");
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

type Samples = Pick<SensorRecording, "timeS" | "accX" | "accY" | "accZ" | "gyroX" | "gyroY" | "gyroZ">;

/**
 * Scans the data rows from `pos` (the line after the column header) to the end into `out` and
 * returns how many there were. A function of its own that ends with its loop: the engine compiles
 * the loop while the first file is read, and nothing after the loop lacks the type feedback that
 * would throw the compiled code away at the end of every file.
 */
function readDataRows(bytes: Uint8Array, pos: number, layout: SensorCsvLayout, out: Samples, fail: SensorCsvFail): number {
  const { names, target, accScale, gyroScale } = layout;
  const { timeS, accX, accY, accZ, gyroX, gyroY, gyroZ } = out;
  const nCols = names.length;
  const n = bytes.length;
  let lineNo = layout.lineNo;
  // Rows up to the last \n go to the fast scanner; a last row without one to the general path.
  const lastNewline = bytes.lastIndexOf(10);
  const row = new Float64Array(7);
  let count = 0;
  let prevT = Number.NEGATIVE_INFINITY;

  while (pos < n) {
    lineNo++;
    let end = bytes[pos] === 35 || pos > lastNewline ? -1 : scanDecimalRowBytes(bytes, pos, COMMA, nCols, target, row);
    if (end < 0) {
      end = pos > lastNewline ? n : bytes.indexOf(10, pos);
      const lineEnd = end > pos && bytes[end - 1] === 13 ? end - 1 : end;
      // Blank rows are skipped without decoding (only spaces and tabs, as the text reader checks).
      if (isSpacesAndTabs(bytes, pos, lineEnd)) {
        pos = end + 1;
        continue;
      }
      const line = UTF8.decode(bytes.subarray(pos, lineEnd));
      readRowCells(line, 0, line.length, lineNo, names, target, row, fail);
    }
    const t = row[0]!;
    if (!(t > prevT)) {
      fail(lineNo, "t_s", `time ${t} s does not increase (previous row ${prevT} s)`);
    }
    prevT = t;
    timeS[count] = t;
    accX[count] = row[1]! * accScale;
    accY[count] = row[2]! * accScale;
    accZ[count] = row[3]! * accScale;
    gyroX[count] = row[4]! * gyroScale;
    gyroY[count] = row[5]! * gyroScale;
    gyroZ[count] = row[6]! * gyroScale;
    // Samples are stored in single precision: a value beyond its range would become Infinity.
    // x − x is 0 for a finite x and NaN otherwise: one test for the six stored values.
    const sum = accX[count]! + accY[count]! + accZ[count]! + gyroX[count]! + gyroY[count]! + gyroZ[count]!;
    if (sum - sum !== 0) {
      const stored = [accX, accY, accZ, gyroX, gyroY, gyroZ];
      for (let k = 0; k < 6; k++) {
        if (!Number.isFinite(stored[k]![count]!)) fail(lineNo, SENSOR_CSV_COLUMNS[k + 1], `value ${row[k + 1]} is beyond any sensor's range`);
      }
    }
    count++;
    pos = end + 1;
  }
  return count;
}

/** Lines from `pos` to the end, as the row loop counts them: each ends at a \n or at the end. */
function linesFrom(bytes: Uint8Array, pos: number): number {
  if (pos >= bytes.length) return 0;
  let lines = bytes[bytes.length - 1] === 10 ? 0 : 1;
  for (let p = bytes.indexOf(10, pos); p >= 0; p = bytes.indexOf(10, p + 1)) lines++;
  return lines;
}

/** The ASCII characters String.prototype.trim removes: tab, LF, VT, FF, CR, space. */
function isAsciiWhiteSpace(c: number): boolean {
  return c === 32 || (c >= 9 && c <= 13);
}

function isAsciiBlank(bytes: Uint8Array, from: number, to: number): boolean {
  for (let i = from; i < to; i++) if (!isAsciiWhiteSpace(bytes[i]!)) return false;
  return true;
}

function isSpacesAndTabs(bytes: Uint8Array, from: number, to: number): boolean {
  for (let i = from; i < to; i++) {
    const c = bytes[i]!;
    if (c !== 32 && c !== 9) return false;
  }
  return true;
}
