import type { SensorRecording } from "../types";
import { BidsRows, type BidsLayout, type BidsMotionTexts, bidsFail, readBidsMotion, readBidsSidecars } from "./read-bids-motion";
import { MAX_SENSOR_FILE_CHARS } from "./read-sensor-csv";
import { rowCapacityBytes } from "./row-capacity";

/** The files of one BIDS Motion tracking system with the data file as bytes; the sidecars are small texts. */
export interface BidsMotionBytes extends Omit<BidsMotionTexts, "motionTsv"> {
  motionTsv: Uint8Array;
}

/** UTF-8 as Node's `readFileSync(path, "utf8")` decodes: bad sequences become U+FFFD, a BOM stays. */
const UTF8 = new TextDecoder("utf-8", { ignoreBOM: true });

const POW10 = Array.from({ length: 23 }, (_, i) => 10 ** i);

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
  const pos = n >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0;
  let firstVisible = pos;
  while (firstVisible < n && isAsciiWhiteSpace(bytes[firstVisible]!)) firstVisible++;
  if (n > maxChars || (firstVisible < n && bytes[firstVisible]! >= 0x80)) {
    return readBidsMotion({ ...input, motionTsv: UTF8.decode(bytes) });
  }
  const layout = readBidsSidecars(input);
  if (firstVisible === n) bidsFail(input.motionFileName, 1, undefined, "file is empty");
  const nCols = layout.channels.length;
  // A row holds nCols − 1 tabs and a value (a number or n/a) in every cell.
  const rows = new BidsRows(layout, input.motionFileName, rowCapacityBytes(bytes, 0, 2 * nCols - 1));
  const lineNo = readMotionRows(bytes, pos, layout, rows);
  return rows.finish(lineNo);
}

/**
 * Reads every line from `pos` into `rows` and returns the number of the last line. A function of
 * its own that ends with its loop, so the engine compiles the loop once per process (see
 * readSensorCsvBytes).
 */
function readMotionRows(bytes: Uint8Array, pos: number, layout: BidsLayout, rows: BidsRows): number {
  const n = bytes.length;
  const nCols = layout.channels.length;
  const columns = rows.columns;
  // Rows up to the last \n go to the fast scanner; a last row without one to the general path.
  const lastNewline = bytes.lastIndexOf(10);
  let lineNo = 0;
  while (pos < n) {
    lineNo++;
    let end = pos > lastNewline ? -1 : scanTabRow(bytes, pos, nCols, columns, rows.count);
    if (end >= 0) {
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
  }
  return lineNo;
}

/**
 * One row of exactly `nCols` tab-separated plain decimals from `pos`, ended by `\n` or `\r\n`,
 * written to `columns[col][row]` with `parseDecimal`'s arithmetic (a mantissa of ≤ 15 digits and a
 * power of ten within ±22 are both exact, so the quotient or product is the correctly rounded
 * double). Returns the index of the row's `\n`, or −1 for anything else, leaving the line to the
 * text path (columns may then be partly written; the text path overwrites them). Every byte looked
 * for is ASCII, and in UTF-8 an ASCII byte is always that character. The scanner never steps over a
 * `\n`, so it needs no bounds checks when a `\n` follows (the caller makes sure of that).
 */
function scanTabRow(bytes: Uint8Array, pos: number, nCols: number, columns: Float64Array[], row: number): number {
  let p = pos;
  const lastCol = nCols - 1;
  for (let col = 0; ; col++) {
    let c = bytes[p]!;
    let sign = 1;
    if (c === 45) {
      sign = -1;
      c = bytes[++p]!;
    } else if (c === 43) {
      c = bytes[++p]!;
    }
    let mantissa = 0;
    const intStart = p;
    while (c >= 48 && c <= 57) {
      mantissa = mantissa * 10 + (c - 48);
      c = bytes[++p]!;
    }
    let digits = p - intStart;
    let scale = 0;
    if (c === 46) {
      const fracStart = ++p;
      c = bytes[p]!;
      while (c >= 48 && c <= 57) {
        mantissa = mantissa * 10 + (c - 48);
        c = bytes[++p]!;
      }
      scale = p - fracStart;
      digits += scale;
    }
    if (digits === 0 || digits > 15) return -1;
    let exponent = 0;
    if (c === 101 || c === 69) {
      c = bytes[++p]!;
      let expSign = 1;
      if (c === 45) {
        expSign = -1;
        c = bytes[++p]!;
      } else if (c === 43) {
        c = bytes[++p]!;
      }
      const expStart = p;
      while (c >= 48 && c <= 57) {
        exponent = exponent * 10 + (c - 48);
        c = bytes[++p]!;
      }
      if (p === expStart) return -1;
      exponent *= expSign;
    }
    const e = exponent - scale;
    if (e > 22 || e < -22) return -1;
    columns[col]![row] = sign * (e >= 0 ? mantissa * POW10[e]! : mantissa / POW10[-e]!);
    if (col !== lastCol) {
      if (c !== 9) return -1;
      p++;
      continue;
    }
    if (c === 10) return p;
    if (c === 13 && bytes[p + 1] === 10) return p + 1;
    return -1;
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
