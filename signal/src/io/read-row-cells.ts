import { parseDecimal } from "./parse-number";
import type { SensorCsvFail } from "./sensor-csv-header";

/**
 * General path for one data row text[start, lineEnd) (no `\n`, no trailing `\r`) of a sensor CSV:
 * the rows the fast scanners hand back (blank, comment, spaces around a number, long mantissas,
 * bad cells). Returns false for a blank row (skipped), true with `row[target[col]]` filled for a
 * good one, and reports anything else through `fail` with the line and the column. Shared by the
 * text and the byte readers (the byte reader decodes just this line) so both say the same words.
 */
export function readRowCells(
  text: string,
  start: number,
  lineEnd: number,
  lineNo: number,
  names: readonly string[],
  target: Int32Array,
  row: Float64Array,
  fail: SensorCsvFail,
): boolean {
  if (lineEnd === start || isBlank(text, start, lineEnd)) return false;
  if (text.charCodeAt(start) === 35) fail(lineNo, undefined, "comment line after the column header");
  const nCols = names.length;
  let cellStart = start;
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
  return true;
}

/** Only spaces and tabs in text[from, to). */
function isBlank(text: string, from: number, to: number): boolean {
  for (let i = from; i < to; i++) {
    const c = text.charCodeAt(i);
    if (c !== 32 && c !== 9) return false;
  }
  return true;
}
