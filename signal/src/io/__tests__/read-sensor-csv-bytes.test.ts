import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { baseSensorCsv, mutate, mutationArb } from "../../testing/hostile-text";
import { synthesizeSession } from "../../synth";
import { type SensorRecording, SignalInputError } from "../../types";
import { readSensorCsv } from "../read-sensor-csv";
import { readSensorCsvBytes } from "../read-sensor-csv-bytes";

const encode = (text: string) => new TextEncoder().encode(text);
/** The text a file's bytes stand for: UTF-8, bad sequences as U+FFFD, a BOM kept (Node's readFileSync "utf8"). */
const decode = (bytes: Uint8Array) => Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString("utf8");

type Outcome = { kind: "read"; recording: SensorRecording } | { kind: "refused"; message: string; line?: number; column?: string; fileName?: string };

function outcome(read: () => SensorRecording): Outcome {
  try {
    return { kind: "read", recording: read() };
  } catch (e) {
    if (!(e instanceof SignalInputError)) throw e;
    return { kind: "refused", message: e.message, line: e.line, column: e.column, fileName: e.fileName };
  }
}

const ARRAYS = ["timeS", "accX", "accY", "accZ", "gyroX", "gyroY", "gyroZ"] as const;
const bitsOf = (a: Float32Array | Float64Array) => Buffer.from(a.buffer, a.byteOffset, a.byteLength);

/** Reads `bytes` both ways (bytes, and the text they decode to) and expects the same recording or the same error. */
function expectSameBothWays(bytes: Uint8Array, options: { maxChars?: number } = {}): Outcome["kind"] {
  const fromText = outcome(() => readSensorCsv(decode(bytes), "walk.csv", options));
  const fromBytes = outcome(() => readSensorCsvBytes(bytes, "walk.csv", options));
  if (fromText.kind === "refused" || fromBytes.kind === "refused") {
    expect(fromBytes).toEqual(fromText);
    return fromText.kind;
  }
  const a = fromText.recording;
  const b = fromBytes.recording;
  expect({ ...b, ...Object.fromEntries(ARRAYS.map((k) => [k, null])) }).toEqual({ ...a, ...Object.fromEntries(ARRAYS.map((k) => [k, null])) });
  expect(Object.is(b.nominalSampleRateHz, a.nominalSampleRateHz)).toBe(true);
  for (const k of ARRAYS) {
    expect(b[k].constructor).toBe(a[k].constructor);
    expect(b[k].length, k).toBe(a[k].length);
    expect(bitsOf(b[k]).equals(bitsOf(a[k])), `${k} bit for bit`).toBe(true);
  }
  return "read";
}

const sameBothWays = (text: string, options: { maxChars?: number } = {}) => expectSameBothWays(encode(text), options);

const HEADER = [
  "# pendula-sensor: 1",
  "# device: PX-0042",
  "# placement: left_shank",
  "# sample_rate_hz: 128",
  "# start_utc: 2026-11-23T09:15:02.120Z",
  "# units: acc=m/s2, gyro=deg/s",
  "t_s,acc_x,acc_y,acc_z,gyro_x,gyro_y,gyro_z",
];
const ROWS = ["0.00000,0.12,9.79,0.31,1.2,-0.4,3.9", "0.00781,0.10,9.80,0.30,1.0,-0.5,4.1", "0.01563,0.11,9.81,0.29,0.9,-0.6,4.0"];
const make = (header = HEADER, rows = ROWS) => [...header, ...rows].join("\n") + "\n";
const withLine = (prefix: string, line: string) => HEADER.map((l) => (l.startsWith(prefix) ? line : l));
/** The same file with CRLF line ends, and behind a BOM: both change where every later byte sits. */
const variants = (text: string) => [text.replace(/\n/g, "\r\n"), "\uFEFF" + text, "\uFEFF" + text.replace(/\n/g, "\r\n")];

