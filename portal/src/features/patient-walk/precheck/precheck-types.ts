// What the in-browser pre-check reports. Plain data only: it crosses the Web Worker boundary.

export type PrecheckFormat = "pendula-csv-v1" | "bids-motion" | "bids-sidecar" | "unknown";

export interface PrecheckFile {
  fileName: string;
  sizeBytes: number;
  format: PrecheckFormat;
  /** True when the file was read into a recording (or is a BIDS sidecar that was used). */
  recognised: boolean;
  deviceSerial: string | null;
  /** From the file header when present. */
  placement: string | null;
  /** Seconds covered by this file's own samples. */
  durationS: number | null;
  /** Why this file could not be read, in the reader's words (file, line, column). */
  problem: string | null;
}

export interface PrecheckNotice {
  severity: "info" | "warning" | "error";
  /** Plain words for the person at home. */
  text: string;
  /** The analysis' own code and message, kept for the care team. */
  code: string;
  detail: string;
}

export type PrecheckVerdict = "ready" | "check" | "redo";

export interface PrecheckSummary {
  files: PrecheckFile[];
  placements: string[];
  durationS: number | null;
  /** Every stride found, and the steady ones the measurements use. */
  strideCount: number;
  steadyStrideCount: number;
  cadenceStepsPerMin: number | null;
  notices: PrecheckNotice[];
  verdict: PrecheckVerdict;
  /** Set when the files could not be analysed at all. */
  analysisProblem: string | null;
}

export interface PrecheckInputFile {
  name: string;
  sizeBytes: number;
  bytes: Uint8Array;
}

/** Where a running pre-check is, for the progress bar: 0–1 with words for the person waiting. */
export interface PrecheckProgress {
  stage: "reading" | "parsing" | "analysing";
  /** 1-based file being read, while reading. */
  fileNumber?: number;
  fileCount: number;
  fraction: number;
}

/** What the pre-check worker posts back: progress any number of times, then a summary or a failure. */
export type PrecheckWorkerMessage =
  | { kind: "progress"; progress: PrecheckProgress }
  | { kind: "done"; summary: PrecheckSummary }
  | { kind: "failed"; message: string };
