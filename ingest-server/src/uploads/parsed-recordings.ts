import { closeSync, openSync, writeSync } from "node:fs";
import { ALGORITHM_VERSION, type Placement, type SensorRecording } from "@pendula/signal";

/**
 * The recordings an upload's parse thread already holds, kept beside the uploaded files so the
 * processing worker does not download and parse the same megabytes of text again.
 *
 * Layout (all little-endian; one object per session):
 *   8 bytes   magic "PNDLREC\x01"
 *   4 bytes   uint32 length of the header JSON in bytes
 *   header    UTF-8 JSON (ParsedRecordingsHeader), zero-padded to a multiple of 8
 *   arrays    per recording, in order: timeS, accX, accY, accZ, gyroX, gyroY, gyroZ (Float32),
 *             each padded to 8 bytes. timeS is the reader's Float64 bytes, or — when the header
 *             gives `timeTicks` — Int32 steps between decimal ticks (see below)
 *
 * The channels are the reader's own bytes, not a re-encoding, so analysis input is bit-identical
 * to parsing the originals. Times written as decimals with a fixed number of places (a device's
 * clock) are whole numbers of ticks of 10^-k s; such a column is stored as the Int32 difference
 * between consecutive ticks (half the bytes) and rebuilt as tick / 10^k, exactly the expression
 * that was checked, sample by sample and bit for bit, against the reader's value before choosing
 * it. Any sample that does not rebuild identically keeps the Float64 column. The uploaded files stay the record of what was sent; this object is a
 * cache of their parse. The worker uses it only when its header names the same files (sha256, in
 * stored order), the same reader/analysis version and this codec's version; otherwise it reads the
 * originals (sessions stored before this existed, or reprocessed after an upgrade).
 */
const MAGIC = Buffer.from("PNDLREC\x01", "latin1");
export const PARSED_RECORDINGS_CODEC = 2;
/** Objects of codec 1 (Float64 times always) are still read: same layout without `timeTicks`. */
const READABLE_CODECS = new Set([1, PARSED_RECORDINGS_CODEC]);

export interface ParsedRecordingsHeader {
  codec: number;
  /** ALGORITHM_VERSION of the code that parsed the files (a reader change comes with a new version). */
  algorithmVersion: string;
  /** sha256 of every uploaded file, in upload order (the order of the stored objects' keys). */
  fileSha256: string[];
  recordings: Array<{
    fileName: string;
    deviceSerial: string;
    placement: Placement | null;
    nominalSampleRateHz: number;
    startUtc: string;
    samples: number;
    /** Index of the uploaded file this recording came from. */
    file: number;
    /** Present when timeS is stored as Int32 tick steps: time[i] = (firstTick + Σ steps[1..i]) / perSecond. */
    timeTicks?: { perSecond: number; firstTick: number };
  }>;
}

const CHANNELS32 = ["accX", "accY", "accZ", "gyroX", "gyroY", "gyroZ"] as const;
const pad8 = (n: number) => (8 - (n % 8)) % 8;
/** Up to 10^-9 s: beyond that a decimal clock column is not what a sensor writes. */
const MAX_TICK_DIGITS = 9;

/**
 * Int32 tick steps when every time is exactly tick / 10^k for integer ticks with steps within
 * Int32 (checked with the very expression the reader side uses), else undefined (keep Float64).
 */
export function timeAsTicks(timeS: Float64Array): { perSecond: number; firstTick: number; steps: Int32Array } | undefined {
  if (timeS.length === 0) return undefined;
  for (let k = 0; k <= MAX_TICK_DIGITS; k++) {
    const perSecond = 10 ** k;
    const steps = ticksAt(timeS, perSecond);
    if (steps) return { perSecond, firstTick: Math.round(timeS[0]! * perSecond), steps };
  }
  return undefined;
}

