import { readFile } from "node:fs/promises";
import type { Placement } from "@pendula/signal";
import { HttpError } from "../http-error";
import { parseUpload, type StoredFormat } from "./parse-upload";
import { writeParsedRecordings } from "./parsed-recordings";

/**
 * One upload's parse, as run inside a parse thread: the files are read from the request's private
 * folder and handed to the upload's own parser (`parseUpload`), so messages and status codes are
 * exactly those of the sessions route. Only what the request goes on to use crosses back to the
 * main thread — names, digests, formats and each recording's serial, placement and start time. The
 * samples do not cross: with `parsedPath` the thread writes them to that file (parsed-recordings.ts)
 * for the processing worker, so the main thread never holds megabytes of typed arrays.
 */
export interface ParseJob {
  files: Array<{ originalName: string; path: string }>;
  maxChars: number;
  bidsStartUtc?: string;
  /** Where to write the parsed recordings (in the request's private folder); nothing is written if absent or if the upload is refused. */
  parsedPath?: string;
}

export interface ParsedFileSummary {
  /** Base name as parseUpload normalised it. */
  originalName: string;
  /** Where the bytes are on disk (the request's private folder). */
  path: string;
  sizeBytes: number;
  sha256: string;
  format: StoredFormat;
  recordingIndexes: number[];
  bidsMotionFile?: string;
}

export interface RecordingSummary {
  fileName: string;
  deviceSerial: string;
  placement: Placement | null;
  startUtc: string;
}

export interface UploadSummary {
  files: ParsedFileSummary[];
  recordings: RecordingSummary[];
  recordingFile: number[];
  contentSha256: string;
}

/** An HttpError as plain data, so it survives the thread boundary (structured clone drops classes). */
export interface HttpErrorData {
  status: number;
  code: string;
  message: string;
  details?: unknown;
}

export type ParseReply = { ok: true; summary: UploadSummary } | { ok: false; httpError: HttpErrorData } | { ok: false; error: string };

export async function runParseJob(job: ParseJob): Promise<UploadSummary> {
  const incoming = await Promise.all(job.files.map(async (f) => ({ originalName: f.originalName, buffer: await readFile(f.path) })));
  const parsed = parseUpload(incoming, { maxChars: job.maxChars, bidsStartUtc: job.bidsStartUtc });
  if (job.parsedPath) writeParsedRecordings(job.parsedPath, parsed.recordings, parsed.recordingFile, parsed.files.map((f) => f.sha256));
  return {
    files: parsed.files.map((f, i) => ({
      originalName: f.originalName,
      path: job.files[i]!.path,
      sizeBytes: f.buffer.length,
      sha256: f.sha256,
      format: f.format,
      recordingIndexes: f.recordingIndexes,
      ...(f.bidsMotionFile === undefined ? {} : { bidsMotionFile: f.bidsMotionFile }),
    })),
    recordings: parsed.recordings.map((r) => ({ fileName: r.fileName, deviceSerial: r.deviceSerial, placement: r.placement, startUtc: r.startUtc })),
    recordingFile: parsed.recordingFile,
    contentSha256: parsed.contentSha256,
  };
}

/** runParseJob's outcome as a message: a 4xx keeps its status, code and details across threads. */
export async function parseReply(job: ParseJob): Promise<ParseReply> {
  try {
    return { ok: true, summary: await runParseJob(job) };
  } catch (err) {
    if (err instanceof HttpError) return { ok: false, httpError: { status: err.status, code: err.code, message: err.message, details: err.details } };
    return { ok: false, error: err instanceof Error ? (err.stack ?? err.message) : String(err) };
  }
}

export function httpErrorFrom(data: HttpErrorData): HttpError {
  return new HttpError(data.status, data.code, data.message, data.details);
}
