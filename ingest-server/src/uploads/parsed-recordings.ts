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
 *   arrays    per recording, in order: timeS (Float64), accX, accY, accZ, gyroX, gyroY, gyroZ
 *             (Float32), each the exact bytes the reader produced, each padded to 8 bytes
 *
 * The arrays are the reader's own bytes, not a re-encoding, so analysis input is bit-identical to
 * parsing the originals. The uploaded files stay the record of what was sent; this object is a
 * cache of their parse. The worker uses it only when its header names the same files (sha256, in
 * stored order), the same reader/analysis version and this codec's version; otherwise it reads the
 * originals (sessions stored before this existed, or reprocessed after an upgrade).
 */
const MAGIC = Buffer.from("PNDLREC\x01", "latin1");
export const PARSED_RECORDINGS_CODEC = 1;

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
  }>;
}

const CHANNELS32 = ["accX", "accY", "accZ", "gyroX", "gyroY", "gyroZ"] as const;
const pad8 = (n: number) => (8 - (n % 8)) % 8;

/** Writes the recordings to `path` (one pass, no copy of the sample arrays). */
export function writeParsedRecordings(path: string, recordings: readonly SensorRecording[], recordingFile: readonly number[], fileSha256: readonly string[]): void {
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
    for (const r of recordings) {
      for (const a of [r.timeS, ...CHANNELS32.map((c) => r[c])]) {
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
  if (header.codec !== PARSED_RECORDINGS_CODEC) throw new ParsedRecordingsMismatch(`codec ${header.codec}, expected ${PARSED_RECORDINGS_CODEC}`);
  if (header.algorithmVersion !== ALGORITHM_VERSION) throw new ParsedRecordingsMismatch(`parsed by ${header.algorithmVersion}, this is ${ALGORITHM_VERSION}`);
  if (header.fileSha256.length !== fileSha256.length || header.fileSha256.some((s, i) => s !== fileSha256[i])) {
    throw new ParsedRecordingsMismatch("parsed from other files than those stored for the session");
  }
  // Typed-array views need their element alignment; a buffer that does not start on 8 is copied once.
  const aligned = bytes.byteOffset % 8 === 0 ? bytes : new Uint8Array(bytes);
  let at = 12 + jsonLength + pad8(12 + jsonLength);
  const take = <T extends Float64Array | Float32Array>(Kind: { new (b: ArrayBufferLike, o: number, n: number): T; BYTES_PER_ELEMENT: number }, n: number): T => {
    const byteLength = n * Kind.BYTES_PER_ELEMENT;
    if (at + byteLength > aligned.length) throw new ParsedRecordingsMismatch("arrays run past the end");
    const out = new Kind(aligned.buffer, aligned.byteOffset + at, n);
    at += byteLength + pad8(byteLength);
    return out;
  };
  const recordings = header.recordings.map((h): SensorRecording => {
    const timeS = take(Float64Array, h.samples);
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
