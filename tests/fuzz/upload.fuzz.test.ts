import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { readSensorCsv } from "@pendula/signal";
import { createTestContext, type SeededUser, type TestContext } from "../../ingest-server/src/testing/harness";
import { seedDevices, storedCounts, upload } from "../../ingest-server/src/testing/session-fixtures";
import { baseBids, baseSensorCsv, CELL_PAYLOADS, mutate, mutationArb } from "../../signal/src/testing/hostile-text";

/**
 * POST /api/sessions under hostile files. Property: never a 5xx; every refusal is a 4xx with
 * {error: {code, message}} and leaves the walk_sessions / raw_files counts and the objects in the
 * S3 fake unchanged. When a mutation happens to leave a file the reader accepts (e.g. a truncation
 * on a line boundary), the upload may succeed, and then exactly one session with its files is stored.
 */
const MAX_FILE_BYTES = 256 * 1024;
const RANDOM_RUNS = 60;

let ctx: TestContext;
let patient: SeededUser;
let token: string;
let serial: string;
let cases = 0;

beforeAll(async () => {
  ctx = await createTestContext({ env: { UPLOAD_MAX_FILE_BYTES: String(MAX_FILE_BYTES), UPLOAD_RATE_LIMIT: "10000" } });
  patient = await ctx.seedUser({ role: "patient" });
  serial = (await seedDevices(ctx, patient.patientId!, "FZU", { placements: ["left_shank"] })).left_shank!;
  token = await ctx.tokenFor(patient);
});

afterAll(async () => {
  console.log(`upload fuzz: ${cases} upload cases`);
  await ctx?.close();
});

type File = { fileName: string; text: string | Buffer };

/** Sends the files and checks the invariants; returns the status. */
async function hostileUpload(files: File[], label: string, fields: Record<string, string> = {}): Promise<number> {
  cases++;
  const before = await storedCounts(ctx);
  const res = await upload(ctx, token, files, fields);
  const after = await storedCounts(ctx);
  const where = `${label}: ${res.status} ${res.text.slice(0, 200)}`;
  expect(res.status, where).toBeLessThan(500);
  if (res.status >= 400) {
    expect(res.body?.error?.code, where).toEqual(expect.any(String));
    expect(res.body?.error?.message, where).toEqual(expect.any(String));
    expect(res.body.error.message.length, where).toBeGreaterThan(0);
    expect(after, where).toEqual(before);
  } else if (res.status === 202) {
    // The files and their parsed recordings (uploads/parsed-recordings.ts).
    expect(after, where).toEqual({ sessions: before.sessions + 1, files: before.files + files.length, objects: before.objects + files.length + 1 });
  } else {
    expect(res.status, where).toBe(200);
    expect(res.body.duplicate, where).toBe(true);
    expect(after, where).toEqual(before);
  }
  return res.status;
}

const readerAccepts = (text: string) => {
  try {
    readSensorCsv(text, "x.csv", { maxChars: MAX_FILE_BYTES });
    return true;
  } catch {
    return false;
  }
};

