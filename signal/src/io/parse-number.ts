const POW10 = Array.from({ length: 23 }, (_, i) => 10 ** i);

/**
 * Parses a plain decimal number (`-12.5`, `3`, `1.2e-3`) in text[start, end) without allocating;
 * surrounding spaces are allowed. Returns NaN for anything else (empty, `NaN`, `inf`, `1,2`, `0x1`).
 * Up to 15 significant digits the result is the correctly rounded double (mantissa and power of ten
 * are both exact), beyond that it defers to Number().
 */
export function parseDecimal(text: string, start: number, end: number): number {
  let i = start;
  while (i < end && (text.charCodeAt(i) === 32 || text.charCodeAt(i) === 9)) i++;
  while (end > i && (text.charCodeAt(end - 1) === 32 || text.charCodeAt(end - 1) === 9)) end--;
  if (i >= end) return Number.NaN;
  let sign = 1;
  let c = text.charCodeAt(i);
  if (c === 45 || c === 43) {
    if (c === 45) sign = -1;
    i++;
  }
  let mantissa = 0;
  let digits = 0;
  let scale = 0;
  while (i < end) {
    c = text.charCodeAt(i);
    if (c < 48 || c > 57) break;
    mantissa = mantissa * 10 + (c - 48);
    digits++;
    i++;
  }
  if (i < end && text.charCodeAt(i) === 46) {
    i++;
    while (i < end) {
      c = text.charCodeAt(i);
      if (c < 48 || c > 57) break;
      mantissa = mantissa * 10 + (c - 48);
      digits++;
      scale++;
      i++;
    }
  }
  if (digits === 0) return Number.NaN;
  let exponent = 0;
  if (i < end && (text.charCodeAt(i) === 101 || text.charCodeAt(i) === 69)) {
    i++;
    let expSign = 1;
    c = text.charCodeAt(i);
    if (c === 45 || c === 43) {
      if (c === 45) expSign = -1;
      i++;
    }
    let expDigits = 0;
    while (i < end) {
      c = text.charCodeAt(i);
      if (c < 48 || c > 57) break;
      exponent = exponent * 10 + (c - 48);
      expDigits++;
      i++;
    }
    if (expDigits === 0) return Number.NaN;
    exponent *= expSign;
  }
  if (i !== end) return Number.NaN;
  const e = exponent - scale;
  if (digits > 15 || e > 22 || e < -22) {
    const v = Number(text.slice(start, end));
    return Number.isFinite(v) ? v : Number.NaN;
  }
  return sign * (e >= 0 ? mantissa * POW10[e]! : mantissa / POW10[-e]!);
}
