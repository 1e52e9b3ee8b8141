import type { SensorRecording } from "../types";
import { MAX_SENSOR_FILE_CHARS, type ReadSensorCsvOptions } from "./read-sensor-csv";
import { readSensorCsvBytes } from "./read-sensor-csv-bytes";
import { type SensorCsvWindow, readSensorCsvWindow } from "./read-sensor-csv-window";
import { byteOrderMarkLength, firstVisibleByte } from "./utf8";

/**
 * Where a file's bytes come from: its size when opened, and positioned reads (`fs.readSync(fd, into,
 * offset, length, position)` for a file) that return how many bytes they placed, 0 at the end.
 */
export interface ByteSource {
  readonly size: number;
  readAt(into: Uint8Array, offset: number, length: number, position: number): number;
}

export interface ReadSensorCsvChunksOptions extends ReadSensorCsvOptions {
  /** Bytes read at a time (default 1 MiB); a longer line widens the window for that file only. */
  chunkBytes?: number;
}

const DEFAULT_CHUNK_BYTES = 1 << 20;

/**
 * One window reused for every file of a process. Reading a 17 MB file whole touches 17 MB of new
 * memory, and the first touch (page faults, then cache misses) cost more CPU than parsing the rows;
 * a window of 1 MiB read again and again stays mapped and in cache. Safe to share: the reader is
 * synchronous and nothing it returns points into the window.
 */
let sharedWindow: Uint8Array | null = null;

/**
 * `readSensorCsvBytes(<all of the source's bytes>, fileName, options)` — the same recording bit for
 * bit, or the same error word for word with the same line — while holding only a window of the
 * file: the byte reader's own header and row code (`readSensorCsvWindow`) scans the window, the
 * unfinished last line moves to the window's start, and the next chunk is read behind it.
 *
 * The questions that need the whole file go to `readSensorCsvBytes` on the whole file, read then:
 * a file over the size limit (the limit counts characters), and one whose first visible character
 * is not ASCII or lies beyond the first chunk. A file that fits in one chunk goes to it as well.
 */
export function readSensorCsvChunks(source: ByteSource, fileName: string, options: ReadSensorCsvChunksOptions = {}): SensorRecording {
  const maxChars = options.maxChars ?? MAX_SENSOR_FILE_CHARS;
  const chunkBytes = Math.max(1, Math.floor(options.chunkBytes ?? DEFAULT_CHUNK_BYTES));
  if (source.size > maxChars) return readSensorCsvBytes(readAll(source), fileName, options);
  let buf: Uint8Array;
  if (chunkBytes === DEFAULT_CHUNK_BYTES) buf = sharedWindow ??= new Uint8Array(DEFAULT_CHUNK_BYTES);
  else buf = new Uint8Array(chunkBytes);

  const filled = fill(source, buf, 0, 0);
  // The whole file fits in one chunk: the byte reader on it, as is (nothing it returns points into it).
  if (filled < buf.length) return readSensorCsvBytes(buf.subarray(0, filled), fileName, options);

  const pos = byteOrderMarkLength(buf, filled);
  const firstVisible = firstVisibleByte(buf, pos, filled);
  if (firstVisible === filled || buf[firstVisible]! >= 0x80) return readSensorCsvBytes(readAll(source), fileName, options);

  const window: SensorCsvWindow = { bytes: buf, pos, filled, end: filled, eof: false };
  const recording = readSensorCsvWindow(window, (w) => more(source, w), source.size, fileName);
  // The same limit the byte reader applies, had the file grown past it while it was read.
  if (window.end > maxChars) return readSensorCsvBytes(readAll(source), fileName, options);
  return recording;
}

/** Moves the unread bytes to the window's start, widens a full window, reads behind them. */
function more(source: ByteSource, w: SensorCsvWindow): void {
  w.bytes.copyWithin(0, w.pos, w.filled);
  w.filled -= w.pos;
  w.pos = 0;
  if (w.filled === w.bytes.length) {
    const wider = new Uint8Array(w.bytes.length * 2);
    wider.set(w.bytes);
    w.bytes = wider;
  }
  const got = fill(source, w.bytes, w.filled, w.end);
  w.filled += got;
  w.end += got;
  w.eof = w.filled < w.bytes.length;
}

/** Reads into buf[offset, buf.length) from `position` until it is full or the source ends; returns the bytes read. */
function fill(source: ByteSource, buf: Uint8Array, offset: number, position: number): number {
  let at = offset;
  while (at < buf.length) {
    const got = source.readAt(buf, at, buf.length - at, position + (at - offset));
    if (!(got > 0)) break;
    at += got;
  }
  return at - offset;
}

/** All of the source's bytes, however many there are by now. */
function readAll(source: ByteSource): Uint8Array {
  let buf = new Uint8Array(Math.max(1, source.size + 1));
  let filled = 0;
  for (;;) {
    filled += fill(source, buf, filled, filled);
    if (filled < buf.length) return buf.subarray(0, filled);
    const wider = new Uint8Array(buf.length * 2);
    wider.set(buf);
    buf = wider;
  }
}