describe("POST /api/sessions with hostile files", () => {
  it("refuses a catalogue of known-bad files with a 4xx and a message, storing nothing", async () => {
    const good = baseSensorCsv(serial, { seed: 11 });
    const lines = good.text.split("\n");
    const dataAt = lines.findIndex((l) => /^\d/.test(l));
    const withCell = (payload: string, col = 1) =>
      lines.map((l, i) => (i === dataAt + 10 ? l.split(",").map((c, k) => (k === col ? payload : c)).join(",") : l)).join("\n");
    const header = (key: string, value: string) => lines.map((l) => (l.startsWith(`# ${key}:`) ? `# ${key}: ${value}` : l)).join("\n");
    const b = baseBids();
    const catalogue: Array<[string, File[], number[]]> = [
      ["0-byte file", [{ fileName: "empty.csv", text: "" }], [422]],
      ["over the size limit", [{ fileName: "big.csv", text: good.text + "\n".repeat(MAX_FILE_BYTES) }], [413]],
      ["zip-like payload named .csv", [{ fileName: "walk.csv", text: Buffer.from([0x50, 0x4b, 0x03, 0x04, 0x14, 0, 0, 0, 8, 0]) }], [422]],
      ["PK header as text", [{ fileName: "walk.csv", text: `PK\u0003\u0004${good.text}` }], [422]],
      ["random bytes", [{ fileName: "noise.bin", text: Buffer.from(Array.from({ length: 4096 }, (_, i) => (i * 7919 + 13) % 256)) }], [422]],
      ["not UTF-8", [{ fileName: "latin.csv", text: Buffer.concat([Buffer.from(good.text.slice(0, 200)), Buffer.from([0xff, 0xfe, 0xc3])]) }], [422]],
      ["truncated mid-row", [{ fileName: "cut.csv", text: `${good.text.slice(0, Math.floor(good.text.length / 2))},` }], [422]],
      ["header only", [{ fileName: "head.csv", text: lines.slice(0, dataAt).join("\n") }], [422]],
      ["NaN cell", [{ fileName: "nan.csv", text: withCell("NaN") }], [422]],
      ["Infinity cell", [{ fileName: "inf.csv", text: withCell("Infinity") }], [422]],
      ["1e39 cell", [{ fileName: "overflow.csv", text: withCell("1e39") }], [422]],
      ["formula injection cell", [{ fileName: "formula.csv", text: withCell("=cmd|' /C calc'!A0") }], [422]],
      ["formula injection as the device serial", [{ fileName: "serial.csv", text: header("device", "=cmd|' /C calc'!A0") }], [422]],
      ["SQL in the device serial", [{ fileName: "sql.csv", text: header("device", "'; DROP TABLE devices; --") }], [422]],
      ["time going backwards", [{ fileName: "back.csv", text: lines.map((l, i) => (i === dataAt + 5 ? lines[dataAt + 6]! : i === dataAt + 6 ? lines[dataAt + 5]! : l)).join("\n") }], [422]],
      ["duplicate header key", [{ fileName: "dup.csv", text: [lines[0], `# device: ${serial}`, ...lines.slice(1)].join("\n") }], [422]],
      ["duplicate column", [{ fileName: "dupcol.csv", text: lines.map((l, i) => (i === dataAt - 1 ? l.replace("acc_y", "acc_x") : l)).join("\n") }], [422]],
      ["wrong units", [{ fileName: "units.csv", text: header("units", "acc=furlong/s2, gyro=deg/s") }], [422]],
      ["start time not UTC", [{ fileName: "tz.csv", text: header("start_utc", "2026-03-02T10:00:00+01:00") }], [422]],
      ["unknown device", [{ fileName: "who.csv", text: header("device", "NOT-A-DEVICE") }], [422]],
      ["huge line", [{ fileName: "long.csv", text: [...lines.slice(0, dataAt + 2), "1".repeat(200_000), ...lines.slice(dataAt + 2)].join("\n") }], [422]],
      ["same name twice", [good, good], [422]],
      ["BIDS data file without sidecars", [{ fileName: `${b.stem}_motion.tsv`, text: b.motionTsv }], [422]],
      [
        "BIDS set with broken JSON",
        [
          { fileName: `${b.stem}_motion.tsv`, text: b.motionTsv },
          { fileName: `${b.stem}_channels.tsv`, text: b.channelsTsv },
          { fileName: `${b.stem}_motion.json`, text: '{"SamplingFrequency": "fast"' },
        ],
        [422],
      ],
      ["BIDS channels named as CSV", [{ fileName: "channels.csv", text: b.channelsTsv }], [422]],
      ["too many files", Array.from({ length: ctx.config.upload.maxFiles + 1 }, (_, i) => ({ fileName: `f${i}.csv`, text: good.text })), [413]],
    ];
    for (const [label, files, statuses] of catalogue) {
      const status = await hostileUpload(files, label);
      expect(statuses, `${label} → ${status}`).toContain(status);
    }
    // A bad form field next to a good file.
    expect(await hostileUpload([good], "startUtc not a date", { startUtc: "yesterday" })).toBe(400);
    expect(await hostileUpload([good], "patientId not a UUID", { patientId: "' OR 1=1 --" })).toBe(400);
    // And the good file itself is accepted once (the catalogue was refused for its content, not by accident).
    expect(await hostileUpload([good], "the unmutated file")).toBe(202);
    expect(await hostileUpload([good], "the unmutated file again")).toBe(200);
  });

  it(`never answers 5xx and never leaves partial rows or objects for ${RANDOM_RUNS} generated uploads`, async () => {
    let refused = 0;
    let seed = 100;
    await fc.assert(
      fc.asyncProperty(
        fc.oneof(
          { weight: 3, arbitrary: fc.array(mutationArb, { minLength: 1, maxLength: 3 }).map((m) => ({ kind: "mutated" as const, m })) },
          { weight: 1, arbitrary: fc.uint8Array({ minLength: 0, maxLength: 3000 }).map((bytes) => ({ kind: "bytes" as const, bytes })) },
          { weight: 1, arbitrary: fc.constantFrom(...CELL_PAYLOADS).map((p) => ({ kind: "payload-file" as const, p })) },
        ),
        async (c) => {
          seed++;
          let file: File;
          if (c.kind === "mutated") {
            const base = baseSensorCsv(serial, { seed, durationS: 6, startUtc: `2026-04-${String(1 + (seed % 28)).padStart(2, "0")}T08:${String(seed % 60).padStart(2, "0")}:00.000Z` });
            file = { fileName: `m${seed}.csv`, text: c.m.reduce((s, m) => mutate(s, m, ","), base.text) };
          } else if (c.kind === "bytes") {
            file = { fileName: `b${seed}.csv`, text: Buffer.from(c.bytes) };
          } else {
            file = { fileName: `p${seed}.csv`, text: `# pendula-sensor: 1\n${c.p}\n` };
          }
          const status = await hostileUpload([file], `${c.kind} ${JSON.stringify(c).slice(0, 200)}`);
          if (status >= 400) refused++;
          // A text the reader refuses must never be stored.
          const text = Buffer.isBuffer(file.text) ? file.text.toString("utf8") : file.text;
          if (!readerAccepts(text)) expect(status).toBeGreaterThanOrEqual(400);
        },
      ),
      { numRuns: RANDOM_RUNS, seed: 4242 },
    );
    console.log(`upload fuzz: ${RANDOM_RUNS} generated uploads, ${refused} refused with 4xx`);
    expect(refused).toBeGreaterThan(RANDOM_RUNS / 2);
  });
});
