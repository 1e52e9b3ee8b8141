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

/** Bytes of data rows counted to size the arrays of a byte reader: a chunk's worth (see readSensorCsvChunks). */
export const SIZING_SAMPLE_BYTES = 1 << 20;

/**
 * Rows to allocate for the data rows of bytes[pos, …) when `remaining` bytes of the file are left
 * from `pos` on and bytes[pos, filled) of them are in memory: the lines of the first
 * SIZING_SAMPLE_BYTES, but never more than the rest could hold at the shortest possible row
 * (`minRowBytes`). When the sample is all the rest of the file (`restInMemory` and the sample ends at
 * `filled`) that is `rowCapacityBytes`, exact; otherwise the rows the rest holds at the sample's
 * bytes per line, plus a margin, and only a file whose later lines are much shorter than its first
 * ones makes the reader grow its arrays. Counting every line of a whole file (one `indexOf` call per
 * line) took nearly 30 % of the sensor CSV byte reader's CPU on the 30-minute bench session.
 */
export function sampledRowCapacityBytes(
  bytes: Uint8Array,
  pos: number,
  filled: number,
  remaining: number,
  restInMemory: boolean,
  minRowBytes: number,
): number {
  const sampleEnd = Math.min(filled, pos + SIZING_SAMPLE_BYTES);
  const sample = bytes.subarray(0, sampleEnd);
  if (restInMemory && sampleEnd === filled) return rowCapacityBytes(sample, pos, minRowBytes);
  let lines = 0;
  for (let p = sample.indexOf(10, pos); p >= 0; p = sample.indexOf(10, p + 1)) lines++;
  const fit = Math.floor(remaining / Math.max(1, minRowBytes)) + 1;
  const estimate = lines === 0 ? fit : Math.ceil((remaining / (sampleEnd - pos)) * lines * 1.05) + 64;
  return Math.min(fit, estimate);
}
