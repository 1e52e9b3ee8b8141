import fc from "fast-check";
import { SENSOR_CSV_COLUMNS } from "../io/sensor-csv-header";
import { synthesizeSession } from "../synth";
import type { SensorRecording } from "../types";

/**
 * Hostile variations of valid sensor files for property-based tests. Each mutation models one
 * thing a broken device, a hand-edited spreadsheet or an attacker produces; the catalogue of cell
 * payloads includes the classic CSV formula-injection strings (OWASP "CSV Injection" page, from
 * memory) and non-finite numbers.
 */
export const CELL_PAYLOADS = [
  "NaN",
  "nan",
  "Infinity",
  "-Infinity",
  "inf",
  "1e39",
  "-1e400",
  "1e308",
  "=cmd|' /C calc'!A0",
  "=HYPERLINK(\"http://example.invalid\")",
  "+1+1",
  "-2+3",
  "@SUM(A1:A2)",
  "\t=1",
  "PK\u0003\u0004",
  "",
  " ",
  "1,5",
  "0x1F",
  "１２",
  "1.2.3",
  "--1",
  "1e",
  "n/a",
  "\uFEFF1",
  "'; DROP TABLE walk_sessions; --",
] as const;

export const UNIT_LINES = [
  "acc=furlong/s2, gyro=deg/s",
  "acc=m/s2",
  "gyro=rad/s",
  "acc=g; gyro=rpm",
  "",
  "acc=m/s2, gyro=deg/s, acc=g",
  "acc = G , gyro = RAD/S",
] as const;

export type Mutation =
  | { kind: "truncate"; at: number }
  | { kind: "cell"; line: number; column: number; payload: string }
  | { kind: "insert-line"; line: number; payload: string }
  | { kind: "delete-line"; line: number }
  | { kind: "duplicate-line"; line: number }
  | { kind: "swap-lines"; a: number; b: number }
  | { kind: "units"; value: string }
  | { kind: "huge-line"; line: number; length: number }
  | { kind: "newlines"; style: "crlf" | "cr" | "none" }
  | { kind: "prefix"; payload: string }
  | { kind: "bytes"; at: number; bytes: string };

const fraction = fc.double({ min: 0, max: 1, noNaN: true, maxExcluded: true });

export const mutationArb: fc.Arbitrary<Mutation> = fc.oneof(
  fraction.map((at) => ({ kind: "truncate", at }) as Mutation),
  fc
    .tuple(fraction, fc.nat(12), fc.oneof(fc.constantFrom(...CELL_PAYLOADS), fc.string({ maxLength: 30 })))
    .map(([line, column, payload]) => ({ kind: "cell", line, column, payload }) as Mutation),
  fc
    .tuple(fraction, fc.oneof(fc.constantFrom(...CELL_PAYLOADS), fc.string({ unit: "binary", maxLength: 60 })))
    .map(([line, payload]) => ({ kind: "insert-line", line, payload }) as Mutation),
  fraction.map((line) => ({ kind: "delete-line", line }) as Mutation),
  fraction.map((line) => ({ kind: "duplicate-line", line }) as Mutation),
  fc.tuple(fraction, fraction).map(([a, b]) => ({ kind: "swap-lines", a, b }) as Mutation),
  fc.constantFrom(...UNIT_LINES).map((value) => ({ kind: "units", value }) as Mutation),
  fc.tuple(fraction, fc.integer({ min: 1000, max: 120_000 })).map(([line, length]) => ({ kind: "huge-line", line, length }) as Mutation),
  fc.constantFrom("crlf", "cr", "none").map((style) => ({ kind: "newlines", style }) as Mutation),
  fc.constantFrom("\uFEFF", "\uFEFF\uFEFF", "PK\u0003\u0004", "\n", " ", "=cmd|' /C calc'!A0\n").map((payload) => ({ kind: "prefix", payload }) as Mutation),
  fc.tuple(fraction, fc.string({ unit: "binary", minLength: 1, maxLength: 8 })).map(([at, bytes]) => ({ kind: "bytes", at, bytes }) as Mutation),
);

/** Applies one mutation; `sep` is the cell separator of the format ("," or "\t"). */
export function mutate(text: string, m: Mutation, sep: string): string {
  const lines = text.split("\n");
  const pick = (x: number) => Math.min(lines.length - 1, Math.floor(x * lines.length));
  switch (m.kind) {
    case "truncate":
      return text.slice(0, Math.floor(m.at * text.length));
    case "cell": {
      const i = pick(m.line);
      const cells = lines[i]!.split(sep);
      cells[m.column % cells.length] = m.payload;
      lines[i] = cells.join(sep);
      return lines.join("\n");
    }
    case "insert-line":
      lines.splice(pick(m.line), 0, m.payload);
      return lines.join("\n");
    case "delete-line":
      lines.splice(pick(m.line), 1);
      return lines.join("\n");
    case "duplicate-line": {
      const i = pick(m.line);
      lines.splice(i, 0, lines[i]!);
      return lines.join("\n");
    }
    case "swap-lines": {
      const a = pick(m.a);
      const b = pick(m.b);
      [lines[a], lines[b]] = [lines[b]!, lines[a]!];
      return lines.join("\n");
    }
    case "units":
      return lines.map((l) => (l.startsWith("# units:") ? `# units: ${m.value}` : l)).join("\n");
    case "huge-line":
      lines.splice(pick(m.line), 0, "9".repeat(m.length));
      return lines.join("\n");
    case "newlines":
      return m.style === "crlf" ? lines.join("\r\n") : m.style === "cr" ? lines.join("\r") : lines.join("");
    case "prefix":
      return m.payload + text;
    case "bytes": {
      const at = Math.floor(m.at * text.length);
      return text.slice(0, at) + m.bytes + text.slice(at + m.bytes.length);
    }
  }
}

