import type { SensorRecording } from "../types";
import { MAX_SENSOR_FILE_CHARS, type ReadSensorCsvOptions } from "./read-sensor-csv";
import { readSensorCsvBytes } from "./read-sensor-csv-bytes";
import { readRowCells } from "./read-row-cells";
import { COMMA, scanDecimalRowBytes } from "./scan-decimal-row-bytes";
import { SENSOR_CSV_COLUMNS, type SensorCsvFail, type SensorCsvLayout, readSensorCsvHeader, sensorCsvFail } from "./sensor-csv-header";

/**
 * Where a file's bytes come from: its size when opened, and positioned reads (`fs.readSync(fd, into,
 * offset, length, position)` for a file) that return how many bytes they placed, 0 at the end.
 */
export interface ByteSource {
  readonly size: number;
  readAt(into: Uint8Array, offset: number, length: number, position: number): number;
}

export interface ReadSensorCsvChunksOptions extends ReadSensorCsvOptions {
  /** Bytes read at a time (default 1 MiB); a longer line widens the window for that file only. */
  chunkBytes?: number;
}

const DEFAULT_CHUNK_BYTES = 1 << 20;
const UTF8 = new TextDecoder("utf-8", { ignoreBOM: true });

/**
 * One window reused for every file of a process. Reading a 17 MB file whole touches 17 MB of new
 * memory, and the first touch (page faults, then cache misses) cost more CPU than parsing the rows;
 * a window of 1 MiB read again and again stays mapped and in cache. Safe to share: the reader is
 * synchronous and nothing it returns points into the window.
 */
let sharedWindow: Uint8Array | null = null;

/**
 * `readSensorCsvBytes(<all of the source's bytes>, fileName, options)` — the same recording bit for
 * bit, or the same error word for word with the same line — while holding only a window of the
 * file: rows are scanned from the window into the typed arrays, the unfinished last line moves to
 * the window's start, and the next chunk is read behind it.
 *
 * The questions that need the whole file go to `readSensorCsvBytes` on the whole file, read then:
 * a file over the size limit (the limit counts characters), and one whose first visible character
 * is not ASCII or lies beyond the first chunk.
 */
export function readSensorCsvChunks(source: ByteSource, fileName: string, options: ReadSensorCsvChunksOptions = {}): SensorRecording {
  const maxChars = options.maxChars ?? MAX_SENSOR_FILE_CHARS;
  const chunkBytes = Math.max(1, Math.floor(options.chunkBytes ?? DEFAULT_CHUNK_BYTES));
  if (source.size > maxChars) return readSensorCsvBytes(readAll(source), fileName, options);
  let buf: Uint8Array;
  if (chunkBytes === DEFAULT_CHUNK_BYTES) buf = sharedWindow ??= new Uint8Array(DEFAULT_CHUNK_BYTES);
  else buf = new Uint8Array(chunkBytes);

  let filled = fill(source, buf, 0, 0);
  let filePos = filled;
  let eof = filled < buf.length;
  // The whole file fits in one chunk: the byte reader on it, as is.
  if (eof) return readSensorCsvBytes(buf.slice(0, filled), fileName, options);

  let pos = filled >= 3 && buf[0] === 0xef && buf[1] === 0xbb && buf[2] === 0xbf ? 3 : 0;
  let firstVisible = pos;
  while (firstVisible < filled && isAsciiWhiteSpace(buf[firstVisible]!)) firstVisible++;
  if (firstVisible === filled || buf[firstVisible]! >= 0x80) return readSensorCsvBytes(readAll(source), fileName, options);

  /** Moves the unread bytes to the window's start, widens a full window, reads behind them. */
  const more = (): void => {
    buf.copyWithin(0, pos, filled);
    filled -= pos;
    pos = 0;
    if (filled === buf.length) {
      const wider = new Uint8Array(buf.length * 2);
      wider.set(buf);
      buf = wider;
    }
    const got = fill(source, buf, filled, filePos);
    filled += got;
    filePos += got;
    eof = filled < buf.length;
  };

  const fail = sensorCsvFail(fileName);
  const nextLine = (): string | null => {
    let end = buf.subarray(0, filled).indexOf(10, pos);
    while (end < 0 && !eof) {
      const scanned = filled - pos;
      more();
      end = buf.subarray(0, filled).indexOf(10, pos + scanned);
    }
    if (pos >= filled) return null;
    if (end < 0) end = filled;
    const lineEnd = end > pos && buf[end - 1] === 13 ? end - 1 : end;
    // As the byte reader: a run of blank lines needs no decoding.
    const line = isAsciiBlank(buf, pos, lineEnd) ? "" : UTF8.decode(buf.subarray(pos, lineEnd));
    pos = end + 1;
    return line;
  };
  const layout = readSensorCsvHeader(nextLine, fail);

  // Rows to allocate: the rows the rest of the file holds at the first chunk's bytes per line (plus
  // a margin), never more than it could hold at the shortest possible row (the byte reader's bound).
  // Only a file whose later lines are much shorter than its first ones makes the arrays grow.
  const minRowBytes = layout.names.length - 1 + SENSOR_CSV_COLUMNS.length;
  const remaining = Math.max(0, Math.max(source.size, filePos) - (filePos - filled + pos));
  const head = buf.subarray(0, filled);
  let lines = 0;
  for (let p = head.indexOf(10, pos); p >= 0; p = head.indexOf(10, p + 1)) lines++;
  const fit = Math.floor(remaining / Math.max(1, minRowBytes)) + 1;
  const estimate = lines === 0 ? fit : Math.ceil((remaining / (filled - pos)) * lines * 1.05) + 64;
  const capacity = Math.min(fit, estimate);
  let out = allocate(capacity);
  const state: RowState = { lineNo: layout.lineNo, count: 0, prevT: Number.NEGATIVE_INFINITY };
  const row = new Float64Array(7);
  for (;;) {
    pos = readRows(buf, pos, filled, eof, layout, out, state, row, fail);
    if (state.count === out.timeS.length) out = widen(out);
    if (eof && pos >= filled) break;
    if (!eof) more();
  }
  if (state.count === 0) fail(state.lineNo, undefined, "file has a header but no data rows");
  // The same limit the byte reader applies, had the file grown past it while it was read.
  if (filePos > maxChars) return readSensorCsvBytes(readAll(source), fileName, options);
  const count = state.count;
  return {
    fileName,
    deviceSerial: layout.deviceSerial,
    placement: layout.placement,
    nominalSampleRateHz: layout.nominalSampleRateHz,
    startUtc: layout.startUtc,
    timeS: out.timeS.subarray(0, count),
    accX: out.accX.subarray(0, count),
    accY: out.accY.subarray(0, count),
    accZ: out.accZ.subarray(0, count),
    gyroX: out.gyroX.subarray(0, count),
    gyroY: out.gyroY.subarray(0, count),
    gyroZ: out.gyroZ.subarray(0, count),
  };
}

