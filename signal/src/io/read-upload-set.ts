import { type SensorRecording, SignalInputError } from "../types";
import { BIDS_DEFAULT_START_UTC, bidsSidecarNames } from "./read-bids-motion";
import { readBidsMotionBytes } from "./read-bids-motion-bytes";
import { readSensorCsvBytes } from "./read-sensor-csv-bytes";
import { type SniffedFormat, sniffFormat } from "./sniff";
import { UTF8, isWellFormedUtf8 } from "./utf8";

/** One file as it arrives: its name (a path is cut to the base name) and its bytes. */
export interface UploadFile {
  name: string;
  bytes: Uint8Array;
}

/** How a file is stored and what it holds: our CSV, or a member of a BIDS Motion set. */
export type UploadFileFormat = "pendula-csv-v1" | "bids-motion";

export type UploadFileRole = "pendula-csv-v1" | "bids-motion-tsv" | "bids-channels-tsv" | "bids-motion-json" | "unknown";

export interface UploadSetFile {
  /** Base name (no folders), as grouping and every message use it. */
  name: string;
  sizeBytes: number;
  /** From the content (never the extension); "unknown" also for a file that is not text. */
  role: UploadFileRole;
  format: UploadFileFormat | null;
  /** Indexes into `recordings` of the recordings this file carries (empty for BIDS sidecars). */
  recordingIndexes: number[];
  /** For the three files of a BIDS set that was read: its `_motion.tsv`. */
  bidsMotionFile?: string;
  /** The first problem found with this file, when there is one (also in `errors`). */
  error?: UploadFileError;
}

export interface UploadFileError {
  /** "no-files" only for an empty set; every other problem names its file. */
  code: "no-files" | "invalid-file";
  /** The file the message is about (a BIDS sidecar's own problem names the sidecar). */
  file: string;
  message: string;
  line?: number;
  column?: string;
}

export interface UploadSet {
  files: UploadSetFile[];
  /** Recordings ready for analyze(): our CSV files in file order, then each BIDS set's tracked points. */
  recordings: SensorRecording[];
  /** Index into `files` of the file each recording came from (a BIDS set's `_motion.tsv`). */
  recordingFile: number[];
  /**
   * Every problem, in the order the checks run: names, text, formats, CSV files, BIDS sets. A caller
   * that accepts all or nothing (the upload) reports `errors[0]`; the pre-check shows each file's.
   */
  errors: UploadFileError[];
}

export interface ReadUploadSetOptions {
  /** Largest data file, in characters (default MAX_SENSOR_FILE_CHARS). */
  maxChars?: number;
  /** Clock time of the first sample of a BIDS set (BIDS keeps it in *_scans.tsv acq_time), per set or for all. */
  bidsStartUtc?: string | ((motionFileName: string) => string | undefined);
  /** Refuse a BIDS set read without a clock time (the server needs it to find the device assignment). */
  requireBidsStartUtc?: boolean;
}

const SUFFIX: Record<"bids-motion-tsv" | "bids-channels-tsv" | "bids-motion-json", RegExp> = {
  "bids-motion-tsv": /_motion\.tsv$/i,
  "bids-channels-tsv": /_channels\.tsv$/i,
  "bids-motion-json": /_motion\.json$/i,
};


/** Removes directories a browser or client may have put into the name. */
export function uploadBaseName(name: string): string {
  const parts = name.split(/[\\/]/);
  return (parts[parts.length - 1] ?? "").trim() || "unnamed";
}

