const POW10 = Array.from({ length: 23 }, (_, i) => 10 ** i);

/**
 * Fast path for one data row of a sensor CSV: `nCols` comma-separated cells starting at `pos`,
 * ended by `\n`, `\r\n` or the end of the text. Cells with `target[col] ≥ 0` must be plain
 * decimals with no surrounding spaces (`-12.5`, `3`, `.5`, `1.2e-3`, at most 15 significant
 * digits and a power of ten within ±22); their values go to `row[target[col]]`, computed with
 * exactly the arithmetic of `parseDecimal` (so the doubles are identical). Other cells are skipped.
 *
 * Returns the index of the row's `\n` (or text.length), or −1 when the row is anything else
 * (blank, comment, spaces, empty or odd cell, wrong cell count, long mantissa): the caller then
 * takes the general path, which parses what it can and reports the rest. `row` may be partly
 * written on −1.
 */
export function scanDecimalRow(text: string, pos: number, nCols: number, target: Int32Array, row: Float64Array): number {
  const n = text.length;
  let p = pos;
  for (let col = 0; col < nCols; col++) {
    const last = col === nCols - 1;
    const k = target[col]!;
    if (k < 0) {
      // Ignored cell: anything up to the separator; a comma in the last cell means too many cells.
      let c = p < n ? text.charCodeAt(p) : 10;
      while (c !== 44 && c !== 10) {
        p++;
        c = p < n ? text.charCodeAt(p) : 10;
      }
      if (last) {
        if (c === 44) return -1;
        return p < n ? p : n;
      }
      if (c !== 44) return -1;
      p++;
      continue;
    }
    let c = p < n ? text.charCodeAt(p) : -1;
    let sign = 1;
    if (c === 45 || c === 43) {
      if (c === 45) sign = -1;
      p++;
      c = p < n ? text.charCodeAt(p) : -1;
    }
    let mantissa = 0;
    let digits = 0;
    let scale = 0;
    while (c >= 48 && c <= 57) {
      mantissa = mantissa * 10 + (c - 48);
      digits++;
      p++;
      c = p < n ? text.charCodeAt(p) : -1;
    }
    if (c === 46) {
      p++;
      c = p < n ? text.charCodeAt(p) : -1;
      while (c >= 48 && c <= 57) {
        mantissa = mantissa * 10 + (c - 48);
        digits++;
        scale++;
        p++;
        c = p < n ? text.charCodeAt(p) : -1;
      }
    }
    if (digits === 0 || digits > 15) return -1;
    let exponent = 0;
    if (c === 101 || c === 69) {
      p++;
      c = p < n ? text.charCodeAt(p) : -1;
      let expSign = 1;
      if (c === 45 || c === 43) {
        if (c === 45) expSign = -1;
        p++;
        c = p < n ? text.charCodeAt(p) : -1;
      }
      let expDigits = 0;
      while (c >= 48 && c <= 57) {
        exponent = exponent * 10 + (c - 48);
        expDigits++;
        p++;
        c = p < n ? text.charCodeAt(p) : -1;
      }
      if (expDigits === 0) return -1;
      exponent *= expSign;
    }
    const e = exponent - scale;
    if (e > 22 || e < -22) return -1;
    row[k] = sign * (e >= 0 ? mantissa * POW10[e]! : mantissa / POW10[-e]!);
    if (!last) {
      if (c !== 44) return -1;
      p++;
      continue;
    }
    if (c === -1 || c === 10) return p < n ? p : n;
    if (c === 13) {
      if (p + 1 === n) return n;
      if (text.charCodeAt(p + 1) === 10) return p + 1;
    }
    return -1;
  }
  return -1;
}
