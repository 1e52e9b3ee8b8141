import { type SensorRecording, SignalInputError } from "../types";
import { parseDecimal } from "./parse-number";
import { placementFromLabel } from "./placement-names";
import { rowCapacity } from "./row-capacity";
import { MAX_SENSOR_FILE_CHARS, STANDARD_GRAVITY_M_S2, parseUtc } from "./read-sensor-csv";

/** The three texts of one BIDS Motion tracking system (BIDS specification, motion data). */
export interface BidsMotionTexts {
  /** `*_motion.tsv`: no header row; one column per row of the channels file. */
  motionTsv: string;
  motionFileName: string;
  /** `*_channels.tsv`: header row with at least name, component, type, tracked_point, units. */
  channelsTsv: string;
  channelsFileName: string;
  /** `*_motion.json`: needs SamplingFrequency (a number). */
  motionJson: string;
  jsonFileName: string;
  /**
   * Clock time of the first sample. BIDS keeps it in `*_scans.tsv` (acq_time), which is not part of
   * these texts; without it the recordings start at BIDS_DEFAULT_START_UTC (a placeholder).
   */
  startUtc?: string;
  maxChars?: number;
}

/** Placeholder clock for BIDS data without acq_time (the date BIDS tooling uses when shifting dates). */
export const BIDS_DEFAULT_START_UTC = "1800-01-01T00:00:00.000Z";

const REQUIRED_CHANNEL_COLUMNS = ["name", "component", "type", "tracked_point", "units"] as const;
const ACC_UNITS: Record<string, number> = { "m/s^2": 1, "m/s2": 1, "m/s²": 1, "g": STANDARD_GRAVITY_M_S2 };
const GYRO_UNITS: Record<string, number> = { "rad/s": 180 / Math.PI, "deg/s": 1, "°/s": 1 };
const LATENCY_UNITS: Record<string, number> = { s: 1, ms: 1e-3 };

interface Channel {
  name: string;
  component: string;
  type: string;
  trackedPoint: string;
  units: string;
  line: number;
}

/**
 * Reads one BIDS Motion tracking system into one SensorRecording per tracked point that carries
 * ACCEL and GYRO x/y/z channels. Tracked points map to placements through TRACKED_POINT_ALIASES
 * (case- and separator-insensitive); an unknown tracked point yields placement null, which the
 * analysis reports as `missing-placement`. Samples with a missing value (`n/a`) in any of a tracked
 * point's six channels are dropped, which the time base then treats as a gap. Time comes from a
 * LATENCY channel when present, else from SamplingFrequency.
 */
export function readBidsMotion(input: BidsMotionTexts): SensorRecording[] {
  const layout = readBidsSidecars(input);
  const fail = bidsFail;
  const maxChars = input.maxChars ?? MAX_SENSOR_FILE_CHARS;

  // --- motion.tsv (headerless) ---
  const text = input.motionTsv;
  if (text.length > maxChars) {
    fail(input.motionFileName, undefined, undefined, `file is larger than the ${Math.round(maxChars / 1048576)} MiB limit`);
  }
  if (text.trim() === "") fail(input.motionFileName, 1, undefined, "file is empty");
  const nCols = layout.channels.length;
  // A row holds nCols − 1 tabs and a value (a number or n/a) in every cell.
  const capacity = rowCapacity(text, 0, 2 * nCols - 1);
  const rows = new BidsRows(layout, input.motionFileName, capacity);
  let pos = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  let lineNo = 0;
  while (pos < text.length) {
    let end = text.indexOf("\n", pos);
    if (end < 0) end = text.length;
    lineNo++;
    let lineEnd = end;
    if (lineEnd > pos && text.charCodeAt(lineEnd - 1) === 13) lineEnd--;
    rows.readLine(text, pos, lineEnd, lineNo);
    pos = end + 1;
  }
  return rows.finish(lineNo);
}

/** The JSON sidecar and channels.tsv of one tracking system, checked: what the data rows are read against. */
export interface BidsLayout {
  channels: Channel[];
  usable: TrackedPoint[];
  latencyCol: number;
  latencyScale: number;
  sampleRateHz: number;
  serial: string;
  system: string;
  startUtc: string;
}

interface TrackedPoint {
  label: string;
  cols: Int32Array;
  scale: Float64Array;
}

/** Throws the reader's SignalInputError: "<file>: line L, column C: reason". */
export function bidsFail(file: string, line: number | undefined, column: string | undefined, reason: string): never {
  const where = [line === undefined ? null : `line ${line}`, column === undefined ? null : `column ${column}`]
    .filter(Boolean)
    .join(", ");
  throw new SignalInputError(`${file}${where ? `: ${where}` : ""}: ${reason}`, file, line, column);
}

