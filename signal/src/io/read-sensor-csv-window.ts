import type { SensorRecording } from "../types";
import { readRowCells } from "./read-row-cells";
import { sampledRowCapacityBytes } from "./row-capacity";
import { COMMA, scanDecimalRowBytes } from "./scan-decimal-row-bytes";
import { UTF8, isAsciiBlank } from "./utf8";
import { SENSOR_CSV_COLUMNS, type SensorCsvFail, type SensorCsvLayout, type SensorSamples, readSensorCsvHeader, sensorCsvFail, sensorRecording } from "./sensor-csv-header";

/**
 * A sensor CSV's bytes seen through a window: bytes[0, filled) are the file's bytes up to file
 * offset `end`, and reading goes on at bytes[pos]. A whole file in memory is the window that holds
 * all of it (`eof` true from the start); a file read in chunks moves its window with `more`.
 */
export interface SensorCsvWindow {
  bytes: Uint8Array;
  pos: number;
  filled: number;
  /** File offset just past bytes[filled − 1]. */
  end: number;
  /** True once bytes[filled − 1] is the file's last byte. */
  eof: boolean;
}

/**
 * Called only while `eof` is false: moves bytes[pos, filled) to the window's start (pos becomes 0),
 * widens the window when they fill it, and reads behind them, setting filled, end and eof.
 */
export type MoreBytes = (window: SensorCsvWindow) => void;

/**
 * Reads a sensor CSV v1 file from a window on its bytes: the header lines, then the data rows
 * scanned from the bytes straight into the typed arrays (only the header lines, and a data row the
 * fast scanner hands back, are decoded), with the results and the errors of `readSensorCsv` on the
 * decoded text. The callers have already sent to the text reader what the bytes cannot answer
 * cheaply (a file over the size limit, a first visible character that is not ASCII or an empty file).
 * The one implementation behind `readSensorCsvBytes` (a window that holds the whole file) and
 * `readSensorCsvChunks` (a window moved through the file): rows, growth of the arrays, errors.
 *
 * `fileSize` is the size the file had when opened, for sizing the arrays before all of it is seen.
 */
export function readSensorCsvWindow(window: SensorCsvWindow, more: MoreBytes, fileSize: number, fileName: string): SensorRecording {
  const fail = sensorCsvFail(fileName);
  const layout = readSensorCsvHeader(() => nextLine(window, more), fail);
  let out = allocate(rowsToAllocate(window, fileSize, layout.names.length - 1 + SENSOR_CSV_COLUMNS.length));
  const state: RowState = { lineNo: layout.lineNo, count: 0, prevT: Number.NEGATIVE_INFINITY };
  const row = new Float64Array(7);
  for (;;) {
    const { bytes, filled, eof } = window;
    // Rows up to the last \n go to the fast scanner; at the end of the file a last row without one
    // to the general path; before the end, it waits for the next chunk.
    const lastNewline = filled > 0 ? bytes.lastIndexOf(10, filled - 1) : -1;
    const stop = eof ? filled : lastNewline + 1;
    let pos = readRows(bytes, window.pos, filled, lastNewline, stop, layout, out, state, row, fail);
    // The arrays are full with rows left: twice the room, the rows so far copied.
    while (pos < stop) {
      out = widen(out);
      pos = readRows(bytes, pos, filled, lastNewline, stop, layout, out, state, row, fail);
    }
    window.pos = pos;
    if (eof) break;
    more(window);
  }
  if (state.count === 0) fail(state.lineNo, undefined, "file has a header but no data rows");
  return sensorRecording(fileName, layout, out, state.count);
}

/** The next header line without its `\n` or `\r\n` (moving the window as needed), null at the end of the file. */
function nextLine(w: SensorCsvWindow, more: MoreBytes): string | null {
  let end = w.bytes.subarray(0, w.filled).indexOf(10, w.pos);
  while (end < 0 && !w.eof) {
    const scanned = w.filled - w.pos;
    more(w);
    end = w.bytes.subarray(0, w.filled).indexOf(10, w.pos + scanned);
  }
  const { bytes, pos, filled } = w;
  if (pos >= filled) return null;
  if (end < 0) end = filled;
  const lineEnd = end > pos && bytes[end - 1] === 13 ? end - 1 : end;
  // A run of blank lines needs no decoding: "" is as blank and as far from the magic line.
  const line = isAsciiBlank(bytes, pos, lineEnd) ? "" : UTF8.decode(bytes.subarray(pos, lineEnd));
  w.pos = end + 1;
  return line;
}

/**
 * Rows to allocate for the data rows from the window's `pos` on (see sampledRowCapacityBytes): the
 * rest of the file is its size when opened, or more if it has grown since, less what is behind `pos`.
 */