/** A small valid sensor CSV (one shank, 60 Hz) from signal's synthetic generator. */
export function baseSensorCsv(serial: string, options: { seed?: number; durationS?: number; startUtc?: string } = {}): { fileName: string; text: string } {
  const s = synthesizeSession({
    seed: options.seed ?? 3,
    durationS: options.durationS ?? 8,
    sampleRateHz: 60,
    placements: ["left_shank"],
    deviceSerials: { left_shank: serial },
    ...(options.startUtc ? { startUtc: options.startUtc } : {}),
  });
  const f = s.files[0]!;
  return { fileName: f.fileName, text: f.text };
}

/** A small valid BIDS Motion set (one tracked point with a LATENCY channel), written by hand. */
export function baseBids(stem = "sub-01_task-walk_tracksys-imu"): { motionTsv: string; channelsTsv: string; motionJson: string; stem: string } {
  const channels = [
    "name\tcomponent\ttype\ttracked_point\tunits",
    "t\tn/a\tLATENCY\tn/a\ts",
    ...["x", "y", "z"].map((c) => `LS_ACC_${c}\t${c}\tACCEL\tLeftShank\tm/s^2`),
    ...["x", "y", "z"].map((c) => `LS_GYR_${c}\t${c}\tGYRO\tLeftShank\trad/s`),
  ].join("\n");
  const rows: string[] = [];
  for (let i = 0; i < 240; i++) {
    const t = i / 60;
    const w = Math.sin(2 * Math.PI * t);
    rows.push([t.toFixed(4), (0.3 * w).toFixed(4), "9.7900", (0.1 * w).toFixed(4), (2 * w).toFixed(4), (0.2 * w).toFixed(4), "0.0100"].join("\t"));
  }
  const motionJson = JSON.stringify({ SamplingFrequency: 60, TrackingSystemName: "imu", DeviceSerialNumber: "BIDS-FZ-1" });
  return { motionTsv: rows.join("\n"), channelsTsv: channels, motionJson, stem };
}

export const JSON_MUTATIONS = [
  '{"SamplingFrequency": "60"}',
  '{"SamplingFrequency": -1}',
  '{"SamplingFrequency": 1e400}',
  '{"SamplingFrequency": null}',
  "[]",
  "null",
  '"text"',
  "{",
  `${"[".repeat(5000)}${"]".repeat(5000)}`,
  '{"SamplingFrequency": 60, "SamplingFrequency": 0}',
  '{"SamplingFrequency": 60, "DeviceSerialNumber": "=cmd|\' /C calc\'!A0"}',
  '{"__proto__": {"SamplingFrequency": 60}}',
  "",
] as const;

/** The invariants a reader's successful result must hold, as a list of violations (empty = valid). */
export function recordingProblems(r: SensorRecording): string[] {
  const problems: string[] = [];
  const n = r.timeS.length;
  if (n === 0) problems.push("no samples");
  for (const [name, a] of Object.entries({ accX: r.accX, accY: r.accY, accZ: r.accZ, gyroX: r.gyroX, gyroY: r.gyroY, gyroZ: r.gyroZ })) {
    if (a.length !== n) problems.push(`${name} has ${a.length} samples, time has ${n}`);
    for (let i = 0; i < a.length; i++) {
      if (!Number.isFinite(a[i]!)) {
        problems.push(`${name}[${i}] = ${a[i]} is not finite`);
        break;
      }
    }
  }
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(r.timeS[i]!) || (i > 0 && !(r.timeS[i]! > r.timeS[i - 1]!))) {
      problems.push(`time does not increase at sample ${i}`);
      break;
    }
  }
  if (!(r.nominalSampleRateHz > 0 && r.nominalSampleRateHz <= 10_000)) problems.push(`sample rate ${r.nominalSampleRateHz}`);
  if (!Number.isFinite(Date.parse(r.startUtc))) problems.push(`start ${r.startUtc}`);
  if (typeof r.deviceSerial !== "string") problems.push("no device serial");
  return problems;
}

export const CSV_COLUMNS = SENSOR_CSV_COLUMNS;
