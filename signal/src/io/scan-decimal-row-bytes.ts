const POW10 = Array.from({ length: 23 }, (_, i) => 10 ** i);

/** The two separators the byte readers scan for: sensor CSV and BIDS Motion TSV. */
export const COMMA = 44;
export const TAB = 9;

/**
 * `scanDecimalRow` over UTF-8 (or ASCII) bytes instead of a string: one data row of `nCols` cells
 * split by `separator` (`COMMA` for the sensor CSV, `TAB` for BIDS Motion) from `pos`, ended by
 * `\n` or `\r\n`, values of plain decimals (≤ 15 significant digits, power of ten within ±22)
 * written to `row[target[col]]` with the arithmetic of `parseDecimal` (a mantissa of ≤ 15 digits
 * and a power of ten within ±22 are both exact, so the quotient or product is the correctly
 * rounded double), so a file read as bytes gives the same doubles as its text. A cell with
 * `target[col] < 0` is skipped unread. Every byte the scanner looks for is ASCII, and in UTF-8 an
 * ASCII byte is always that character, so the bytes of a row split and parse exactly as its
 * characters do.
 *
 * Returns the index of the row's `\n`, or −1 for anything else (the caller's general path decides);
 * `row` may be partly written on −1. The scanner never steps over a `\n`, so a row followed by one
 * is read without bounds checks; a last row without `\n` gives −1 (and is better not offered: reading
 * past the end slows the compiled scanner down for the rest of the process).
 *
 * Both readers call this one function, each with its separator as a literal. A separator held in a
 * register costs what a constant did: the readers' first-run CPU time on the 30-minute bench
 * session moved by +1–3 %, inside the spread of the runs (DEVELOPERS.md, issue #16 decisions).
 */
export function scanDecimalRowBytes(
  bytes: Uint8Array,
  pos: number,
  separator: number,
  nCols: number,
  target: Int32Array,
  row: Float64Array,
): number {
  let p = pos;
  const lastCol = nCols - 1;
  for (let col = 0; ; col++) {
    const k = target[col]!;
    let c = bytes[p]!;
    if (k < 0) {
      // Ignored cell: anything up to the separator; a separator in the last cell means too many cells.
      const n = bytes.length;
      while (c !== separator && c !== 10 && p < n) c = bytes[++p]!;
      if (col === lastCol) return c === 10 ? p : -1;
      if (c !== separator) return -1;
      p++;
      continue;
    }
    // The minus sign without a branch: gyroscope cells are negative about half the time, so a
    // branch on it is mispredicted about as often. A `+` (rare) only where no `-` was.
    const minus = c === 45 ? 1 : 0;
    const sign = 1 - 2 * minus;
    p += minus;
    c = bytes[p]!;
    if (c === 43 && minus === 0) c = bytes[++p]!;
    // The digits, before and after the point, as one integer in 32-bit arithmetic: exact up to 9
    // digits (< 2^31), wrapped beyond, where digitsAsDouble reads them again. Integer steps are
    // shorter than a double's multiply and add per digit (the next digit waits for the last): the
    // scan of the 30-minute bench session took about 5 % less CPU, the same doubles either way.
    // c ^ 48 is the digit's value for "0"–"9" and 10 or more for every other byte (and for the
    // undefined past the end): one test per byte where a range takes two.
    let m = 0;
    const intStart = p;
    let d = c ^ 48;
    while (d < 10) {
      m = (m * 10 + d) | 0;
      c = bytes[++p]!;
      d = c ^ 48;
    }
    let digits = p - intStart;
    let scale = 0;
    if (c === 46) {
      const fracStart = ++p;
      c = bytes[p]!;
      d = c ^ 48;
      while (d < 10) {
        m = (m * 10 + d) | 0;
        c = bytes[++p]!;
        d = c ^ 48;
      }
      scale = p - fracStart;
      digits += scale;
    }
    if (digits === 0 || digits > 15) return -1;
    const mantissa = digits <= 9 ? m : digitsAsDouble(bytes, intStart, p);
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
    row[k] = sign * (e >= 0 ? mantissa * POW10[e]! : mantissa / POW10[-e]!);
    if (col !== lastCol) {
      if (c !== separator) return -1;
      p++;
      continue;
    }
    if (c === 10) return p;
    if (c === 13 && bytes[p + 1] === 10) return p + 1;
    return -1;
  }
}

/**
 * The digits of bytes[from, to) (a run of digits with at most one `.` among them) as one integer
 * in doubles, digit after digit (× 10 + digit) as `parseDecimal` does: exact up to 15 digits.
 */
function digitsAsDouble(bytes: Uint8Array, from: number, to: number): number {
  let mantissa = 0;
  for (let i = from; i < to; i++) {
    const c = bytes[i]!;
    if (c !== 46) mantissa = mantissa * 10 + (c - 48);
  }
  return mantissa;
}
