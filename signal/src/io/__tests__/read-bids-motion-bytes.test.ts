import fc from "fast-check";
import { describe, expect, it, vi } from "vitest";
import { baseBids, mutate, mutationArb } from "../../testing/hostile-text";
import { bidsMotionText } from "../../synth/bids-motion-text";
import { synthesizeSession } from "../../synth";
import { type SensorRecording, SignalInputError } from "../../types";
import { BidsRows, readBidsMotion } from "../read-bids-motion";
import { readBidsMotionBytes } from "../read-bids-motion-bytes";
import { readSensorCsv } from "../read-sensor-csv";

// The reference here is the text reader itself (readBidsMotion): the byte reader must give the same
// recordings bit for bit and the same errors word for word on any file. The text is what Node's
// Buffer#toString("utf8") makes of the bytes (WHATWG UTF-8 decode, BOM kept).
const encode = (text: string) => new TextEncoder().encode(text);
const decode = (bytes: Uint8Array) => Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString("utf8");

type Outcome = { kind: "read"; recordings: SensorRecording[] } | { kind: "refused"; message: string; line?: number; column?: string; fileName?: string };

function outcome(read: () => SensorRecording[]): Outcome {
  try {
    return { kind: "read", recordings: read() };
  } catch (e) {
    if (!(e instanceof SignalInputError)) throw e;
    return { kind: "refused", message: e.message, line: e.line, column: e.column, fileName: e.fileName };
  }
}

const ARRAYS = ["timeS", "accX", "accY", "accZ", "gyroX", "gyroY", "gyroZ"] as const;
const bitsOf = (a: Float32Array | Float64Array) => Buffer.from(a.buffer, a.byteOffset, a.byteLength);

interface SetTexts {
  motion: Uint8Array;
  channels: string;
  json: string;
  maxChars?: number;
}

function expectSameBothWays({ motion, channels, json, maxChars }: SetTexts): Outcome["kind"] {
  const names = { motionFileName: "sub-x_motion.tsv", channelsFileName: "sub-x_channels.tsv", jsonFileName: "sub-x_motion.json" };
  const common = { ...names, channelsTsv: channels, motionJson: json, startUtc: "2026-11-23T09:15:02.120Z", maxChars };
  const fromText = outcome(() => readBidsMotion({ ...common, motionTsv: decode(motion) }));
  const fromBytes = outcome(() => readBidsMotionBytes({ ...common, motionTsv: motion }));
  if (fromText.kind === "refused" || fromBytes.kind === "refused") {
    expect(fromBytes).toEqual(fromText);
    return fromText.kind;
  }
  expect(fromBytes.recordings.length).toBe(fromText.recordings.length);
  fromText.recordings.forEach((a, i) => {
    const b = fromBytes.recordings[i]!;
    const blank = Object.fromEntries(ARRAYS.map((k) => [k, null]));
    expect({ ...b, ...blank }).toEqual({ ...a, ...blank });
    for (const k of ARRAYS) {
      expect(b[k].length, k).toBe(a[k].length);
      expect(bitsOf(b[k]).equals(bitsOf(a[k])), `${k} bit for bit`).toBe(true);
    }
  });
  return "read";
}

function generatedSet(options: Parameters<typeof bidsMotionText>[1] = {}) {
  const session = synthesizeSession({ seed: 7, durationS: 40 });
  const recordings = session.files.map((f) => readSensorCsv(f.text, f.fileName));
  return bidsMotionText(recordings, options);
}

