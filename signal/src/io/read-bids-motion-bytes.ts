import type { SensorRecording } from "../types";
import { BidsRows, type BidsLayout, type BidsMotionTexts, bidsFail, readBidsMotion, readBidsSidecars } from "./read-bids-motion";
import { MAX_SENSOR_FILE_CHARS } from "./read-sensor-csv";
import { sampledRowCapacityBytes } from "./row-capacity";
import { scanDecimalRowBytes, TAB } from "./scan-decimal-row-bytes";
import { UTF8, byteOrderMarkLength, firstVisibleByte, isAsciiBlank } from "./utf8";

/** The files of one BIDS Motion tracking system with the data file as bytes; the sidecars are small texts. */
export interface BidsMotionBytes extends Omit<BidsMotionTexts, "motionTsv"> {
  motionTsv: Uint8Array;
}

/**
 * `readBidsMotion` with the `_motion.tsv` as bytes: the same recordings, bit for bit, and the same
 * errors, word for word, as the text reader on the bytes decoded as UTF-8, without building the
 * text or a string per line. Plain rows (numbers of ≤ 15 significant digits between tabs) are
 * scanned from the bytes into the channel columns; any other line (blank, `n/a`, spaces, a bad
 * cell, non-ASCII) is decoded alone and read by the text reader's own line code, so what it
 * accepts and how it refuses cannot drift.
 *
 * Two questions go to the text reader on the decoded file, as in `readSensorCsvBytes`: a file over
 * the size limit (counted in characters) and one whose first visible character is not ASCII
 * ("empty" means only Unicode white space).
 */
export function readBidsMotionBytes(input: BidsMotionBytes): SensorRecording[] {
  const bytes = input.motionTsv;
  const maxChars = input.maxChars ?? MAX_SENSOR_FILE_CHARS;
  const n = bytes.length;
  const pos = byteOrderMarkLength(bytes, n);
  const firstVisible = firstVisibleByte(bytes, pos, n);
  if (n > maxChars || (firstVisible < n && bytes[firstVisible]! >= 0x80)) {
    return readBidsMotion({ ...input, motionTsv: UTF8.decode(bytes) });
  }
  const layout = readBidsSidecars(input);
  if (firstVisible === n) bidsFail(input.motionFileName, 1, undefined, "file is empty");
  const nCols = layout.channels.length;
  // A row holds nCols − 1 tabs and a value (a number or n/a) in every cell. The arrays are sized
  // from the lines of the file's first MiB, as the sensor CSV byte reader does, and grow when full.
  const capacity = sampledRowCapacityBytes(bytes, pos, n, n - pos, true, 2 * nCols - 1);
  const rows = new BidsRows(layout, input.motionFileName, capacity);
  const state: MotionRowState = { pos, lineNo: 0 };
  readMotionRows(bytes, layout, rows, state);
  // The arrays are full with lines left: twice the room, the rows so far copied.
  while (state.pos < n) {
    rows.widen();
    readMotionRows(bytes, layout, rows, state);
  }
  return rows.finish(state.lineNo);
}

/** Where the row loop stands between calls: the next line's first byte and the last line's number. */
interface MotionRowState {
  pos: number;
  lineNo: number;
}

/**
 * Reads lines from `state.pos` into `rows` until the end of the file or until its arrays are full,
 * and leaves in `state` where it stopped. A function of its own that ends with its loop, so the
 * engine compiles the loop once per process (see readRows in read-sensor-csv-window.ts).
 */
function readMotionRows(bytes: Uint8Array, layout: BidsLayout, rows: BidsRows, state: MotionRowState): void {
  const n = bytes.length;
  const nCols = layout.channels.length;
  const columns = rows.columns;
  const capacity = rows.capacity;
  // Every cell is a channel: the scanner writes cell c to row[c], then the row goes to the columns.
  const target = new Int32Array(nCols);
  for (let c = 0; c < nCols; c++) target[c] = c;
  const row = new Float64Array(nCols);
  // Rows up to the last \n go to the fast scanner; a last row without one to the general path.
  const lastNewline = bytes.lastIndexOf(10);
  let pos = state.pos;
  let lineNo = state.lineNo;
  // A blank line stores no row, but the check before every line keeps room for the line that does.
  while (pos < n && rows.count < capacity) {
    lineNo++;
    let end = pos > lastNewline ? -1 : scanDecimalRowBytes(bytes, pos, TAB, nCols, target, row);
    if (end >= 0) {
      const r = rows.count;
      for (let c = 0; c < nCols; c++) columns[c]![r] = row[c]!;
      rows.commit(lineNo);
    } else {
      end = pos > lastNewline ? n : bytes.indexOf(10, pos);
      const lineEnd = end > pos && bytes[end - 1] === 13 ? end - 1 : end;
      if (!isAsciiBlank(bytes, pos, lineEnd)) {
        const line = UTF8.decode(bytes.subarray(pos, lineEnd));
        rows.readLine(line, 0, line.length, lineNo);
      }
    }
    pos = end + 1;
    // Stored line by line, not after the loop (see readRows in read-sensor-csv-window.ts).
    state.pos = pos;
    state.lineNo = lineNo;
  }
}