/** Reads and checks the two sidecars (JSON first, then channels.tsv), as both motion readers do before any data row. */
export function readBidsSidecars(input: Omit<BidsMotionTexts, "motionTsv">): BidsLayout {
  const fail = bidsFail;
  // --- sidecar JSON ---
  let meta: unknown;
  try {
    meta = JSON.parse(input.motionJson);
  } catch (e) {
    return fail(input.jsonFileName, undefined, undefined, `not valid JSON (${(e as Error).message})`);
  }
  if (typeof meta !== "object" || meta === null || Array.isArray(meta)) {
    return fail(input.jsonFileName, undefined, undefined, "must be a JSON object");
  }
  const json = meta as Record<string, unknown>;
  const fs = json["SamplingFrequency"];
  if (typeof fs !== "number" || !(fs > 0 && fs <= 10_000)) {
    fail(input.jsonFileName, undefined, "SamplingFrequency", "SamplingFrequency must be a number in (0, 10000] Hz");
  }
  const sampleRateHz = fs as number;
  const system = typeof json["TrackingSystemName"] === "string" ? (json["TrackingSystemName"] as string) : "bids";
  const serial = typeof json["DeviceSerialNumber"] === "string" ? (json["DeviceSerialNumber"] as string) : "";
  let startUtc = BIDS_DEFAULT_START_UTC;
  if (input.startUtc !== undefined) {
    const parsed = parseUtc(input.startUtc);
    if (parsed === null) fail(input.motionFileName, undefined, undefined, `start time "${input.startUtc}" is not ISO 8601 UTC`);
    startUtc = parsed!;
  }

  // --- channels.tsv ---
  const channelLines = input.channelsTsv.replace(/^\uFEFF/, "").split(/\r?\n/);
  if (channelLines.every((l) => l.trim() === "")) fail(input.channelsFileName, 1, undefined, "file is empty");
  const head = channelLines[0]!.split("\t").map((s) => s.trim().toLowerCase());
  const colIndex = new Map(head.map((h, i) => [h, i]));
  for (const c of REQUIRED_CHANNEL_COLUMNS) {
    if (!colIndex.has(c)) fail(input.channelsFileName, 1, c, `required column "${c}" is missing`);
  }
  const channels: Channel[] = [];
  for (let i = 1; i < channelLines.length; i++) {
    const line = channelLines[i]!;
    if (line.trim() === "") continue;
    const cells = line.split("\t");
    if (cells.length !== head.length) {
      fail(input.channelsFileName, i + 1, undefined, `expected ${head.length} cells, found ${cells.length}`);
    }
    const get = (c: string) => (cells[colIndex.get(c)!] ?? "").trim();
    channels.push({
      name: get("name"),
      component: get("component").toLowerCase(),
      type: get("type").toUpperCase(),
      trackedPoint: get("tracked_point"),
      units: get("units").toLowerCase(),
      line: i + 1,
    });
  }
  if (channels.length === 0) fail(input.channelsFileName, 2, undefined, "no channel rows");

  // Group ACCEL/GYRO x/y/z by tracked point.
  const points = new Map<string, { label: string; cols: Int32Array; scale: Float64Array }>();
  let latencyCol = -1;
  let latencyScale = 1;
  channels.forEach((c, col) => {
    if (c.type === "LATENCY" && latencyCol < 0) {
      const s = LATENCY_UNITS[c.units];
      if (s === undefined) fail(input.channelsFileName, c.line, "units", `unknown LATENCY unit "${c.units}" (use s or ms)`);
      latencyCol = col;
      latencyScale = s!;
      return;
    }
    if (c.type !== "ACCEL" && c.type !== "GYRO") return;
    const axis = ["x", "y", "z"].indexOf(c.component);
    if (axis < 0) return;
    const table = c.type === "ACCEL" ? ACC_UNITS : GYRO_UNITS;
    const scale = table[c.units];
    if (scale === undefined) {
      fail(input.channelsFileName, c.line, "units", `unknown ${c.type} unit "${c.units}" for channel ${c.name}`);
    }
    const key = c.trackedPoint.toLowerCase();
    let p = points.get(key);
    if (!p) {
      p = { label: c.trackedPoint, cols: new Int32Array(6).fill(-1), scale: new Float64Array(6) };
      points.set(key, p);
    }
    const slot = (c.type === "ACCEL" ? 0 : 3) + axis;
    if (p.cols[slot]! >= 0) fail(input.channelsFileName, c.line, "component", `duplicate ${c.type} ${c.component} for ${c.trackedPoint}`);
    p.cols[slot] = col;
    p.scale[slot] = scale!;
  });
  const usable = [...points.values()].filter((p) => {
    const hasAcc = p.cols[0]! >= 0 || p.cols[1]! >= 0 || p.cols[2]! >= 0;
    const hasGyro = p.cols[3]! >= 0 || p.cols[4]! >= 0 || p.cols[5]! >= 0;
    return hasAcc || hasGyro;
  });
  if (usable.length === 0) fail(input.channelsFileName, undefined, undefined, "no ACCEL or GYRO x/y/z channels");
  for (const p of usable) {
    const names = ["ACCEL x", "ACCEL y", "ACCEL z", "GYRO x", "GYRO y", "GYRO z"];
    for (let k = 0; k < 6; k++) {
      if (p.cols[k]! < 0) {
        fail(input.channelsFileName, undefined, "type", `tracked point ${p.label} has no ${names[k]} channel (gyroscope and accelerometer x/y/z are required)`);
      }
    }
  }
  return { channels, usable, latencyCol, latencyScale, sampleRateHz, serial, system, startUtc };
}