/**
 * Files → recordings for analyze(): the one place that decides what an upload holds, used by the
 * upload route, the processing worker and the in-browser pre-check, so the three cannot feed the
 * analysis different recordings.
 *
 * Formats are decided by content (sniffFormat on the first characters), never by extension. BIDS
 * Motion is the one format where names matter: the specification ties the three files of a
 * tracking system together by their shared entity stem, so the `_motion.tsv` / `_channels.tsv` /
 * `_motion.json` suffixes group them (case-insensitively). Data files are parsed from their bytes
 * (readSensorCsvBytes, readBidsMotionBytes); only the small sidecars become strings.
 *
 * Nothing is thrown for a bad file: each problem is returned in `errors` (and on its file), with the
 * messages the upload has always given, so one caller can refuse the whole set and another can show
 * every file's problem. A file with a problem is left out of later steps; the rest are still read.
 */
export function readUploadSet(input: readonly UploadFile[], options: ReadUploadSetOptions = {}): UploadSet {
  const errors: UploadFileError[] = [];
  const files: UploadSetFile[] = input.map((f) => ({
    name: uploadBaseName(f.name),
    sizeBytes: f.bytes.length,
    role: "unknown",
    format: null,
    recordingIndexes: [],
  }));
  const recordings: SensorRecording[] = [];
  const recordingFile: number[] = [];
  if (input.length === 0) {
    errors.push({ code: "no-files", file: "", message: "no files uploaded: send one or more sensor files in the multipart field `files`" });
    return { files, recordings, recordingFile, errors };
  }
  const problem = (i: number, message: string, at: Partial<Pick<UploadFileError, "line" | "column" | "file">> = {}): void => {
    const error: UploadFileError = { code: "invalid-file", file: at.file ?? files[i]!.name, message, ...pick(at) };
    errors.push(error);
    // A sidecar's own problem belongs to the sidecar, even when found while reading its data file.
    const owner = at.file === undefined ? i : files.findIndex((f) => f.name === at.file);
    const target = files[owner >= 0 ? owner : i]!;
    target.error ??= error;
  };
  const fromSignal = (i: number, err: unknown): void => {
    if (!(err instanceof SignalInputError)) throw err;
    problem(i, err.message, { file: err.fileName ?? files[i]!.name, line: err.line, column: err.column });
  };

  // 1. One name once: a second file of the same name would replace the first in storage.
  const seen = new Set<string>();
  files.forEach((f, i) => {
    const key = f.name.toLowerCase();
    if (seen.has(key)) problem(i, `${f.name}: the same file name appears twice in one upload`);
    seen.add(key);
  });

  // 2. Plain UTF-8 text only (binary, archives, images are refused), BOM set aside.
  const body: Uint8Array[] = input.map((f) => f.bytes);
  files.forEach((f, i) => {
    if (f.error) return;
    const bytes = input[i]!.bytes;
    if (bytes.length === 0) return problem(i, `${f.name}: file is empty`);
    // A NUL byte never occurs in CSV, TSV or JSON text; zip, gzip and images contain them early.
    const nul = bytes.subarray(0, 65536).indexOf(0);
    if (nul >= 0) return problem(i, `${f.name}: binary content (byte ${nul} is NUL); expected a text sensor file`);
    if (!isWellFormedUtf8(bytes)) return problem(i, `${f.name}: not UTF-8 text`);
    body[i] = bytes.length >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? bytes.subarray(3) : bytes;
  });

  // 3. Format by content; BIDS members must be named as the specification requires and group by stem.
  const groups = new Map<string, { motion?: number; channels?: number; json?: number }>();
  files.forEach((f, i) => {
    if (f.error) return;
    const kind = sniffBytes(body[i]!);
    f.role = kind;
    if (kind === "unknown") {
      return problem(i, `${f.name}: unrecognised content; expected a Pendula sensor CSV (first line "# pendula-sensor: 1") or a BIDS Motion file set`);
    }
    if (kind === "pendula-csv-v1") {
      f.format = "pendula-csv-v1";
      return;
    }
    if (!SUFFIX[kind].test(f.name)) {
      const wanted = kind === "bids-motion-tsv" ? "_motion.tsv" : kind === "bids-channels-tsv" ? "_channels.tsv" : "_motion.json";
      return problem(i, `${f.name}: content is a BIDS Motion ${kind.replace("bids-", "")} file, so its name must end in ${wanted}`);
    }
    const stem = f.name.replace(SUFFIX[kind], "").toLowerCase();
    const group = groups.get(stem) ?? {};
    if (kind === "bids-motion-tsv") group.motion = i;
    else if (kind === "bids-channels-tsv") group.channels = i;
    else group.json = i;
    groups.set(stem, group);
  });

  // 4. Our CSV files, each on its own.
  files.forEach((f, i) => {
    if (f.error || f.role !== "pendula-csv-v1") return;
    try {
      const recording = readSensorCsvBytes(body[i]!, f.name, { maxChars: options.maxChars });
      f.recordingIndexes.push(recordings.length);
      recordings.push(recording);
      recordingFile.push(i);
    } catch (err) {
      fromSignal(i, err);
    }
  });

  // 5. BIDS sets: every member present, then the data file read against its sidecars.
  for (const group of groups.values()) {
    const anyIndex = (group.motion ?? group.channels ?? group.json)!;
    if (group.motion === undefined) {
      problem(anyIndex, `${files[anyIndex]!.name}: BIDS Motion sidecar without its _motion.tsv data file in the same upload`);
      continue;
    }
    const m = group.motion;
    const motionName = files[m]!.name;
    const sidecars = bidsSidecarNames(motionName);
    if (group.channels === undefined) {
      problem(m, `${motionName}: missing ${sidecars.channels} in the same upload`);
      continue;
    }
    if (group.json === undefined) {
      problem(m, `${motionName}: missing ${sidecars.json} in the same upload`);
      continue;
    }
    const startUtc = typeof options.bidsStartUtc === "function" ? options.bidsStartUtc(motionName) : options.bidsStartUtc;
    let setRecordings: SensorRecording[];
    try {
      setRecordings = readBidsMotionBytes({
        motionTsv: body[m]!,
        motionFileName: motionName,
        channelsTsv: UTF8.decode(body[group.channels]!),
        channelsFileName: files[group.channels]!.name,
        motionJson: UTF8.decode(body[group.json]!),
        jsonFileName: files[group.json]!.name,
        startUtc,
        maxChars: options.maxChars,
      });
    } catch (err) {
      fromSignal(m, err);
      continue;
    }
    if (options.requireBidsStartUtc && !startUtc && setRecordings.some((r) => r.startUtc === BIDS_DEFAULT_START_UTC)) {
      // Without a clock time the device assignment active at the recording cannot be found.
      problem(m, `${motionName}: BIDS Motion data carries no acquisition time; send the form field startUtc (ISO 8601 UTC of the first sample)`);
      continue;
    }
    if (setRecordings.length === 0) {
      problem(m, `${motionName}: no tracked point carries ACCEL and GYRO x, y and z channels`);
      continue;
    }
    for (const i of [m, group.channels, group.json]) {
      files[i]!.format = "bids-motion";
      files[i]!.bidsMotionFile = motionName;
    }
    for (const recording of setRecordings) {
      files[m]!.recordingIndexes.push(recordings.length);
      recordings.push(recording);
      recordingFile.push(m);
    }
  }

  return { files, recordings, recordingFile, errors };
}

/**
 * sniffFormat on the text well-formed UTF-8 bytes stand for. It looks at the first 4096 UTF-16
 * units, which lie within the first 16 KiB (at most 4 bytes per unit), so only those are decoded.
 */
function sniffBytes(bytes: Uint8Array): SniffedFormat {
  return sniffFormat(UTF8.decode(bytes.subarray(0, 4 * 4096)));
}

function pick(at: Partial<Pick<UploadFileError, "line" | "column">>): Partial<Pick<UploadFileError, "line" | "column">> {
  return { ...(at.line === undefined ? {} : { line: at.line }), ...(at.column === undefined ? {} : { column: at.column }) };
}