function ticksAt(timeS: Float64Array, perSecond: number): Int32Array | undefined {
  const steps = new Int32Array(timeS.length);
  let previous = 0;
  for (let i = 0; i < timeS.length; i++) {
    const t = timeS[i]!;
    // A -0 would come back as +0 (integer sums, and JSON drops the sign of a first tick of -0).
    if (Object.is(t, -0)) return undefined;
    const tick = Math.round(t * perSecond);
    // Exact integers only (|tick| < 2^53), and the rebuilt value must be the same double, -0 included.
    if (!Number.isSafeInteger(tick) || !Object.is(tick / perSecond, t)) return undefined;
    if (i > 0) {
      const step = tick - previous;
      if (step !== (step | 0)) return undefined;
      steps[i] = step;
    }
    previous = tick;
  }
  return steps;
}

/** The inverse of timeAsTicks: the same integer sums and the same division. */
function timeFromTicks(steps: Int32Array, perSecond: number, firstTick: number): Float64Array {
  const timeS = new Float64Array(steps.length);
  let tick = firstTick;
  for (let i = 0; i < steps.length; i++) {
    if (i > 0) tick += steps[i]!;
    timeS[i] = tick / perSecond;
  }
  return timeS;
}

/** Writes the recordings to `path` (one pass, no copy of the sample arrays). */
export function writeParsedRecordings(path: string, recordings: readonly SensorRecording[], recordingFile: readonly number[], fileSha256: readonly string[]): void {
  const ticks = recordings.map((r) => timeAsTicks(r.timeS));
  const header: ParsedRecordingsHeader = {
    codec: PARSED_RECORDINGS_CODEC,
    algorithmVersion: ALGORITHM_VERSION,
    fileSha256: [...fileSha256],
    recordings: recordings.map((r, i) => ({
      fileName: r.fileName,
      deviceSerial: r.deviceSerial,
      placement: r.placement,
      nominalSampleRateHz: r.nominalSampleRateHz,
      startUtc: r.startUtc,
      samples: r.timeS.length,
      file: recordingFile[i]!,
      ...(ticks[i] ? { timeTicks: { perSecond: ticks[i].perSecond, firstTick: ticks[i].firstTick } } : {}),
    })),
  };
  for (const r of recordings) {
    for (const c of CHANNELS32) {
      if (r[c].length !== r.timeS.length) throw new Error(`${r.fileName}: ${c} has ${r[c].length} samples, timeS ${r.timeS.length}`);
    }
  }
  const json = Buffer.from(JSON.stringify(header), "utf8");
  const length = Buffer.alloc(4);
  length.writeUInt32LE(json.length);
  const zeros = Buffer.alloc(8);
  const fd = openSync(path, "w", 0o600);
  try {
    const write = (b: Uint8Array) => {
      for (let at = 0; at < b.length; ) at += writeSync(fd, b, at, b.length - at);
    };
    write(MAGIC);
    write(length);
    write(json);
    write(zeros.subarray(0, pad8(12 + json.length)));
    for (const [i, r] of recordings.entries()) {
      for (const a of [ticks[i]?.steps ?? r.timeS, ...CHANNELS32.map((c) => r[c])]) {
        write(new Uint8Array(a.buffer, a.byteOffset, a.byteLength));
        write(zeros.subarray(0, pad8(a.byteLength)));
      }
    }
  } finally {
    closeSync(fd);
  }
}

export class ParsedRecordingsMismatch extends Error {
  constructor(message: string) {
    super(message);
    this.name = "ParsedRecordingsMismatch";
  }
}

/**
 * Bytes → recordings (views into one aligned buffer; nothing per sample is copied or converted).
 * Throws ParsedRecordingsMismatch when the object does not belong to `fileSha256` or was written
 * by another version, so the caller reads the originals instead.
 */