/**
 * The data rows of one motion file, read line by line into one column per channel, with the
 * checks and messages both readers share; `finish` turns them into recordings.
 */
export class BidsRows {
  private data: Float64Array[];
  private room: number;
  private rows = 0;
  private prevLatency = Number.NEGATIVE_INFINITY;

  constructor(
    private readonly layout: BidsLayout,
    private readonly fileName: string,
    capacity: number,
  ) {
    this.room = capacity;
    this.data = Array.from({ length: layout.channels.length }, () => new Float64Array(capacity));
  }

  /** The column arrays and the next row index, for a scanner that fills a plain row itself (then calls `commit`). */
  get columns(): Float64Array[] {
    return this.data;
  }

  get count(): number {
    return this.rows;
  }

  /** Rows the column arrays hold; a reader that sized them from a sample calls `widen` when full. */
  get capacity(): number {
    return this.room;
  }

  /** Twice the room (at least one row), the rows so far copied: `columns` are new arrays after it. */
  widen(): void {
    this.room = Math.max(1, this.room * 2);
    this.data = this.data.map((a) => {
      const b = new Float64Array(this.room);
      b.set(a.subarray(0, this.rows));
      return b;
    });
  }

  /** One line, text[pos, lineEnd) without its line break: skipped when blank, else read or refused. */
  readLine(text: string, pos: number, lineEnd: number, lineNo: number): void {
    if (text.slice(pos, lineEnd).trim() === "") return;
    const { channels } = this.layout;
    const nCols = channels.length;
    const fileName = this.fileName;
    const data = this.data;
    const rows = this.rows;
    let cellStart = pos;
    for (let col = 0; col < nCols; col++) {
      const tab = text.indexOf("\t", cellStart);
      const cellEnd = col === nCols - 1 ? lineEnd : tab;
      if (cellEnd < 0 || cellEnd > lineEnd) {
        bidsFail(fileName, lineNo, channels[col]!.name, `expected ${nCols} cells (one per channels.tsv row), found ${col + 1}`);
      }
      if (col === nCols - 1 && tab >= 0 && tab < lineEnd) {
        bidsFail(fileName, lineNo, undefined, `expected ${nCols} cells (one per channels.tsv row), found more`);
      }
      let v = parseDecimal(text, cellStart, cellEnd);
      if (Number.isNaN(v)) {
        const cell = text.slice(cellStart, cellEnd).trim();
        if (cell === "n/a" || cell.toLowerCase() === "nan") v = Number.NaN;
        else bidsFail(fileName, lineNo, channels[col]!.name, `"${cell}" is not a number`);
      }
      data[col]![rows] = v;
      cellStart = cellEnd + 1;
    }
    this.commit(lineNo);
  }

  /** Ends the row just written into `columns`: the latency checks, then the next row. */
  commit(lineNo: number): void {
    const { latencyCol, channels } = this.layout;
    if (latencyCol >= 0) {
      const t = this.data[latencyCol]![this.rows]!;
      if (Number.isNaN(t)) bidsFail(this.fileName, lineNo, channels[latencyCol]!.name, "latency is missing");
      if (!(t > this.prevLatency)) bidsFail(this.fileName, lineNo, channels[latencyCol]!.name, `time ${t} does not increase`);
      this.prevLatency = t;
    }
    this.rows++;
  }

