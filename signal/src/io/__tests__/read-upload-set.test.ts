import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { bidsMotionText } from "../../synth/bids-motion-text";
import { synthesizeSession } from "../../synth";
import { readBidsMotion } from "../read-bids-motion";
import { readSensorCsv } from "../read-sensor-csv";
import { readUploadSet, type UploadFile } from "../read-upload-set";
import { isWellFormedUtf8 } from "../utf8";

const enc = (text: string) => new TextEncoder().encode(text);
const file = (name: string, text: string | Uint8Array): UploadFile => ({ name, bytes: typeof text === "string" ? enc(text) : text });
const START = "2026-11-23T09:15:02.120Z";

const session = synthesizeSession({ seed: 11, durationS: 30 });
const csv = session.files.map((f) => file(f.fileName, f.text));
const recs = session.files.map((f) => readSensorCsv(f.text, f.fileName));
const bids = bidsMotionText(recs.slice(0, 2), { stem: "sub-demo03_task-homewalk_tracksys-imu" });
const bidsFiles = [file(bids.motionFileName, bids.motionTsv), file(bids.channelsFileName, bids.channelsTsv), file(bids.jsonFileName, bids.motionJson)];

const messages = (files: UploadFile[], options = {}) => readUploadSet(files, options).errors.map((e) => e.message);

describe("readUploadSet(files) — recordings", () => {
  it("reads sensor CSV files into the recordings the text reader gives, in file order", () => {
    const set = readUploadSet(csv);
    expect(set.errors).toEqual([]);
    expect(set.recordings.map((r) => r.placement)).toEqual(recs.map((r) => r.placement));
    set.recordings.forEach((r, i) => expect(Array.from(r.gyroZ)).toEqual(Array.from(recs[i]!.gyroZ)));
    expect(set.recordingFile).toEqual([0, 1, 2, 3]);
    expect(set.files.map((f) => f.format)).toEqual(["pendula-csv-v1", "pendula-csv-v1", "pendula-csv-v1", "pendula-csv-v1"]);
  });

  it("groups a BIDS set by its stem in any order and case, puts its tracked points after the CSV files, and names its data file on all three", () => {
    const shuffled = [bidsFiles[2]!, csv[2]!, { ...bidsFiles[0]!, name: `folder/${bids.motionFileName}` }, bidsFiles[1]!];
    const set = readUploadSet(shuffled, { bidsStartUtc: START });
    expect(set.errors).toEqual([]);
    expect(set.recordings.map((r) => r.placement)).toEqual([recs[2]!.placement, "left_shank", "right_shank"]);
    expect(set.recordingFile).toEqual([1, 2, 2]);
    expect(set.files.map((f) => f.bidsMotionFile ?? null)).toEqual([bids.motionFileName, null, bids.motionFileName, bids.motionFileName]);
    expect(set.files[2]!.name).toBe(bids.motionFileName);
    expect(set.files[2]!.recordingIndexes).toEqual([1, 2]);
    const reference = readBidsMotion({ ...bids, startUtc: START });
    expect(Array.from(set.recordings[1]!.accY)).toEqual(Array.from(reference[0]!.accY));
    expect(set.recordings[1]!.startUtc).toBe(START);
  });

  it("takes each BIDS set's clock time from a function of its data file's name", () => {
    const set = readUploadSet(bidsFiles, { bidsStartUtc: (name: string) => (name === bids.motionFileName ? START : undefined) });
    expect(set.recordings.every((r) => r.startUtc === START)).toBe(true);
  });

  it("reads a file with a byte-order mark like one without", () => {
    const withBom = new Uint8Array([0xef, 0xbb, 0xbf, ...csv[0]!.bytes]);
    const set = readUploadSet([file(csv[0]!.name, withBom)]);
    expect(set.errors).toEqual([]);
    expect(Array.from(set.recordings[0]!.accX)).toEqual(Array.from(recs[0]!.accX));
  });
});

