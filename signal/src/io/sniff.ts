import { SENSOR_CSV_MAGIC } from "./read-sensor-csv";

export type SniffedFormat = "pendula-csv-v1" | "bids-motion-tsv" | "bids-channels-tsv" | "bids-motion-json" | "unknown";

/**
 * Guesses the format of a text from its first characters only (cheap enough for the portal's
 * drop zone): our CSV starts with its magic comment; a BIDS channels file has a tab-separated header
 * containing `tracked_point`; a motion sidecar is a JSON object mentioning SamplingFrequency; a BIDS
 * motion data file is tab-separated numbers (or n/a) without a header.
 */
export function sniffFormat(text: string): SniffedFormat {
  const head = text.slice(0, 4096).replace(/^\uFEFF/, "");
  const firstLine = head.split(/\r?\n/, 1)[0] ?? "";
  if (firstLine.startsWith(SENSOR_CSV_MAGIC)) return "pendula-csv-v1";
  const trimmed = head.trimStart();
  if (trimmed.startsWith("{") && head.includes('"SamplingFrequency"')) return "bids-motion-json";
  const cells = firstLine.split("\t").map((c) => c.trim().toLowerCase());
  if (cells.includes("tracked_point") && cells.includes("name")) return "bids-channels-tsv";
  if (cells.length >= 2 && cells.every((c) => c === "n/a" || /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(c))) {
    return "bids-motion-tsv";
  }
  return "unknown";
}
