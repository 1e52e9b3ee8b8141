import { createHash } from "node:crypto";
import {
  BIDS_DEFAULT_START_UTC,
  bidsSidecarNames,
  readBidsMotion,
  readSensorCsv,
  sniffFormat,
  SignalInputError,
  type SensorRecording,
} from "@pendula/signal";
import { HttpError } from "../../http-error";

/**
 * The pure half of an upload: bytes in, parsed recordings and digests out, or one 4xx naming the
 * file. Nothing here touches storage or the database, so a rejected upload cannot leave anything
 * behind.
 *
 * Formats are decided by content (signal's sniffFormat), never by extension. BIDS Motion is the one
 * format where names matter: the specification ties the three files of a tracking system together by
 * their shared entity stem, so the `_motion.tsv` / `_channels.tsv` / `_motion.json` suffixes group them.
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

function fromSignalError(err: SignalInputError, fallbackFile: string): HttpError {
  return invalidFile(err.fileName ?? fallbackFile, err.message, {
    ...(err.line === undefined ? {} : { line: err.line }),
    ...(err.column === undefined ? {} : { column: err.column }),
  });
}

const utf8 = new TextDecoder("utf-8", { fatal: true });

/** Bytes → text, refusing what is not plain UTF-8 text (binary, archives, images…). */
export function decodeText(file: IncomingFile): string {
  if (file.buffer.length === 0) throw invalidFile(file.originalName, `${file.originalName}: file is empty`);
  // A NUL byte never occurs in CSV, TSV or JSON text; zip, gzip and images contain them early.
  const nul = file.buffer.subarray(0, 65536).indexOf(0);
  if (nul >= 0) throw invalidFile(file.originalName, `${file.originalName}: binary content (byte ${nul} is NUL); expected a text sensor file`);
  try {
    return utf8.decode(file.buffer);
  } catch {
    throw invalidFile(file.originalName, `${file.originalName}: not UTF-8 text`);
  }
}

const SUFFIX: Record<"bids-motion-tsv" | "bids-channels-tsv" | "bids-motion-json", RegExp> = {
  "bids-motion-tsv": /_motion\.tsv$/i,
  "bids-channels-tsv": /_channels\.tsv$/i,
  "bids-motion-json": /_motion\.json$/i,
};

/** Removes directories a browser or client may have put into the name. */
export function baseName(name: string): string {
  const parts = name.split(/[\\/]/);
  return (parts[parts.length - 1] ?? "").trim() || "unnamed";
}

export function parseUpload(input: readonly IncomingFile[], options: ParseUploadOptions = {}): ParsedUpload {
  if (input.length === 0) throw new HttpError(400, "no_files", "no files uploaded: send one or more sensor files in the multipart field `files`");
  const files = input.map((f) => ({ ...f, originalName: baseName(f.originalName) }));
  const seen = new Set<string>();
  for (const f of files) {
    const key = f.originalName.toLowerCase();
    if (seen.has(key)) throw invalidFile(f.originalName, `${f.originalName}: the same file name appears twice in one upload`);
    seen.add(key);
  }

  const texts = files.map(decodeText);
  const kinds = texts.map(sniffFormat);
  const recordings: SensorRecording[] = [];
  const recordingFile: number[] = [];
  const parsed: ParsedFile[] = files.map((f) => ({
    originalName: f.originalName,
    buffer: f.buffer,
    sha256: sha256Hex(f.buffer),
    format: "pendula-csv-v1",
    recordingIndexes: [],
  }));

  // BIDS groups by stem; every member must be present and named as the specification requires.
  const groups = new Map<string, { motion?: number; channels?: number; json?: number }>();
  kinds.forEach((kind, i) => {
    const name = files[i]!.originalName;
    if (kind === "unknown") {
      throw invalidFile(name, `${name}: unrecognised content; expected a Pendula sensor CSV (first line "# pendula-sensor: 1") or a BIDS Motion file set`);
    }
    if (kind === "pendula-csv-v1") return;
    if (!SUFFIX[kind].test(name)) {
      const wanted = kind === "bids-motion-tsv" ? "_motion.tsv" : kind === "bids-channels-tsv" ? "_channels.tsv" : "_motion.json";
      throw invalidFile(name, `${name}: content is a BIDS Motion ${kind.replace("bids-", "")} file, so its name must end in ${wanted}`);
    }
    const stem = name.replace(SUFFIX[kind], "").toLowerCase();
    const group = groups.get(stem) ?? {};
    if (kind === "bids-motion-tsv") group.motion = i;
    else if (kind === "bids-channels-tsv") group.channels = i;
    else group.json = i;
    groups.set(stem, group);
  });

  files.forEach((f, i) => {
    if (kinds[i] !== "pendula-csv-v1") return;
    try {
      const recording = readSensorCsv(texts[i]!, f.originalName, { maxChars: options.maxChars });
      parsed[i]!.recordingIndexes.push(recordings.length);
      recordings.push(recording);
      recordingFile.push(i);
    } catch (err) {
      if (err instanceof SignalInputError) throw fromSignalError(err, f.originalName);
      throw err;
    }
  });

  for (const group of groups.values()) {
    const anyIndex = (group.motion ?? group.channels ?? group.json)!;
    const anyName = files[anyIndex]!.originalName;
    if (group.motion === undefined) {
      throw invalidFile(anyName, `${anyName}: BIDS Motion sidecar without its _motion.tsv data file in the same upload`);
    }
    const motionName = files[group.motion]!.originalName;
    const sidecars = bidsSidecarNames(motionName);
    if (group.channels === undefined) throw invalidFile(motionName, `${motionName}: missing ${sidecars.channels} in the same upload`);
    if (group.json === undefined) throw invalidFile(motionName, `${motionName}: missing ${sidecars.json} in the same upload`);
    let groupRecordings: SensorRecording[];
    try {
      groupRecordings = readBidsMotion({
        motionTsv: texts[group.motion]!,
        motionFileName: motionName,
        channelsTsv: texts[group.channels]!,
        channelsFileName: files[group.channels]!.originalName,
        motionJson: texts[group.json]!,
        jsonFileName: files[group.json]!.originalName,
        startUtc: options.bidsStartUtc,
        maxChars: options.maxChars,
      });
    } catch (err) {
      if (err instanceof SignalInputError) throw fromSignalError(err, motionName);
      throw err;
    }
    if (!options.bidsStartUtc && groupRecordings.some((r) => r.startUtc === BIDS_DEFAULT_START_UTC)) {
      // Without a clock time the device assignment active at the recording cannot be found.
      throw invalidFile(motionName, `${motionName}: BIDS Motion data carries no acquisition time; send the form field startUtc (ISO 8601 UTC of the first sample)`);
    }
    if (groupRecordings.length === 0) {
      throw invalidFile(motionName, `${motionName}: no tracked point carries ACCEL and GYRO x, y and z channels`);
    }
    for (const i of [group.motion, group.channels, group.json]) {
      parsed[i]!.format = "bids-motion";
      parsed[i]!.bidsMotionFile = motionName;
    }
    for (const recording of groupRecordings) {
      parsed[group.motion]!.recordingIndexes.push(recordings.length);
      recordings.push(recording);
      recordingFile.push(group.motion);
    }
  }

  return { files: parsed, recordings, recordingFile, contentSha256: contentDigest(parsed.map((f) => f.sha256)) };
}
