/**
 * Rows to allocate for the data part of a text, text[from, end): the number of lines, but never more
 * than the text could hold when every data row is at least `minRowChars` characters long (the
 * caller knows its format: separators plus one character per cell that must hold a number).
 * Without this bound a file of blank lines (or, for BIDS, a channels.tsv with thousands of rows next
 * to a motion.tsv of empty lines) made the reader allocate cells × lines numbers: a 0.7 MB upload
 * asked for gigabytes.
 */
export function rowCapacity(text: string, from: number, minRowChars: number): number {
  let lines = 1;
  for (let p = text.indexOf("\n", from); p >= 0; p = text.indexOf("\n", p + 1)) lines++;
  const fit = Math.floor(Math.max(0, text.length - from) / Math.max(1, minRowChars)) + 1;
  return Math.min(lines, fit);
}

/** `rowCapacity` over bytes, bytes[from, end): the same bound, counted in bytes. */
export function rowCapacityBytes(bytes: Uint8Array, from: number, minRowBytes: number): number {
  let lines = 1;
  for (let p = bytes.indexOf(10, from); p >= 0; p = bytes.indexOf(10, p + 1)) lines++;
  const fit = Math.floor(Math.max(0, bytes.length - from) / Math.max(1, minRowBytes)) + 1;
  return Math.min(lines, fit);
}