  /** One recording per usable tracked point; `lastLineNo` names the end of a file without rows. */
  finish(lastLineNo: number): SensorRecording[] {
    const { usable, channels, latencyCol, latencyScale, sampleRateHz, serial, system, startUtc } = this.layout;
    const { data, rows, fileName } = this;
    if (rows === 0) bidsFail(fileName, lastLineNo, undefined, "no data rows");
    return usable.map((p) => {
      const timeS = new Float64Array(rows);
      const out = Array.from({ length: 6 }, () => new Float32Array(rows));
      const latency = latencyCol >= 0 ? data[latencyCol]! : null;
      const cols = Array.from({ length: 6 }, (_, k) => data[p.cols[k]!]!);
      const m = completeSamples(cols, p.scale, latency, latencyScale, sampleRateHz, rows, timeS, out);
      if (m < 0) {
        const k = (-1 - m) % 6;
        const r = Math.floor((-1 - m) / 6);
        bidsFail(fileName, undefined, channels[p.cols[k]!]!.name, `value ${cols[k]![r]} is beyond any sensor's range`);
      }
      if (m === 0) bidsFail(fileName, undefined, undefined, `tracked point ${p.label} has no complete samples`);
      return {
        fileName: `${fileName} [${p.label}]`,
        deviceSerial: serial ? `${serial}:${p.label}` : `${system}:${p.label}`,
        placement: placementFromLabel(p.label),
        nominalSampleRateHz: sampleRateHz,
        startUtc,
        timeS: timeS.subarray(0, m),
        accX: out[0]!.subarray(0, m),
        accY: out[1]!.subarray(0, m),
        accZ: out[2]!.subarray(0, m),
        gyroX: out[3]!.subarray(0, m),
        gyroY: out[4]!.subarray(0, m),
        gyroZ: out[5]!.subarray(0, m),
      };
    });
  }
}

/**
 * A tracked point's rows with all six values (a row with n/a in any is dropped, which the time base
 * treats as a gap), scaled to m/s² and deg/s in single precision, time from the LATENCY column or
 * the row number. Returns the number of samples, or −1 − (k + 6·r) when channel k of row r is the
 * first to overflow single precision (the caller names it). A function of its own that ends with its loop (see readRows in read-sensor-csv-window.ts).
 */
function completeSamples(
  cols: Float64Array[],
  scale: Float64Array,
  latency: Float64Array | null,
  latencyScale: number,
  sampleRateHz: number,
  rows: number,
  timeS: Float64Array,
  out: Float32Array[],
): number {
  const [a0, a1, a2, a3, a4, a5] = cols as [Float64Array, Float64Array, Float64Array, Float64Array, Float64Array, Float64Array];
  const [o0, o1, o2, o3, o4, o5] = out as [Float32Array, Float32Array, Float32Array, Float32Array, Float32Array, Float32Array];
  const s0 = scale[0]!;
  const s1 = scale[1]!;
  const s2 = scale[2]!;
  const s3 = scale[3]!;
  const s4 = scale[4]!;
  const s5 = scale[5]!;
  let m = 0;
  for (let r = 0; r < rows; r++) {
    const v0 = a0[r]!;
    const v1 = a1[r]!;
    const v2 = a2[r]!;
    const v3 = a3[r]!;
    const v4 = a4[r]!;
    const v5 = a5[r]!;
    // NaN (n/a) in any channel: x − x is NaN only for NaN among these finite-or-NaN doubles.
    if (Number.isNaN(v0 - v0 + v1 - v1 + v2 - v2 + v3 - v3 + v4 - v4 + v5 - v5)) continue;
    timeS[m] = latency !== null ? latency[r]! * latencyScale : r / sampleRateHz;
    o0[m] = v0 * s0;
    o1[m] = v1 * s1;
    o2[m] = v2 * s2;
    o3[m] = v3 * s3;
    o4[m] = v4 * s4;
    o5[m] = v5 * s5;
    // Stored in single precision: a value beyond its range would become Infinity.
    const sum = o0[m]! + o1[m]! + o2[m]! + o3[m]! + o4[m]! + o5[m]!;
    if (sum - sum !== 0) {
      for (let k = 0; k < 6; k++) if (!Number.isFinite(out[k]![m]!)) return -1 - (k + 6 * r);
    }
    m++;
  }
  return m;
}

/** Sidecar names BIDS gives a `*_motion.tsv`: same entities, `_channels.tsv` and `_motion.json`. */
export function bidsSidecarNames(motionFileName: string): { channels: string; json: string } {
  if (!/_motion\.tsv$/i.test(motionFileName)) {
    throw new SignalInputError(`${motionFileName}: a BIDS Motion data file name must end in _motion.tsv`, motionFileName);
  }
  const stem = motionFileName.replace(/_motion\.tsv$/i, "");
  return { channels: `${stem}_channels.tsv`, json: `${stem}_motion.json` };
}