// The messages below are the upload's since its first version (ingest-server parse-upload); they
// reach the person uploading, so they are pinned word for word.
describe("readUploadSet(files) — problems, in the order the upload reports them", () => {
  it("an empty set", () => {
    expect(readUploadSet([]).errors).toEqual([{ code: "no-files", file: "", message: "no files uploaded: send one or more sensor files in the multipart field `files`" }]);
  });

  it("a name twice (folders cut, case ignored)", () => {
    expect(messages([csv[0]!, { ...csv[1]!, name: `x/${csv[0]!.name.toUpperCase()}` }])).toEqual([
      `${csv[0]!.name.toUpperCase()}: the same file name appears twice in one upload`,
    ]);
  });

  it("empty, binary and non-UTF-8 files", () => {
    expect(messages([file("a.csv", ""), file("b.csv", new Uint8Array([0x50, 0x4b, 3, 4, 0])), file("c.csv", new Uint8Array([0x41, 0xc3, 0x28]))])).toEqual([
      "a.csv: file is empty",
      "b.csv: binary content (byte 4 is NUL); expected a text sensor file",
      "c.csv: not UTF-8 text",
    ]);
  });

  it("unrecognised content, and BIDS content under the wrong name", () => {
    expect(messages([file("notes.txt", "hello"), file("walk.tsv", bids.motionTsv), file("sub-1_meta.json", bids.motionJson)])).toEqual([
      'notes.txt: unrecognised content; expected a Pendula sensor CSV (first line "# pendula-sensor: 1") or a BIDS Motion file set',
      "walk.tsv: content is a BIDS Motion motion-tsv file, so its name must end in _motion.tsv",
      "sub-1_meta.json: content is a BIDS Motion motion-json file, so its name must end in _motion.json",
    ]);
  });

  it("a CSV reader error keeps its file, line and column", () => {
    const broken = session.files[0]!.text.replace(/\n(\d[^,\n]*),[^,\n]*/, "\n$1,abc");
    const [error] = readUploadSet([file("left.csv", broken)]).errors;
    expect(error).toMatchObject({ code: "invalid-file", file: "left.csv", column: "acc_x" });
    expect(error!.message).toMatch(/^left\.csv: line \d+, column acc_x: "abc" is not a number$/);
  });

  it("incomplete BIDS sets", () => {
    expect(messages([bidsFiles[1]!])).toEqual([`${bids.channelsFileName}: BIDS Motion sidecar without its _motion.tsv data file in the same upload`]);
    expect(messages([bidsFiles[0]!, bidsFiles[2]!])).toEqual([`${bids.motionFileName}: missing ${bids.channelsFileName} in the same upload`]);
    expect(messages([bidsFiles[0]!, bidsFiles[1]!])).toEqual([`${bids.motionFileName}: missing ${bids.jsonFileName} in the same upload`]);
  });

  it("a BIDS set without a clock time when one is required", () => {
    expect(messages(bidsFiles, { requireBidsStartUtc: true })).toEqual([
      `${bids.motionFileName}: BIDS Motion data carries no acquisition time; send the form field startUtc (ISO 8601 UTC of the first sample)`,
    ]);
    expect(messages(bidsFiles)).toEqual([]);
  });

  it("a sidecar's own problem is reported on the sidecar", () => {
    const set = readUploadSet([bidsFiles[0]!, bidsFiles[1]!, file(bids.jsonFileName, '{"SamplingFrequency": "fast"}')], { bidsStartUtc: START });
    expect(set.errors.map((e) => e.file)).toEqual([bids.jsonFileName]);
    expect(set.files[2]!.error?.message).toBe(`${bids.jsonFileName}: column SamplingFrequency: SamplingFrequency must be a number in (0, 10000] Hz`);
    expect(set.files[0]!.error).toBeUndefined();
    expect(set.recordings).toEqual([]);
  });

  it("reports every problem, earlier checks first, and still reads the good files", () => {
    const badCsv = file("late.csv", session.files[1]!.text.replace("# pendula-sensor: 1", "# pendula-sensor: 1\n# sample_rate_hz: x"));
    const set = readUploadSet([badCsv, csv[0]!, file("z.csv", "")]);
    expect(set.errors.map((e) => e.file)).toEqual(["z.csv", "late.csv"]);
    expect(set.recordings).toHaveLength(1);
    expect(set.files.map((f) => Boolean(f.error))).toEqual([true, false, true]);
  });
});

describe("isWellFormedUtf8(bytes)", () => {
  // Reference: the WHATWG Encoding Standard's UTF-8 decoder with fatal: true (TextDecoder).
  const fatal = new TextDecoder("utf-8", { fatal: true });
  const byDecoder = (b: Uint8Array) => {
    try {
      fatal.decode(b);
      return true;
    } catch {
      return false;
    }
  };

  it("refuses overlong forms, surrogates, code points above U+10FFFF and truncated sequences (RFC 3629 §3–4)", () => {
    for (const bad of [[0xc0, 0x80], [0xe0, 0x80, 0x80], [0xed, 0xa0, 0x80], [0xf4, 0x90, 0x80, 0x80], [0xf5, 0x80, 0x80, 0x80], [0xe2, 0x82], [0x80], [0xff]]) {
      expect(isWellFormedUtf8(new Uint8Array(bad)), bad.join(" ")).toBe(false);
    }
    expect(isWellFormedUtf8(enc("t_s,°/s,ü,€,𝄞"))).toBe(true);
  });

  it("agrees with TextDecoder on 2000 random byte strings and on 500 random texts", () => {
    fc.assert(fc.property(fc.uint8Array({ maxLength: 40 }), (b) => isWellFormedUtf8(b) === byDecoder(b)), { numRuns: 2000, seed: 20_261_204 });
    fc.assert(fc.property(fc.string({ unit: "binary", maxLength: 60 }), (s) => isWellFormedUtf8(enc(s)) === byDecoder(enc(s))), { numRuns: 500, seed: 20_261_205 });
  });
});