describe("readBidsMotionBytes(bytes) — same as readBidsMotion(text)", () => {
  const set = generatedSet({ missingRows: [5, 6, 7, 900] });
  const same = (motionTsv: string, extra: Partial<SetTexts> = {}) =>
    expectSameBothWays({ motion: encode(motionTsv), channels: set.channelsTsv, json: set.motionJson, ...extra });

  it("reads a generated four-sensor session (40 s, n/a rows, LATENCY) identically", () => {
    expect(same(set.motionTsv)).toBe("read");
    const recs = readBidsMotionBytes({ ...set, motionTsv: encode(set.motionTsv) });
    expect(recs.map((r) => r.placement)).toEqual(["left_shank", "right_shank", "left_wrist", "right_wrist"]);
    // Rows 5–7 and 900 of the first tracked point are n/a: dropped there, kept for the others.
    expect(recs[0]!.timeS.length).toBe(recs[1]!.timeS.length - 4);
  });

  it("reads rad/s gyroscopes, CRLF line ends, a BOM and trailing blank lines identically", () => {
    const rad = generatedSet({ gyroUnit: "rad/s" });
    expect(expectSameBothWays({ motion: encode(rad.motionTsv), channels: rad.channelsTsv, json: rad.motionJson })).toBe("read");
    expect(same(set.motionTsv.replace(/\n/g, "\r\n"))).toBe("read");
    expect(same(`\uFEFF${set.motionTsv}\n\n  \t\n`)).toBe("read");
  });

  it("reads cells the fast scanner hands back (spaces, exponents, 17 digits, NaN, non-ASCII blank) identically", () => {
    const lines = set.motionTsv.split("\n");
    const edit = (row: number, col: number, cell: string) => {
      const cells = lines[row]!.split("\t");
      cells[col] = cell;
      lines[row] = cells.join("\t");
    };
    edit(10, 1, " 1.5 ");
    edit(11, 2, "2.5e-3");
    edit(12, 3, "0.12345678901234567");
    edit(13, 4, "NaN");
    edit(14, 5, "+.5");
    edit(15, 6, "1e30");
    lines.splice(20, 0, "\u00A0\u2003");
    expect(same(lines.join("\n"))).toBe("read");
  });

  it("reads channels past column 127 (130 magnetometer channels first) as the same recordings", () => {
    // The scanner's cell → column map must hold any column index, not only a byte's worth.
    const extra = 130;
    const [header, ...rows] = set.channelsTsv.trimEnd().split("\n");
    const magnetometer = Array.from({ length: extra }, (_, k) => `head_magn_${k}\tx\tMAGN\tHead\tnT`);
    const channels = [header, ...magnetometer, ...rows].join("\n") + "\n";
    const motion = set.motionTsv
      .split("\n")
      .map((line) => (line === "" ? line : `${"21.5\t".repeat(extra)}${line}`))
      .join("\n");
    expect(expectSameBothWays({ motion: encode(motion), channels, json: set.motionJson })).toBe("read");
    const wide = readBidsMotionBytes({ ...set, channelsTsv: channels, motionTsv: encode(motion) });
    const plain = readBidsMotionBytes({ ...set, motionTsv: encode(set.motionTsv) });
    expect(wide.length).toBe(plain.length);
    wide.forEach((r, i) => {
      for (const k of ARRAYS) expect(bitsOf(r[k]).equals(bitsOf(plain[i]![k])), `${k} bit for bit`).toBe(true);
    });
  });

  it("reads a file whose first MiB has much longer lines than the rest identically (the arrays grow)", () => {
    // The byte reader sizes its arrays from the lines of the first MiB: 700 lines padded with
    // trailing zeros (about 1.5 KiB each) followed by ~3300 plain ones (~150 bytes) make that
    // estimate far too small, so the rows must survive several rounds of growth.
    const pad = "0".repeat(60);
    const lines = set.motionTsv.split("\n");
    const motion = lines.map((line, i) => (i < 700 && line !== "" ? line.split("\t").map((c) => (c.includes(".") ? c + pad : c)).join("\t") : line)).join("\n");
    expect(encode(motion.split("\n").slice(0, 700).join("\n")).length).toBeGreaterThan(1 << 20);
    const widen = vi.spyOn(BidsRows.prototype, "widen");
    try {
      expect(same(motion)).toBe("read");
      expect(widen).toHaveBeenCalled();
    } finally {
      widen.mockRestore();
    }
  });

  it("refuses what the text reader refuses, with its message, line and column", () => {
    const lines = set.motionTsv.split("\n");
    const broken = (row: number, line: string) => lines.map((l, i) => (i === row ? line : l)).join("\n");
    const cases = [
      broken(30, lines[30]!.replace(/\t[^\t]*$/, "")), // a cell short
      broken(31, `${lines[31]}\t1`), // a cell more
      broken(32, lines[32]!.replace(/^[^\t]*/, "x1")), // bad latency cell
      broken(33, lines[33]!.replace(/^[^\t]*/, "0")), // latency goes back
      broken(34, lines[34]!.replace(/\t[^\t]*/, "\t１２")), // full-width digits
      broken(35, lines[35]!.replace(/\t[^\t]*/, "\t1e39")), // beyond single precision
      "",
      "\n \n\t\n",
      "\uFEFF",
    ];
    for (const motion of cases) expect(same(motion)).toBe("refused");
    expect(same(set.motionTsv, { maxChars: 1000 })).toBe("refused");
    expect(same(set.motionTsv, { json: "{" })).toBe("refused");
  });

  it("agrees with the text reader on 300 mutated files (fuzz mutations of tests/fuzz, fixed seed)", () => {
    const b = baseBids();
    const counts = { read: 0, refused: 0 };
    fc.assert(
      fc.property(fc.array(mutationArb, { minLength: 1, maxLength: 3 }), (mutations) => {
        const motion = mutations.reduce((s, m) => mutate(s, m, "\t"), b.motionTsv);
        counts[expectSameBothWays({ motion: encode(motion), channels: b.channelsTsv, json: b.motionJson })]++;
      }),
      { numRuns: 300, seed: 20_261_202 },
    );
    // Both outcomes must occur, or the comparison says little.
    expect(counts.read).toBeGreaterThan(10);
    expect(counts.refused).toBeGreaterThan(10);
  });

  it("agrees on random bytes, including invalid UTF-8", () => {
    const b = baseBids();
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 400 }), fc.boolean(), (junk, prefixed) => {
        const head = prefixed ? encode(b.motionTsv.slice(0, 200)) : new Uint8Array(0);
        const motion = new Uint8Array(head.length + junk.length);
        motion.set(head);
        motion.set(junk, head.length);
        expectSameBothWays({ motion, channels: b.channelsTsv, json: b.motionJson });
      }),
      { numRuns: 200, seed: 20_261_203 },
    );
  });
});
