import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { HttpError } from "../../http-error";
import { parseUpload } from "../parse-upload";
import { bidsSetFromSynth, synthFor } from "../../testing/session-fixtures";
import { ParsePool } from "../parse-pool";

// The parse thread must be invisible to clients: the same files give the same summary and the
// same refusals (status, code, message, details) as parseUpload run on the main thread.
let dir: string;
const pool = new ParsePool(2);

beforeAll(() => {
  dir = mkdtempSync(path.join(tmpdir(), "pendula-parse-pool-"));
});
afterAll(async () => {
  await pool.close();
  rmSync(dir, { recursive: true, force: true });
});

let n = 0;
function onDisk(files: Array<{ fileName: string; text: string | Buffer }>) {
  const batch = n++;
  return files.map((f, i) => {
    const file = path.join(dir, `${batch}-${i}`);
    writeFileSync(file, f.text);
    return { originalName: f.fileName, path: file, buffer: Buffer.isBuffer(f.text) ? f.text : Buffer.from(f.text, "utf8") };
  });
}

async function refusalOf(run: () => unknown): Promise<HttpError> {
  try {
    await run();
  } catch (err) {
    if (err instanceof HttpError) return err;
    throw err;
  }
  throw new Error("expected a refusal");
}

const START = "2026-11-23T09:15:00.000Z";
const MAX = 8 * 1024 * 1024;

describe("ParsePool", () => {
  it("summarises sensor CSV files exactly as parseUpload parses them", async () => {
    const files = onDisk(synthFor({ left_shank: "PP-1", right_shank: "PP-2", left_wrist: "PP-3", right_wrist: "PP-4" }, { seed: 3 }).files);
    const direct = parseUpload(files, { maxChars: MAX });
    const summary = await pool.run({ files: files.map(({ originalName, path: p }) => ({ originalName, path: p })), maxChars: MAX });
    expect(summary.contentSha256).toBe(direct.contentSha256);
    expect(summary.files.map((f) => [f.originalName, f.sha256, f.format, f.sizeBytes, f.recordingIndexes])).toEqual(
      direct.files.map((f) => [f.originalName, f.sha256, f.format, f.buffer.length, f.recordingIndexes]),
    );
    expect(summary.recordings).toEqual(direct.recordings.map((r) => ({ fileName: r.fileName, deviceSerial: r.deviceSerial, placement: r.placement, startUtc: r.startUtc })));
    expect(summary.recordingFile).toEqual(direct.recordingFile);
  });

  it("summarises a BIDS Motion set with its grouping and per-sensor serials", async () => {
    const files = onDisk(bidsSetFromSynth(synthFor({}, { seed: 4, startUtc: START })));
    const direct = parseUpload(files, { maxChars: MAX, bidsStartUtc: START });
    const summary = await pool.run({ files: files.map(({ originalName, path: p }) => ({ originalName, path: p })), maxChars: MAX, bidsStartUtc: START });
    expect(summary.files.map((f) => f.bidsMotionFile)).toEqual(direct.files.map((f) => f.bidsMotionFile));
    expect(summary.recordings.map((r) => r.deviceSerial)).toEqual(direct.recordings.map((r) => r.deviceSerial));
    expect(summary.contentSha256).toBe(direct.contentSha256);
  });

  it.each([
    ["not a sensor file", [{ fileName: "notes.csv", text: "hello\n" }]],
    ["binary content", [{ fileName: "walk.csv", text: Buffer.from([0x50, 0x4b, 0x03, 0x04, 0x00, 0x00]) }]],
    ["an empty file", [{ fileName: "empty.csv", text: "" }]],
    ["a bad number on a data line", [{ fileName: "bad.csv", text: synthFor({ left_shank: "PP-9" }, { seed: 5, placements: ["left_shank"] }).files[0]!.text.replace(/\n0\.01000,[^,]*/, "\n0.01000,abc") }]],
    ["a BIDS sidecar alone", [{ fileName: "sub-01_task-walk_tracksys-imu_channels.tsv", text: bidsSetFromSynth(synthFor({}, { seed: 6, startUtc: START }))[1]!.text }]],
    ["no files", []],
  ])("refuses %s with the same status, code, message and details as parseUpload", async (_label, input) => {
    const files = onDisk(input as Array<{ fileName: string; text: string | Buffer }>);
    const direct = await refusalOf(() => parseUpload(files, { maxChars: MAX }));
    const threaded = await refusalOf(() => pool.run({ files: files.map(({ originalName, path: p }) => ({ originalName, path: p })), maxChars: MAX }));
    expect({ status: threaded.status, code: threaded.code, message: threaded.message, details: threaded.details }).toEqual({
      status: direct.status,
      code: direct.code,
      message: direct.message,
      details: direct.details,
    });
    expect(threaded.status).toBeGreaterThanOrEqual(400);
    expect(threaded.status).toBeLessThan(500);
  });

  it("runs at most `size` jobs at once and queues the rest in order", async () => {
    const small = new ParsePool(1);
    try {
      const files = onDisk(synthFor({ left_shank: "PP-Q" }, { seed: 7, placements: ["left_shank"] }).files).map(({ originalName, path: p }) => ({ originalName, path: p }));
      const jobs = [0, 1, 2].map(() => small.run({ files, maxChars: MAX }));
      expect(small.running).toBe(1);
      expect(small.waiting).toBe(2);
      const out = await Promise.all(jobs);
      expect(new Set(out.map((o) => o.contentSha256)).size).toBe(1);
      expect(small.running + small.waiting).toBe(0);
    } finally {
      await small.close();
    }
  });
});
