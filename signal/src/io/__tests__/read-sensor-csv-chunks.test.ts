import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { baseSensorCsv, mutate, mutationArb } from "../../testing/hostile-text";
import { synthesizeSession } from "../../synth";
import { type SensorRecording, SignalInputError } from "../../types";
import { type ByteSource, readSensorCsvChunks } from "../read-sensor-csv-chunks";
import { readSensorCsvBytes } from "../read-sensor-csv-bytes";

// The chunked reader must be the byte reader (itself checked against the text reader in
// read-sensor-csv-bytes.test.ts) whatever the window size and however the reads are cut: a
// differential test, the common practice for a faster path of an existing parser.

const encode = (text: string) => new TextEncoder().encode(text);

type Outcome = { kind: "read"; recording: SensorRecording } | { kind: "refused"; message: string; line?: number; column?: string; fileName?: string };

function outcome(read: () => SensorRecording): Outcome {
  try {
    return { kind: "read", recording: read() };
  } catch (e) {
    if (!(e instanceof SignalInputError)) throw e;
    return { kind: "refused", message: e.message, line: e.line, column: e.column, fileName: e.fileName };
  }
}

/**
 * An in-memory file. `cut` limits each read (a pipe or a slow disk hands back less than asked);
 * `widest` records the largest buffer the reader read into, and `touched` the bytes it asked for.
 */
function memorySource(bytes: Uint8Array, cut = Infinity): ByteSource & { widest: number; touched: number } {
  return {
    size: bytes.length,
    widest: 0,
    touched: 0,
    readAt(into, offset, length, position) {
      this.widest = Math.max(this.widest, into.length);
      const n = Math.max(0, Math.min(length, cut, bytes.length - position));
      into.set(bytes.subarray(position, position + n), offset);
      this.touched += n;
      return n;
    },
  };
}

const ARRAYS = ["timeS", "accX", "accY", "accZ", "gyroX", "gyroY", "gyroZ"] as const;
const bitsOf = (a: Float32Array | Float64Array) => Buffer.from(a.buffer, a.byteOffset, a.byteLength);

/** Reads `bytes` with the byte reader and chunked with each window size; expects the same outcome every time. */
function expectSameChunked(bytes: Uint8Array, chunkSizes: readonly number[], options: { maxChars?: number; cut?: number } = {}): Outcome["kind"] {
  const whole = outcome(() => readSensorCsvBytes(bytes, "walk.csv", options));
  for (const chunkBytes of chunkSizes) {
    const chunked = outcome(() => readSensorCsvChunks(memorySource(bytes, options.cut), "walk.csv", { ...options, chunkBytes }));
    if (whole.kind === "refused" || chunked.kind === "refused") {
      expect(chunked, `window ${chunkBytes}`).toEqual(whole);
      continue;
    }
    const a = whole.recording;
    const b = chunked.recording;
    expect({ ...b, ...Object.fromEntries(ARRAYS.map((k) => [k, null])) }).toEqual({ ...a, ...Object.fromEntries(ARRAYS.map((k) => [k, null])) });
    for (const k of ARRAYS) {
      expect(b[k].constructor).toBe(a[k].constructor);
      expect(b[k].length, `${k}, window ${chunkBytes}`).toBe(a[k].length);
      expect(bitsOf(b[k]).equals(bitsOf(a[k])), `${k} bit for bit, window ${chunkBytes}`).toBe(true);
    }
  }
  return whole.kind;
}

const HEADER = [
  "# pendula-sensor: 1",
  "# device: PX-0042",
  "# placement: left_shank",
  "# sample_rate_hz: 128",
  "# start_utc: 2026-11-23T09:15:02.120Z",
  "# units: acc=m/s2, gyro=deg/s",
  "t_s,acc_x,acc_y,acc_z,gyro_x,gyro_y,gyro_z",
];
const headerBytes = encode(HEADER.join("\n") + "\n").length;
const rowsOf = (n: number) => Array.from({ length: n }, (_, i) => `${(i / 128).toFixed(5)},0.${i % 97},9.8${i % 7},0.3,1.${i % 13},-0.4,${i % 50}.9`);
const make = (rows: string[], header = HEADER) => [...header, ...rows].join("\n") + "\n";
/** Windows smaller than the header, about its size, a few rows wide, and wider than the file. */
const WINDOWS = [1, 7, 64, headerBytes - 1, headerBytes, headerBytes + 1, headerBytes + 37, 1000, 4096, 1 << 20];
const variants = (text: string) => [text, text.replace(/\n/g, "\r\n"), "\uFEFF" + text, "\uFEFF" + text.replace(/\n/g, "\r\n")];