export function readParsedRecordings(bytes: Uint8Array, fileSha256: readonly string[]): { recordings: SensorRecording[]; recordingFile: number[] } {
  if (!littleEndian()) throw new ParsedRecordingsMismatch("this machine is big-endian; the stored arrays are little-endian");
  if (bytes.length < 12 || !Buffer.from(bytes.buffer, bytes.byteOffset, 8).equals(MAGIC)) throw new ParsedRecordingsMismatch("not a parsed-recordings object");
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const jsonLength = view.getUint32(8, true);
  if (12 + jsonLength > bytes.length) throw new ParsedRecordingsMismatch("header runs past the end");
  let header: ParsedRecordingsHeader;
  try {
    header = JSON.parse(Buffer.from(bytes.buffer, bytes.byteOffset + 12, jsonLength).toString("utf8")) as ParsedRecordingsHeader;
  } catch {
    throw new ParsedRecordingsMismatch("header is not JSON");
  }
  if (!Array.isArray(header?.fileSha256) || !Array.isArray(header.recordings)) throw new ParsedRecordingsMismatch("header lacks files or recordings");
  if (!READABLE_CODECS.has(header.codec)) throw new ParsedRecordingsMismatch(`codec ${header.codec}, expected ${PARSED_RECORDINGS_CODEC}`);
  if (header.algorithmVersion !== ALGORITHM_VERSION) throw new ParsedRecordingsMismatch(`parsed by ${header.algorithmVersion}, this is ${ALGORITHM_VERSION}`);
  if (header.fileSha256.length !== fileSha256.length || header.fileSha256.some((s, i) => s !== fileSha256[i])) {
    throw new ParsedRecordingsMismatch("parsed from other files than those stored for the session");
  }
  // Typed-array views need their element alignment; a buffer that does not start on 8 is copied once.
  const aligned = bytes.byteOffset % 8 === 0 ? bytes : new Uint8Array(bytes);
  let at = 12 + jsonLength + pad8(12 + jsonLength);
  const take = <T extends Float64Array | Float32Array | Int32Array>(Kind: { new (b: ArrayBufferLike, o: number, n: number): T; BYTES_PER_ELEMENT: number }, n: number): T => {
    const byteLength = n * Kind.BYTES_PER_ELEMENT;
    if (at + byteLength > aligned.length) throw new ParsedRecordingsMismatch("arrays run past the end");
    const out = new Kind(aligned.buffer, aligned.byteOffset + at, n);
    at += byteLength + pad8(byteLength);
    return out;
  };
  const recordings = header.recordings.map((h): SensorRecording => {
    const ticks = h.timeTicks;
    if (ticks !== undefined && !(Number.isSafeInteger(ticks.firstTick) && Number.isSafeInteger(ticks.perSecond) && ticks.perSecond > 0)) {
      throw new ParsedRecordingsMismatch("time ticks are not whole numbers");
    }
    const timeS = ticks === undefined ? take(Float64Array, h.samples) : timeFromTicks(take(Int32Array, h.samples), ticks.perSecond, ticks.firstTick);
    const [accX, accY, accZ, gyroX, gyroY, gyroZ] = CHANNELS32.map(() => take(Float32Array, h.samples)) as [Float32Array, Float32Array, Float32Array, Float32Array, Float32Array, Float32Array];
    return {
      fileName: h.fileName,
      deviceSerial: h.deviceSerial,
      placement: h.placement,
      nominalSampleRateHz: h.nominalSampleRateHz,
      startUtc: h.startUtc,
      timeS,
      accX,
      accY,
      accZ,
      gyroX,
      gyroY,
      gyroZ,
    };
  });
  if (at !== aligned.length) throw new ParsedRecordingsMismatch(`${aligned.length - at} bytes left over`);
  return { recordings, recordingFile: header.recordings.map((h) => h.file) };
}

function littleEndian(): boolean {
  return new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;
}

/** Key of a session's parsed recordings: under the session's own prefix, beside its raw files. */
export const parsedRecordingsKey = (patientId: string, sessionId: string) => `raw/${patientId}/${sessionId}/parsed-recordings`;
