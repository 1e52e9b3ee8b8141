/**
 * UTF-8 as Node's `readFileSync(path, "utf8")` decodes a file: bad sequences become U+FFFD and a
 * BOM stays (the readers skip it themselves).
 */
export const UTF8 = new TextDecoder("utf-8", { ignoreBOM: true });

/** Length of a UTF-8 byte order mark at the start of bytes[0, filled), 0 without one. */
export function byteOrderMarkLength(bytes: Uint8Array, filled: number): number {
  return filled >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0;
}

/** Index of the first byte in bytes[from, to) that is not ASCII white space (see isAsciiWhiteSpace), `to` if none. */
export function firstVisibleByte(bytes: Uint8Array, from: number, to: number): number {
  let i = from;
  while (i < to && isAsciiWhiteSpace(bytes[i]!)) i++;
  return i;
}

/** The ASCII characters String.prototype.trim removes: tab, LF, VT, FF, CR, space. */
export function isAsciiWhiteSpace(c: number): boolean {
  return c === 32 || (c >= 9 && c <= 13);
}

/** True when bytes[from, to) holds only ASCII white space: the line is blank without decoding it. */
export function isAsciiBlank(bytes: Uint8Array, from: number, to: number): boolean {
  for (let i = from; i < to; i++) if (!isAsciiWhiteSpace(bytes[i]!)) return false;
  return true;
}

/**
 * True when `bytes` is well-formed UTF-8 as the WHATWG Encoding Standard's decoder accepts it with
 * `fatal: true` (RFC 3629: no overlong forms, no surrogates U+D800–DFFF, nothing above U+10FFFF,
 * no truncated sequence), checked without building a string. ASCII, nearly every byte of a sensor
 * file, takes one comparison.
 */
export function isWellFormedUtf8(bytes: Uint8Array): boolean {
  const n = bytes.length;
  let i = 0;
  while (i < n) {
    const c = bytes[i]!;
    if (c < 0x80) {
      i++;
      continue;
    }
    if (c >= 0xc2 && c <= 0xdf) {
      if (!isContinuation(bytes, i + 1, 0x80, 0xbf)) return false;
      i += 2;
    } else if (c >= 0xe0 && c <= 0xef) {
      // E0 needs A0–BF next (no overlong), ED 80–9F (no surrogates).
      const lower = c === 0xe0 ? 0xa0 : 0x80;
      const upper = c === 0xed ? 0x9f : 0xbf;
      if (!isContinuation(bytes, i + 1, lower, upper) || !isContinuation(bytes, i + 2, 0x80, 0xbf)) return false;
      i += 3;
    } else if (c >= 0xf0 && c <= 0xf4) {
      // F0 needs 90–BF next (no overlong), F4 80–8F (nothing above U+10FFFF).
      const lower = c === 0xf0 ? 0x90 : 0x80;
      const upper = c === 0xf4 ? 0x8f : 0xbf;
      if (!isContinuation(bytes, i + 1, lower, upper) || !isContinuation(bytes, i + 2, 0x80, 0xbf) || !isContinuation(bytes, i + 3, 0x80, 0xbf)) return false;
      i += 4;
    } else {
      return false;
    }
  }
  return true;
}

function isContinuation(bytes: Uint8Array, i: number, lower: number, upper: number): boolean {
  if (i >= bytes.length) return false;
  const c = bytes[i]!;
  return c >= lower && c <= upper;
}