type Samples = Pick<SensorRecording, "timeS" | "accX" | "accY" | "accZ" | "gyroX" | "gyroY" | "gyroZ">;

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

/** When the estimate fell short: twice the room, the rows so far copied. */
function widen(a: Samples): Samples {
  const b = allocate(a.timeS.length * 2);
  for (const k of ["timeS", "accX", "accY", "accZ", "gyroX", "gyroY", "gyroZ"] as const) b[k].set(a[k]);
  return b;
}

/**
 * The byte reader's row loop over the window buf[pos, filled): every line ended by a `\n`, and at
 * the end of the file the last one without. Returns where the first line it left begins. Stops
 * early when `out` is full. A function of its own that ends with its loop, for the same reason as
 * the byte reader's (the compiled loop keeps its type feedback from chunk to chunk).
 */
function readRows(
  bytes: Uint8Array,
  pos: number,
  filled: number,
  eof: boolean,
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
  // Rows up to the last \n go to the fast scanner; at the end of the file a last row without one
  // to the general path; before the end, it waits for the next chunk.
  const lastNewline = filled > 0 ? bytes.lastIndexOf(10, filled - 1) : -1;
  const stop = eof ? filled : lastNewline + 1;
  let lineNo = state.lineNo;
  let count = state.count;
  let prevT = state.prevT;

  while (pos < stop && count < capacity) {
    lineNo++;
    let end = bytes[pos] === 35 || pos > lastNewline ? -1 : scanDecimalRowBytes(bytes, pos, COMMA, nCols, target, row);
    if (end < 0) {
      end = pos > lastNewline ? filled : bytes.indexOf(10, pos);
      const lineEnd = end > pos && bytes[end - 1] === 13 ? end - 1 : end;
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
    timeS[count] = t;
    accX[count] = row[1]! * accScale;
    accY[count] = row[2]! * accScale;
    accZ[count] = row[3]! * accScale;
    gyroX[count] = row[4]! * gyroScale;
    gyroY[count] = row[5]! * gyroScale;
    gyroZ[count] = row[6]! * gyroScale;
    const sum = accX[count]! + accY[count]! + accZ[count]! + gyroX[count]! + gyroY[count]! + gyroZ[count]!;
    if (sum - sum !== 0) {
      const stored = [accX, accY, accZ, gyroX, gyroY, gyroZ];
      for (let k = 0; k < 6; k++) {
        if (!Number.isFinite(stored[k]![count]!)) fail(lineNo, SENSOR_CSV_COLUMNS[k + 1], `value ${row[k + 1]} is beyond any sensor's range`);
      }
    }
    count++;
    pos = end + 1;
    // Stored row by row, not after the loop: a store there has no type feedback when the engine
    // compiles the running loop, so the compiled code would be thrown away at the end of every chunk.
    state.lineNo = lineNo;
    state.count = count;
    state.prevT = prevT;
  }
  return pos;
}

/** Reads into buf[offset, buf.length) from `position` until it is full or the source ends; returns the bytes read. */
function fill(source: ByteSource, buf: Uint8Array, offset: number, position: number): number {
  let at = offset;
  while (at < buf.length) {
    const got = source.readAt(buf, at, buf.length - at, position + (at - offset));
    if (!(got > 0)) break;
    at += got;
  }
  return at - offset;
}

/** All of the source's bytes, however many there are by now. */
function readAll(source: ByteSource): Uint8Array {
  let buf = new Uint8Array(Math.max(1, source.size + 1));
  let filled = 0;
  for (;;) {
    filled += fill(source, buf, filled, filled);
    if (filled < buf.length) return buf.subarray(0, filled);
    const wider = new Uint8Array(buf.length * 2);
    wider.set(buf);
    buf = wider;
  }
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
