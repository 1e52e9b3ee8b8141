import { createHash } from "node:crypto";
import { readUploadSet, uploadBaseName, type SensorRecording, type UploadFileError } from "@pendula/signal";
import { HttpError } from "../http-error";

/**
 * The pure half of an upload: bytes in, parsed recordings and digests out, or one 4xx naming the
 * file. Nothing here touches storage or the database, so a rejected upload cannot leave anything
 * behind.
 *
 * What a file is, how BIDS Motion sets are grouped and how each file is read is decided by signal's
 * readUploadSet alone (see signal/README.md), which the processing worker and the in-browser
 * pre-check call too; this module adds what only the server needs: digests and HTTP errors.
 */
export interface IncomingFile {
  originalName: string;
  buffer: Buffer;
}

export type StoredFormat = "pendula-csv-v1" | "bids-motion";

export interface ParsedFile {
  originalName: string;
  buffer: Buffer;
  sha256: string;
  format: StoredFormat;
  /** Index into `recordings` of the recordings this file carries (empty for BIDS sidecars). */
  recordingIndexes: number[];
  /** For BIDS files: the data file of the group (itself for `_motion.tsv`). */
  bidsMotionFile?: string;
}

export interface ParsedUpload {
  files: ParsedFile[];
  recordings: SensorRecording[];
  /** Index into `files` of the file each recording came from. */
  recordingFile: number[];
  /** sha256 over the sorted per-file sha256 digests (hex, newline-joined). */
  contentSha256: string;
}

export interface ParseUploadOptions {
  maxChars?: number;
  /** Clock time of the first sample of BIDS recordings (BIDS keeps it in *_scans.tsv acq_time). */
  bidsStartUtc?: string;
}

export const sha256Hex = (data: Buffer | string) => createHash("sha256").update(data).digest("hex");

export function contentDigest(fileDigests: readonly string[]): string {
  return sha256Hex([...fileDigests].sort().join("\n"));
}

export function invalidFile(fileName: string, message: string, details: Record<string, unknown> = {}): HttpError {
  return new HttpError(422, "invalid_file", message, { file: fileName, ...details });
}

/** Removes directories a browser or client may have put into the name. */
export const baseName = uploadBaseName;

/**
 * Files → recordings with signal's readUploadSet (the same grouping and readers as the worker and
 * the pre-check), refusing the whole upload with its first problem: a 400 for an empty upload, else
 * a 422 naming the file (and the line and column where the reader knows them).
 */
export function parseUpload(input: readonly IncomingFile[], options: ParseUploadOptions = {}): ParsedUpload {
  const set = readUploadSet(
    input.map((f) => ({ name: f.originalName, bytes: f.buffer })),
    { maxChars: options.maxChars, bidsStartUtc: options.bidsStartUtc, requireBidsStartUtc: true },
  );
  const first = set.errors[0];
  if (first) throw httpErrorOf(first);
  const files: ParsedFile[] = set.files.map((f, i) => ({
    originalName: f.name,
    buffer: input[i]!.buffer,
    sha256: sha256Hex(input[i]!.buffer),
    format: f.format ?? "pendula-csv-v1",
    recordingIndexes: f.recordingIndexes,
    ...(f.bidsMotionFile === undefined ? {} : { bidsMotionFile: f.bidsMotionFile }),
  }));
  return { files, recordings: set.recordings, recordingFile: set.recordingFile, contentSha256: contentDigest(files.map((f) => f.sha256)) };
}

export function httpErrorOf(error: UploadFileError): HttpError {
  if (error.code === "no-files") return new HttpError(400, "no_files", error.message);
  return invalidFile(error.file, error.message, {
    ...(error.line === undefined ? {} : { line: error.line }),
    ...(error.column === undefined ? {} : { column: error.column }),
  });
}