describe("readSensorCsvChunks(source, fileName) against readSensorCsvBytes(all bytes, fileName)", () => {
  it("reads valid files to the same recording, every sample bit for bit, whatever the window", () => {
    const valid = [
      make(rowsOf(300)),
      make(rowsOf(300)).slice(0, -1),
      // The general path at chunk ends: spaces around numbers, long mantissas, blank and tab-only rows.
      make([...rowsOf(40), " 1 , 1.5 ,2,3,4,5,6", "", "\t ", "1.12345678901234567890,1e-30,+.5,-7.,1E+3,12345678901234567,0.5", "2,2,3,4,5,6,7"]),
      make(
        ["0,1,2,3,4,5,6,größer 🦶", ...rowsOf(60).map((r, i) => `${i + 1}${r.slice(r.indexOf(","))},${"é".repeat(i % 9)}`)],
        HEADER.map((l) => (l.startsWith("t_s") ? l + ",note" : l.startsWith("# device") ? "# device: PX-ÄÖ 🦶" : l)),
      ),
      // A line longer than the window: the window widens for that file.
      make(["0,1,2,3,4,5," + "6".repeat(15) + ".5" + "0".repeat(3000), ...rowsOf(20).slice(1)]),
    ];
    for (const text of valid) for (const v of variants(text)) expect(expectSameChunked(encode(v), WINDOWS)).toBe("read");
  });

  it("reads synthetic sessions (four sensors, 200 Hz) to the same recordings, with reads cut short", () => {
    const session = synthesizeSession({ seed: 12, durationS: 20, sampleRateHz: 200, timestampJitterS: 0.0005 });
    expect(session.files.length).toBeGreaterThan(1);
    for (const f of session.files) {
      const bytes = encode(f.text);
      expect(expectSameChunked(bytes, [4096, 65536])).toBe("read");
      expect(expectSameChunked(bytes, [8192], { cut: 1000 })).toBe("read");
    }
  });

  it("never holds the whole file when it is wider than the window", () => {
    const bytes = encode(make(rowsOf(20_000)));
    const source = memorySource(bytes);
    const r = readSensorCsvChunks(source, "walk.csv", { chunkBytes: 4096 });
    expect(r.timeS.length).toBe(20_000);
    expect(source.widest).toBe(4096);
    // Every byte read exactly once.
    expect(source.touched).toBe(bytes.length);
  });

  it("refuses each broken file with the same message, line and column, whatever the window", () => {
    const rows = rowsOf(50);
    const broken = [
      "",
      " \r\n\t",
      " ".repeat(5000) + "\n",
      "\u00A0\n" + make(rows),
      "ü # pendula-sensor: 1\n",
      make(rows, ["# pendula-sensor: 2", ...HEADER.slice(1)]),
      make(rows, HEADER.filter((l) => !l.includes("start_utc"))),
      make(rows, HEADER.map((l) => (l.startsWith("t_s") ? "t_s,acc_x,acc_y,acc_z,gyro_x,gyro_z" : l))),
      HEADER.slice(0, 6).join("\n") + "\n",
      make([]),
      make(["", "  ", ...Array.from({ length: 200 }, () => "\t")]),
      make([...rows, "1.0,0.10,9.80,0.30,1.0,abc,4.1"]),
      make([...rows.slice(0, 30), "# a comment", ...rows.slice(30)]),
      make([...rows, rows[10]!]),
      make([...rows.slice(0, 45), "10,1e39,0,0,0,0,0"]),
      make([...rows, "10,0.1,9.8,0.3,1,2"]),
      make([...rows, "10,0.1,9.8,0.3,1,2,3,4"]),
      make([...rows, "10,0.1,9.8,0.3,1,2,3\r\r"]),
    ];
    for (const text of broken) for (const v of variants(text)) expect(expectSameChunked(encode(v), WINDOWS), JSON.stringify(v.slice(-60))).toBe("refused");
  });

  it("applies the size limit as the byte reader does", () => {
    const text = make(rowsOf(100));
    expect(expectSameChunked(encode(text), [256], { maxChars: 1000 })).toBe("refused");
    expect(expectSameChunked(encode(text), [256], { maxChars: text.length })).toBe("read");
  });

  it("gives the same outcome on every mutated file of the reader fuzz test, at windows cutting rows anywhere", () => {
    const base = baseSensorCsv("FZ-CSV-2");
    const seen = { read: 0, refused: 0 };
    fc.assert(
      fc.property(fc.array(mutationArb, { minLength: 1, maxLength: 3 }), fc.integer({ min: 1, max: 2048 }), (mutations, window) => {
        seen[expectSameChunked(encode(mutations.reduce((s, m) => mutate(s, m, ","), base.text)), [window])]++;
      }),
      { numRuns: 200, seed: 20_261_202 },
    );
    expect(seen.read).toBeGreaterThan(0);
    expect(seen.refused).toBeGreaterThan(100);
  });

  it("gives the same outcome on random bytes spliced into a file, at any window", () => {
    const head = encode(make(rowsOf(40)));
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 400 }), fc.nat(head.length), fc.integer({ min: 1, max: 1024 }), (junk, at, window) => {
        const bytes = new Uint8Array(head.length + junk.length);
        bytes.set(head.subarray(0, at));
        bytes.set(junk, at);
        bytes.set(head.subarray(at), at + junk.length);
        expectSameChunked(bytes, [window]);
      }),
      { numRuns: 300, seed: 20_261_203 },
    );
  });
});
