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