function rowsToAllocate(w: SensorCsvWindow, fileSize: number, minRowBytes: number): number {
  const { pos, filled } = w;
  const remaining = Math.max(0, Math.max(fileSize, w.end) - (w.end - filled + pos));
  return sampledRowCapacityBytes(w.bytes, pos, filled, remaining, w.eof, minRowBytes);
}

type Samples = SensorSamples;

/** Where the row loop stands between windows: the last line read, the rows stored, the last time. */
interface RowState {
  lineNo: number;
  count: number;
  prevT: number;
}

function allocate(capacity: number): Samples {
  return {
    timeS: new Float64Array(capacity),
    accX: new Float32Array(capacity),
    accY: new Float32Array(capacity),
    accZ: new Float32Array(capacity),
    gyroX: new Float32Array(capacity),
    gyroY: new Float32Array(capacity),
    gyroZ: new Float32Array(capacity),
  };
}

function widen(a: Samples): Samples {
  const b = allocate(Math.max(1, a.timeS.length * 2));
  for (const k of ["timeS", "accX", "accY", "accZ", "gyroX", "gyroY", "gyroZ"] as const) b[k].set(a[k]);
  return b;
}

/**
 * The row loop over bytes[pos, stop): every line ended by a `\n` (lastNewline is the window's last
 * one), and at the end of the file (stop = filled) the last one without. Returns where the first
 * line it left begins; it leaves lines only when `out` is full. A function of its own that ends
 * with its loop: the engine compiles the loop while the first file is read, and nothing after the
 * loop lacks the type feedback that would throw the compiled code away at the end of every file or
 * chunk.
 */
function readRows(
  bytes: Uint8Array,
  pos: number,
  filled: number,
  lastNewline: number,
  stop: number,
  layout: SensorCsvLayout,
  out: Samples,
  state: RowState,
  row: Float64Array,
  fail: SensorCsvFail,
): number {
  const { names, target, accScale, gyroScale } = layout;
  const { timeS, accX, accY, accZ, gyroX, gyroY, gyroZ } = out;
  const nCols = names.length;
  const capacity = timeS.length;
  let lineNo = state.lineNo;
  let count = state.count;
  let prevT = state.prevT;

  while (pos < stop && count < capacity) {
    lineNo++;
    let end = bytes[pos] === 35 || pos > lastNewline ? -1 : scanDecimalRowBytes(bytes, pos, COMMA, nCols, target, row);
    if (end < 0) {
      end = pos > lastNewline ? filled : bytes.indexOf(10, pos);
      const lineEnd = end > pos && bytes[end - 1] === 13 ? end - 1 : end;
      // Blank rows are skipped without decoding (only spaces and tabs, as the text reader checks).
      if (isSpacesAndTabs(bytes, pos, lineEnd)) {
        pos = end + 1;
        state.lineNo = lineNo;
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
    // Samples are stored in single precision (Math.fround is the value the array keeps): a value
    // beyond its range would become Infinity. x − x is 0 for a finite x and NaN otherwise: one
    // test for the six values, on the rounded values themselves rather than read back from the arrays.
    const ax = Math.fround(row[1]! * accScale);
    const ay = Math.fround(row[2]! * accScale);
    const az = Math.fround(row[3]! * accScale);
    const gx = Math.fround(row[4]! * gyroScale);
    const gy = Math.fround(row[5]! * gyroScale);
    const gz = Math.fround(row[6]! * gyroScale);
    timeS[count] = t;
    accX[count] = ax;
    accY[count] = ay;
    accZ[count] = az;
    gyroX[count] = gx;
    gyroY[count] = gy;
    gyroZ[count] = gz;
    const sum = ax + ay + az + gx + gy + gz;
    if (sum - sum !== 0) {
      const stored = [accX, accY, accZ, gyroX, gyroY, gyroZ];
      for (let k = 0; k < 6; k++) {
        if (!Number.isFinite(stored[k]![count]!)) fail(lineNo, SENSOR_CSV_COLUMNS[k + 1], `value ${row[k + 1]} is beyond any sensor's range`);
      }
    }
    count++;
    pos = end + 1;
    // Stored row by row, not after the loop: a store there has no type feedback when the engine
    // compiles the running loop, so the compiled code would be thrown away at the end of every call.
    state.lineNo = lineNo;
    state.count = count;
    state.prevT = prevT;
  }
  return pos;
}

function isSpacesAndTabs(bytes: Uint8Array, from: number, to: number): boolean {
  for (let i = from; i < to; i++) {
    const c = bytes[i]!;
    if (c !== 32 && c !== 9) return false;
  }
  return true;
}
