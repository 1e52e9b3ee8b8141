import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, describe, expect, it } from "vitest";
import { analyze, ALGORITHM_VERSION, type SensorRecording } from "@pendula/signal";
import { bidsSetFromSynth, synthFor } from "../../testing/session-fixtures";
import type { RawFileRow } from "../../sessions/sessions.repository";
import { loadRecordings } from "../../processing/process-session";
import { ObjectNotFoundError } from "../../storage/object-storage";
import { parseReply } from "../parse-job";
import { parseUpload } from "../parse-upload";
import { ParsedRecordingsMismatch, readParsedRecordings, timeAsTicks, writeParsedRecordings } from "../parsed-recordings";

// The parse thread's recordings must be exactly what reading the uploaded files gives: same
// arrays byte for byte, same names, serials and clocks, so the analysis cannot tell them apart.
const dir = mkdtempSync(path.join(tmpdir(), "pendula-parsed-recordings-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const MAX = 64 * 1024 * 1024;
let n = 0;
function written(files: Array<{ originalName: string; buffer: Buffer }>, options: { bidsStartUtc?: string } = {}) {
  const parsed = parseUpload(files, { maxChars: MAX, ...options });
  const file = path.join(dir, `parsed-${n++}`);
  writeParsedRecordings(file, parsed.recordings, parsed.recordingFile, parsed.files.map((f) => f.sha256));
  return { parsed, bytes: readFileSync(file) };
}

const CHANNELS = ["timeS", "accX", "accY", "accZ", "gyroX", "gyroY", "gyroZ"] as const;
const bytesOf = (a: Float32Array | Float64Array) => Buffer.from(a.buffer, a.byteOffset, a.byteLength);

function expectIdentical(actual: SensorRecording[], expected: SensorRecording[]): void {
  expect(actual.map(({ fileName, deviceSerial, placement, nominalSampleRateHz, startUtc }) => ({ fileName, deviceSerial, placement, nominalSampleRateHz, startUtc }))).toEqual(
    expected.map(({ fileName, deviceSerial, placement, nominalSampleRateHz, startUtc }) => ({ fileName, deviceSerial, placement, nominalSampleRateHz, startUtc })),
  );
  for (const [i, r] of expected.entries()) {
    for (const c of CHANNELS) {
      expect(actual[i]![c].constructor).toBe(r[c].constructor);
      // Byte equality, so NaN payloads and -0 count too.
      expect(bytesOf(actual[i]![c]).equals(bytesOf(r[c])), `${r.fileName} ${c}`).toBe(true);
    }
  }
}

// Stroke survivors' treadmill walks (Ensink et al., Sensors 2024, 24:710, MIT licence), read in place.
const strokeTrial = path.join(fileURLToPath(new URL("../../../../", import.meta.url)), "..", "shared", "data", "stroke-treadmill", "pp01-1Reg");

describe("parsed recordings object", () => {
  it.skipIf(!existsSync(strokeTrial))("gives back a real recording's arrays byte for byte (stroke treadmill trial pp01-1Reg, five sensors)", () => {
    const files = readdirSync(strokeTrial)
      .filter((f) => f.endsWith(".csv"))
      .sort()
      .map((f) => ({ originalName: f, buffer: readFileSync(path.join(strokeTrial, f)) }));
    expect(files.length).toBe(5);
    const { parsed, bytes } = written(files);
    const back = readParsedRecordings(bytes, parsed.files.map((f) => f.sha256));
    expect(back.recordingFile).toEqual(parsed.recordingFile);
    expectIdentical(back.recordings, parsed.recordings);
    // Smaller than the text it replaces: 4 bytes of time steps and 6 × 4 of channels per sample.
    expect(bytes.length).toBeLessThan(files.reduce((s, f) => s + f.buffer.length, 0));
    // The trial's t_s column is written with two decimals (e.g. "0.01"), so every time is a whole
    // number of 1/100 s and the column travels as Int32 steps: 28 bytes per sample, not 32.
    const header = JSON.parse(bytes.subarray(12, 12 + bytes.readUInt32LE(8)).toString("utf8")) as { recordings: Array<{ timeTicks?: { perSecond: number } }> };
    expect(header.recordings.map((r) => r.timeTicks?.perSecond)).toEqual([100, 100, 100, 100, 100]);
    const samples = parsed.recordings.reduce((n, r) => n + r.timeS.length, 0);
    expect(bytes.length).toBeLessThan(29 * samples + 8 * 7 * 5 + 4096);
  });

  it("keeps Float64 times when any sample would not come back as the same double", () => {
    // 0.1 + 0.2 is 0.30000000000000004 (IEEE 754 binary64): no decimal tick of up to 10^-9 s rebuilds it.
    expect(timeAsTicks(new Float64Array([0, 0.1, 0.1 + 0.2]))).toBeUndefined();
    expect(timeAsTicks(new Float64Array([0, Math.PI]))).toBeUndefined();
    // -0 would return as +0 (common practice: byte equality, not ===, for a cache of the reader's output).
    expect(timeAsTicks(new Float64Array([-0, 0.5]))).toBeUndefined();
    expect(timeAsTicks(new Float64Array([0, Number.NaN]))).toBeUndefined();
    // A step beyond Int32 at every tick size.
    expect(timeAsTicks(new Float64Array([0, 2 ** 31]))).toBeUndefined();
    // Milliseconds written with three decimals, jittered: ticks of 10^-3 s with their steps.
    const t = new Float64Array([12.005, 12.011, 12.014, 12.02]);
    expect(timeAsTicks(t)).toMatchObject({ perSecond: 1000, firstTick: 12005, steps: new Int32Array([0, 6, 3, 6]) });
  });

  it("gives back a mix of tick and Float64 time columns byte for byte", () => {
    const files = synthFor({}, { seed: 4, durationS: 20, placements: ["left_shank", "right_shank"] }).files.map((f) => ({ originalName: f.fileName, buffer: Buffer.from(f.text) }));
    const parsed = parseUpload(files, { maxChars: MAX });
    // The second recording's clock made irregular in a way no decimal tick rebuilds.
    const odd = { ...parsed.recordings[1]!, timeS: parsed.recordings[1]!.timeS.map((v, i) => v + (i % 3) * Number.EPSILON * 3) };
    expect(timeAsTicks(parsed.recordings[0]!.timeS)).toBeDefined();
    expect(timeAsTicks(odd.timeS)).toBeUndefined();
    const recordings = [parsed.recordings[0]!, odd];
    const file = path.join(dir, `parsed-${n++}`);
    const sha = parsed.files.map((f) => f.sha256);
    writeParsedRecordings(file, recordings, parsed.recordingFile, sha);
    expectIdentical(readParsedRecordings(readFileSync(file), sha).recordings, recordings);
  });

  it("keeps a BIDS Motion set's grouping, serials and clock beside a sensor CSV file", () => {
    const START = "2026-11-23T09:15:00.000Z";
    const bids = bidsSetFromSynth(synthFor({}, { seed: 5, startUtc: START, placements: ["left_shank", "right_shank"] }));
    const csv = synthFor({ left_wrist: "PR-LW" }, { seed: 5, placements: ["left_wrist"] }).files;
    const files = [...csv, ...bids].map((f) => ({ originalName: f.fileName, buffer: Buffer.from(f.text) }));
    const { parsed, bytes } = written(files, { bidsStartUtc: START });
    const back = readParsedRecordings(bytes, parsed.files.map((f) => f.sha256));
    expect(back.recordingFile).toEqual(parsed.recordingFile);
    expectIdentical(back.recordings, parsed.recordings);
  });

  it("is refused when it belongs to other files, another version or is damaged", () => {
    const files = synthFor({}, { seed: 6, durationS: 20, placements: ["left_shank"] }).files.map((f) => ({ originalName: f.fileName, buffer: Buffer.from(f.text) }));
    const { parsed, bytes } = written(files);
    const sha = parsed.files.map((f) => f.sha256);
    expect(() => readParsedRecordings(bytes, ["0".repeat(64)])).toThrow(/other files/);
    expect(() => readParsedRecordings(bytes, [...sha, sha[0]!])).toThrow(/other files/);
    expect(() => readParsedRecordings(bytes.subarray(0, bytes.length - 8), sha)).toThrow(ParsedRecordingsMismatch);
    expect(() => readParsedRecordings(Buffer.concat([bytes, Buffer.alloc(8)]), sha)).toThrow(/left over/);
    expect(() => readParsedRecordings(Buffer.from("not ours at all"), sha)).toThrow(ParsedRecordingsMismatch);
    const older = Buffer.from(bytes.toString("latin1").replace(`"algorithmVersion":"${ALGORITHM_VERSION}"`, `"algorithmVersion":"0.0.0"`.padEnd(`"algorithmVersion":"${ALGORITHM_VERSION}"`.length, " ")), "latin1");
    expect(() => readParsedRecordings(older, sha)).toThrow(/parsed by 0\.0\.0/);
  });

  it("reads from a buffer that does not start on an 8-byte boundary (copied once, same values)", () => {
    const files = synthFor({}, { seed: 7, durationS: 20, placements: ["right_shank"] }).files.map((f) => ({ originalName: f.fileName, buffer: Buffer.from(f.text) }));
    const { parsed, bytes } = written(files);
    const shifted = new Uint8Array(bytes.length + 3).subarray(3);
    shifted.set(bytes);
    expectIdentical(readParsedRecordings(shifted, parsed.files.map((f) => f.sha256)).recordings, parsed.recordings);
  });

  it("is not written when the upload is refused", async () => {
    const good = synthFor({}, { seed: 8, durationS: 20, placements: ["left_shank"] }).files[0]!;
    const bad = path.join(dir, "bad.csv");
    writeFileSync(bad, good.text.replace(/\n(\d[^,\n]*),[^,\n]*/, "\n$1,abc"));
    const parsedPath = path.join(dir, "refused-parsed");
    const reply = await parseReply({ files: [{ originalName: good.fileName, path: bad }], maxChars: MAX, parsedPath });
    expect(reply.ok).toBe(false);
    expect(existsSync(parsedPath)).toBe(false);
  });
});

describe("loadRecordings with the parsed recordings", () => {
  function row(name: string, sha256: string, over: Partial<RawFileRow> = {}): RawFileRow {
    return {
      id: name,
      session_id: "s",
      storage_key: `k/${name}`,
      sha256,
      size_bytes: 0,
      original_name: name,
      format: "pendula-csv-v1",
      device_serial: "",
      device_id: null,
      placement: "left_shank",
      start_utc: new Date("2026-11-20T08:00:00Z"),
      recording_placements: null,
      ...over,
    };
  }
  function storage(objects: Map<string, Buffer>) {
    return {
      get: async (key: string) => {
        const b = objects.get(key);
        if (!b) throw new ObjectNotFoundError(key);
        return b;
      },
      exists: async (key: string) => objects.has(key),
    };
  }

  // The four-sensor synthetic session (signal's generator), placements given by the stored rows
  // the way the upload recorded them; the analysis of both inputs must serialise identically.
  const synth = synthFor({ left_shank: "PR-1", right_shank: "PR-2", left_wrist: "PR-3", right_wrist: "PR-4" }, { seed: 9, durationS: 90 });
  const files = synth.files.map((f) => ({ originalName: f.fileName, buffer: Buffer.from(f.text) }));
  const { parsed, bytes } = written(files);
  const rows = synth.files.map((f, i) => row(f.fileName, parsed.files[i]!.sha256, { placement: f.placement }));
  const objects = new Map<string, Buffer>([...synth.files.map((f, i): [string, Buffer] => [`k/${f.fileName}`, files[i]!.buffer]), ["k/parsed", bytes]]);

  it("gives the same recordings and the same analysis as reading the uploaded files", async () => {
    const fromText = await loadRecordings({ storage: storage(objects) } as never, rows);
    const fromParsed = await loadRecordings({ storage: storage(objects) } as never, rows, "k/parsed");
    // Not the same objects: the parsed path really was taken (views into the one stored buffer).
    expect(fromParsed[0]!.accX.buffer).toBe(fromParsed[1]!.accX.buffer);
    expect(fromText[0]!.accX.buffer).not.toBe(fromText[1]!.accX.buffer);
    expectIdentical(fromParsed, fromText);
    expect(JSON.stringify(analyze(fromParsed, { sagittalSignals: true }))).toBe(JSON.stringify(analyze(fromText, { sagittalSignals: true })));
  });

  it("gives a BIDS Motion set's recordings with the clock and placements stored at upload, as reading its files does", async () => {
    const START = "2026-11-23T09:15:00Z"; // no milliseconds: both paths must normalise it alike
    const bids = bidsSetFromSynth(synthFor({}, { seed: 10, durationS: 30, startUtc: "2026-11-23T09:15:00.000Z", placements: ["left_shank", "right_shank"] }));
    const bidsFiles = bids.map((f) => ({ originalName: f.fileName, buffer: Buffer.from(f.text) }));
    const { parsed: p, bytes: b } = written(bidsFiles, { bidsStartUtc: START });
    const placements = Object.fromEntries(p.recordings.map((r, i) => [r.deviceSerial, i === 0 ? "right_shank" : "left_shank"]));
    const bidsRows = bids.map((f, i) => row(f.fileName, p.files[i]!.sha256, { format: "bids-motion", start_utc: new Date(p.recordings[0]!.startUtc), recording_placements: placements }));
    const store = new Map<string, Buffer>([...bids.map((f, i): [string, Buffer] => [`k/${f.fileName}`, bidsFiles[i]!.buffer]), ["k/parsed", b]]);
    const fromText = await loadRecordings({ storage: storage(store) } as never, bidsRows);
    const fromParsed = await loadRecordings({ storage: storage(store) } as never, bidsRows, "k/parsed");
    expect(fromParsed[0]!.accX.buffer).toBe(fromParsed[1]!.accX.buffer);
    expect(fromParsed.map((r) => r.placement)).toEqual(["right_shank", "left_shank"]);
    expectIdentical(fromParsed, fromText);
  });

  it("reads the uploaded files when the parsed object is missing, belongs to other files, or an uploaded file is gone", async () => {
    const viaText = (r: SensorRecording[]) => r[0]!.accX.buffer !== r[1]!.accX.buffer;
    const withoutParsed = new Map(objects);
    withoutParsed.delete("k/parsed");
    expect(viaText(await loadRecordings({ storage: storage(withoutParsed) } as never, rows, "k/parsed"))).toBe(true);
    const otherRows = rows.map((r, i) => (i === 0 ? { ...r, sha256: "f".repeat(64) } : r));
    expect(viaText(await loadRecordings({ storage: storage(objects) } as never, otherRows, "k/parsed"))).toBe(true);
    const lostOne = new Map(objects);
    lostOne.delete(`k/${synth.files[0]!.fileName}`);
    await expect(loadRecordings({ storage: storage(lostOne) } as never, rows, "k/parsed")).rejects.toBeInstanceOf(ObjectNotFoundError);
  });
});