describe("readSensorCsvBytes(bytes, fileName) against readSensorCsv(text, fileName)", () => {
  it("reads valid files to the same recording, every sample bit for bit", () => {
    const valid = [
      make(),
      make(withLine("# units", "# units: acc=g, gyro=rad/s"), ["0,0,1,0,0,0,3.141592653589793"]),
      "\uFEFF" +
        [
          ...withLine("t_s", "gyro_z,t_s,temp_c,acc_x,acc_y,acc_z,gyro_x,gyro_y").filter((l) => !l.startsWith("# placement")),
          "3.9,0,21.5,0.12,9.79,0.31,1.2,-0.4",
          "",
          "4.0,0.01,,0.1,9.8,0.3,1,-0.5",
        ].join("\r\n"),
      // The general path: spaces around numbers, long mantissas, big exponents, blank and tab-only rows.
      make(HEADER, [" 0 , 1.5 ,2,3,4,5,6", "", "\t ", "0.12345678901234567890,1e-30,+.5,-7.,1E+3,12345678901234567,0.5", "1,2,3,4,5,6,7\r"]),
      make(HEADER, ["0,1,2,3,4,5,6", "1,2,3,4,5,6,7"]).slice(0, -1),
      // Non-ASCII text in the header and in an ignored column.
      make(withLine("# units", "# units: acc=m/s², gyro=°/s").map((l) => (l.startsWith("# device") ? "# device: PX-ÄÖ 🦶" : l)), ROWS),
      make(withLine("t_s", "t_s,acc_x,acc_y,acc_z,gyro_x,gyro_y,gyro_z,note"), ["0,1,2,3,4,5,6,größer 🦶", "1,2,3,4,5,6,7,"]),
    ];
    for (const text of valid) {
      expect(sameBothWays(text)).toBe("read");
      for (const variant of variants(text)) sameBothWays(variant);
    }
  });

  it("reads synthetic sessions (four sensors, 200 Hz) to the same recordings", () => {
    const session = synthesizeSession({ seed: 11, durationS: 20, sampleRateHz: 200, timestampJitterS: 0.0005 });
    expect(session.files.length).toBeGreaterThan(1);
    for (const f of session.files) expect(sameBothWays(f.text)).toBe("read");
  });

  it("refuses each broken file with the same message, line and column", () => {
    const broken = [
      "",
      " \r\n\t",
      "\uFEFF",
      "\u00A0\n",
      "\uFEFF\uFEFF",
      "t_s,acc_x\n0,1\n",
      "ü # pendula-sensor: 1\n",
      make(["# pendula-sensor: 2", ...HEADER.slice(1)]),
      make([HEADER[0]!, "# device PX-é", ...HEADER.slice(2)]),
      make(HEADER.filter((l) => !l.includes("start_utc"))),
      make(withLine("# start_utc", "# start_utc: 2026-02-31T10:00:00+01:00")),
      make(withLine("# sample_rate", "# sample_rate_hz: 0")),
      make(withLine("# placement", "# placement: linkes Knie")),
      make(withLine("# units", "# units: acc=m/s2, gyro=rpm")),
      make(withLine("# units", "# units: acc=ft/s², gyro=deg/s")),
      make(withLine("t_s", "t_s,acc_x,acc_y,acc_z,gyro_x,gyro_z")),
      make(withLine("t_s", HEADER[6]! + ",gyro_x")),
      make(withLine("t_s", HEADER[6]! + ",,")),
      HEADER.slice(0, 6).join("\n") + "\n",
      make(HEADER, []),
      make(HEADER, ["", "  ", ""]),
      make(HEADER, [ROWS[0]!, "0.00781,0.10,9.80,0.30,1.0,abc,4.1"]),
      make(HEADER, ["0,0.1,9.8,0.3,1,,4"]),
      make(HEADER, ["0,0.1,9.8,0.3,1,NaN,4"]),
      make(HEADER, ["0,0.1,9.8,0.3,1,１２,4"]),
      make(HEADER, ["0,0.1,9.8,0.3,1,\uFEFF2,4"]),
      make(HEADER, ["0,0.1,9.8,0.3,1,2"]),
      make(HEADER, ["0,0.1,9.8,0.3,1,2,3,4"]),
      make(HEADER, ["0,0.1,9.8,0.3,1,2,3\r\r"]),
      make(HEADER, [ROWS[0]!, "# a comment"]),
      make(HEADER, [ROWS[0]!, ROWS[2]!, ROWS[1]!]),
      make(HEADER, [ROWS[0]!, ROWS[0]!]),
      make(HEADER, ["0,1e39,0,0,0,0,0"]),
      make(withLine("# units", "# units: acc=m/s2, gyro=rad/s"), ["0,0,0,0,0,0,1e37"]),
      make(HEADER, ["0,1,2,3,4,5,1" + "0".repeat(400)]),
    ];
    for (const text of broken) {
      for (const variant of [text, ...variants(text)]) expect(sameBothWays(variant), JSON.stringify(variant.slice(-80))).toBe("refused");
    }
  });

  it("decodes bad UTF-8 as the text reader sees it (U+FFFD) in headers and cells", () => {
    const bytesOf = (...parts: (string | number[])[]) => {
      const chunks = parts.map((p) => (typeof p === "string" ? encode(p) : Uint8Array.from(p)));
      const out = new Uint8Array(chunks.reduce((s, c) => s + c.length, 0));
      let at = 0;
      for (const c of chunks) {
        out.set(c, at);
        at += c.length;
      }
      return out;
    };
    const head = HEADER.join("\n") + "\n";
    expect(expectSameBothWays(bytesOf(head, "0,1,2,3,4,5,", [0xff], "\n"))).toBe("refused");
    expect(expectSameBothWays(bytesOf(head, "0,1,2,3,4,5,6", [0xe2, 0x82], "\r\n"))).toBe("refused");
    expect(expectSameBothWays(bytesOf(head, "0,1,2,3,4,5,6", [0xf0, 0x9f]))).toBe("refused");
    expect(expectSameBothWays(bytesOf(HEADER.slice(0, 2).join("\n"), [0xc3], "\n", HEADER.slice(2).join("\n"), "\n0,1,2,3,4,5,6\n"))).toBe("read");
    expect(expectSameBothWays(bytesOf("# pendula-sensor: 1\n# device", [0xc0, 0x80], "\n"))).toBe("refused");
    expect(expectSameBothWays(bytesOf([0xef, 0xbb], "# pendula-sensor: 1\n"))).toBe("refused");
  });

  it("applies the size limit in characters, as the text reader does", () => {
    const text = make();
    expect(sameBothWays(text, { maxChars: 100 })).toBe("refused");
    const wide = make(HEADER.map((l) => (l.startsWith("# device") ? "# device: " + "é".repeat(40) : l)));
    // More bytes than the limit but fewer characters: read by both.
    expect(encode(wide).length).toBeGreaterThan(wide.length);
    expect(sameBothWays(wide, { maxChars: wide.length })).toBe("read");
    expect(sameBothWays(wide, { maxChars: wide.length - 1 })).toBe("refused");
  });

  it("gives the same outcome on every mutated file of the reader fuzz test", () => {
    const base = baseSensorCsv("FZ-CSV-1");
    const seen = { read: 0, refused: 0 };
    fc.assert(
      fc.property(fc.array(mutationArb, { minLength: 1, maxLength: 3 }), (mutations) => {
        seen[sameBothWays(mutations.reduce((s, m) => mutate(s, m, ","), base.text))]++;
      }),
      { numRuns: 200, seed: 20_261_207 },
    );
    expect(seen.read).toBeGreaterThan(0);
    expect(seen.refused).toBeGreaterThan(100);
  });

  it("gives the same outcome on every random text of the reader fuzz test, and on random bytes", () => {
    fc.assert(
      fc.property(fc.string({ unit: "binary", maxLength: 3000 }), fc.boolean(), (junk, withMagic) => {
        expect(sameBothWays(withMagic ? `# pendula-sensor: 1\n${junk}` : junk)).toBe("refused");
      }),
      { numRuns: 100, seed: 20_261_208 },
    );
    const head = encode(HEADER.join("\n") + "\n0,1,2,3,4,5,6\n");
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 400 }), fc.nat(head.length), (junk, at) => {
        const bytes = new Uint8Array(head.length + junk.length);
        bytes.set(head.subarray(0, at));
        bytes.set(junk, at);
        bytes.set(head.subarray(at), at + junk.length);
        expectSameBothWays(bytes);
      }),
      { numRuns: 300, seed: 20_261_209 },
    );
  });
});
