import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { readBidsMotion, readSensorCsv, sniffFormat, SignalInputError } from "@pendula/signal";
import { baseBids, baseSensorCsv, JSON_MUTATIONS, mutate, mutationArb, recordingProblems } from "../../signal/src/testing/hostile-text";

/**
 * Property: on any text, the readers either return recordings that hold the invariants of a
 * SensorRecording (equal lengths, finite values, strictly increasing time) or throw a
 * SignalInputError with a message — never another exception type. A hang fails through the test
 * timeout. Seeds are fixed so a failure reproduces; fast-check prints the shrunk counterexample.
 */
const SEED = 20_261_207;
const CSV_RUNS = 200;
const BIDS_RUNS = 200;
const RANDOM_RUNS = 100;

type Outcome = "accepted" | "rejected";

function classify(read: () => unknown[], where: string): Outcome {
  let out: unknown[];
  try {
    out = read();
  } catch (err) {
    if (!(err instanceof SignalInputError)) {
      throw new Error(`${where}: threw ${(err as Error)?.name ?? typeof err} instead of SignalInputError: ${(err as Error)?.message}`);
    }
    if (!err.message) throw new Error(`${where}: SignalInputError without a message`);
    return "rejected";
  }
  for (const r of out) {
    const problems = recordingProblems(r as Parameters<typeof recordingProblems>[0]);
    if (problems.length) throw new Error(`${where}: returned an invalid recording: ${problems.join("; ")}`);
  }
  return "accepted";
}

const tally = () => ({ accepted: 0, rejected: 0 });

describe("readSensorCsv on hostile text", () => {
  const base = baseSensorCsv("FZ-CSV-1");

  it("reads the unmutated base file (the mutations start from a valid file)", () => {
    expect(classify(() => [readSensorCsv(base.text, base.fileName)], "base")).toBe("accepted");
  });

  it(`returns a valid recording or throws SignalInputError for ${CSV_RUNS} mutated files`, () => {
    const t = tally();
    fc.assert(
      fc.property(fc.array(mutationArb, { minLength: 1, maxLength: 3 }), (mutations) => {
        const text = mutations.reduce((s, m) => mutate(s, m, ","), base.text);
        t[classify(() => [readSensorCsv(text, "fuzz.csv")], JSON.stringify(mutations).slice(0, 300))]++;
      }),
      { numRuns: CSV_RUNS, seed: SEED },
    );
    console.log(`readSensorCsv: ${CSV_RUNS} mutated cases (${t.accepted} accepted as valid, ${t.rejected} rejected with SignalInputError)`);
    // The mutations are meant to break files; most must be refused, or the generator is toothless.
    expect(t.rejected).toBeGreaterThan(CSV_RUNS / 2);
  });

  it(`returns a valid recording or throws SignalInputError for ${RANDOM_RUNS} random texts behind the magic line`, () => {
    const t = tally();
    fc.assert(
      fc.property(fc.string({ unit: "binary", maxLength: 3000 }), fc.boolean(), (junk, withMagic) => {
        const text = withMagic ? `# pendula-sensor: 1\n${junk}` : junk;
        t[classify(() => [readSensorCsv(text, "random.csv")], JSON.stringify(text.slice(0, 200)))]++;
        expect(typeof sniffFormat(text)).toBe("string");
      }),
      { numRuns: RANDOM_RUNS, seed: SEED + 1 },
    );
    console.log(`readSensorCsv: ${RANDOM_RUNS} random cases (${t.rejected} rejected)`);
    expect(t.rejected).toBe(RANDOM_RUNS);
  });

  it("refuses a value that overflows the stored single precision (1e39 m/s²) instead of storing Infinity", () => {
    const lines = base.text.split("\n");
    const i = lines.findIndex((l) => /^\d/.test(l)) + 3;
    const cells = lines[i]!.split(",");
    cells[1] = "1e39";
    lines[i] = cells.join(",");
    expect(() => readSensorCsv(lines.join("\n"), "overflow.csv")).toThrow(SignalInputError);
  });
});

describe("readBidsMotion on hostile text", () => {
  const b = baseBids();
  const read = (motionTsv: string, channelsTsv: string, motionJson: string) => () =>
    readBidsMotion({
      motionTsv,
      motionFileName: `${b.stem}_motion.tsv`,
      channelsTsv,
      channelsFileName: `${b.stem}_channels.tsv`,
      motionJson,
      jsonFileName: `${b.stem}_motion.json`,
      startUtc: "2026-03-02T10:00:00.000Z",
    });

  it("reads the unmutated base set", () => {
    expect(classify(read(b.motionTsv, b.channelsTsv, b.motionJson), "base")).toBe("accepted");
  });

  it(`returns valid recordings or throws SignalInputError for ${BIDS_RUNS} mutated sets`, () => {
    const t = tally();
    fc.assert(
      fc.property(
        fc.constantFrom("motion", "channels", "json"),
        fc.array(mutationArb, { minLength: 1, maxLength: 3 }),
        fc.constantFrom(...JSON_MUTATIONS),
        (target, mutations, json) => {
          const apply = (s: string) => mutations.reduce((x, m) => mutate(x, m, "\t"), s);
          const motion = target === "motion" ? apply(b.motionTsv) : b.motionTsv;
          const channels = target === "channels" ? apply(b.channelsTsv) : b.channelsTsv;
          const meta = target === "json" ? (mutations[0]!.kind === "truncate" ? apply(b.motionJson) : json) : b.motionJson;
          t[classify(read(motion, channels, meta), `${target} ${JSON.stringify(mutations).slice(0, 300)}`)]++;
        },
      ),
      { numRuns: BIDS_RUNS, seed: SEED + 2 },
    );
    console.log(`readBidsMotion: ${BIDS_RUNS} mutated cases (${t.accepted} accepted as valid, ${t.rejected} rejected with SignalInputError)`);
    expect(t.rejected).toBeGreaterThan(BIDS_RUNS / 3);
  });

  it(`throws SignalInputError for ${RANDOM_RUNS} random motion/channels/JSON texts`, () => {
    const t = tally();
    fc.assert(
      fc.property(fc.string({ unit: "binary", maxLength: 1500 }), fc.string({ unit: "binary", maxLength: 500 }), fc.json(), (motion, channels, json) => {
        t[classify(read(motion, channels, json), "random")]++;
      }),
      { numRuns: RANDOM_RUNS, seed: SEED + 3 },
    );
    console.log(`readBidsMotion: ${RANDOM_RUNS} random cases (${t.rejected} rejected)`);
    expect(t.rejected).toBe(RANDOM_RUNS);
  });
});
