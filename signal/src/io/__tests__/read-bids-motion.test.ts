import { describe, expect, it } from "vitest";
import { SignalInputError } from "../../types";
import { bidsSidecarNames, readBidsMotion } from "../read-bids-motion";
import { placementFromLabel } from "../placement-names";
import { sniffFormat } from "../sniff";

// Layout per the BIDS specification, motion data (docs/methods.md#bids-motion): headerless
// *_motion.tsv whose columns follow the rows of *_channels.tsv (required name, component, type,
// tracked_point, units).
const CHANNELS = [
  "name\tcomponent\ttype\ttracked_point\tunits",
  "t1_acc_x\tx\tACCEL\tLeftShank\tm/s^2",
  "t1_acc_y\ty\tACCEL\tLeftShank\tm/s^2",
  "t1_acc_z\tz\tACCEL\tLeftShank\tm/s^2",
  "t1_gyro_x\tx\tGYRO\tLeftShank\trad/s",
  "t1_gyro_y\ty\tGYRO\tLeftShank\trad/s",
  "t1_gyro_z\tz\tGYRO\tLeftShank\trad/s",
  "t2_acc_x\tx\tACCEL\tright-shank\tg",
  "t2_acc_y\ty\tACCEL\tright-shank\tg",
  "t2_acc_z\tz\tACCEL\tright-shank\tg",
  "t2_gyro_x\tx\tGYRO\tright-shank\tdeg/s",
  "t2_gyro_y\ty\tGYRO\tright-shank\tdeg/s",
  "t2_gyro_z\tz\tGYRO\tright-shank\tdeg/s",
].join("\n");
const ROW = (i: number) => [0, 9.8, 0, 0, 0, i * 0.1, 0, 1, 0, 0, 0, i].join("\t");
const MOTION = [ROW(0), ROW(1), ROW(2), ROW(3)].join("\n") + "\n";
const JSON_TEXT = JSON.stringify({ SamplingFrequency: 100, TrackingSystemName: "imu", TaskName: "walk" });
const base = {
  motionTsv: MOTION,
  motionFileName: "sub-01_task-walk_tracksys-imu_motion.tsv",
  channelsTsv: CHANNELS,
  channelsFileName: "sub-01_task-walk_tracksys-imu_channels.tsv",
  motionJson: JSON_TEXT,
  jsonFileName: "sub-01_task-walk_tracksys-imu_motion.json",
};

function expectError(fn: () => unknown, file: string, pattern: RegExp, line?: number): void {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(SignalInputError);
    expect((e as SignalInputError).fileName).toBe(file);
    if (line !== undefined) expect((e as SignalInputError).line).toBe(line);
    expect((e as Error).message).toMatch(pattern);
    return;
  }
  throw new Error("expected a SignalInputError");
}

describe("readBidsMotion(texts)", () => {
  it("returns one recording per tracked point, mapped to placements, converted to deg/s and m/s²", () => {
    const recs = readBidsMotion(base);
    expect(recs.map((r) => r.placement)).toEqual(["left_shank", "right_shank"]);
    const [left, right] = recs;
    expect(left!.nominalSampleRateHz).toBe(100);
    expect(Array.from(left!.timeS)).toEqual([0, 0.01, 0.02, 0.03]);
    expect(left!.gyroZ[3]).toBeCloseTo((0.3 * 180) / Math.PI, 4);
    expect(right!.accY[0]).toBeCloseTo(9.80665, 5);
    expect(right!.gyroZ[2]).toBe(2);
  });

  it("drops samples with n/a (MissingValues) so the time base sees a gap", () => {
    const motion = [ROW(0), ROW(1).replace(/^0/, "n/a"), ROW(2)].join("\n");
    const [left, right] = readBidsMotion({ ...base, motionTsv: motion });
    expect(Array.from(left!.timeS)).toEqual([0, 0.02]);
    expect(right!.timeS.length).toBe(3);
  });

  it("uses a LATENCY channel for time when present", () => {
    const channels = CHANNELS + "\nlatency\tn/a\tLATENCY\tn/a\tms";
    const motion = [0, 1, 2].map((i) => ROW(i) + "\t" + [0, 12, 19][i]).join("\n");
    const [left] = readBidsMotion({ ...base, channelsTsv: channels, motionTsv: motion });
    expect(Array.from(left!.timeS)).toEqual([0, 0.012, 0.019]);
  });

  it("rejects a motion row whose cell count differs from the channel count", () =>
    expectError(() => readBidsMotion({ ...base, motionTsv: ROW(0) + "\n1\t2\n" }), base.motionFileName, /expected 12 cells/, 2));
  it("rejects a non-numeric cell", () =>
    expectError(() => readBidsMotion({ ...base, motionTsv: ROW(0).replace(/^0/, "x") }), base.motionFileName, /"x" is not a number/, 1));
  it("rejects an empty motion file", () => expectError(() => readBidsMotion({ ...base, motionTsv: "" }), base.motionFileName, /empty/));
  it("rejects a channels file without tracked_point", () =>
    expectError(
      () => readBidsMotion({ ...base, channelsTsv: CHANNELS.replace("tracked_point", "where") }),
      base.channelsFileName,
      /"tracked_point" is missing/,
      1,
    ));
  it("rejects unknown units", () =>
    expectError(() => readBidsMotion({ ...base, channelsTsv: CHANNELS.replace("deg/s", "rpm") }), base.channelsFileName, /unknown GYRO unit "rpm"/, 11));
  it("rejects a tracked point without gyro channels", () => {
    const lines = CHANNELS.split("\n").filter((l) => !l.startsWith("t2_gyro"));
    const motion = [0, 1].map(() => Array(9).fill(0).join("\t")).join("\n");
    expectError(() => readBidsMotion({ ...base, channelsTsv: lines.join("\n"), motionTsv: motion }), base.channelsFileName, /no GYRO x channel/);
  });
  it("rejects a sidecar without a numeric SamplingFrequency", () =>
    expectError(() => readBidsMotion({ ...base, motionJson: '{"SamplingFrequency":"n/a"}' }), base.jsonFileName, /SamplingFrequency/));
  it("rejects a sidecar that is not JSON", () => expectError(() => readBidsMotion({ ...base, motionJson: "{" }), base.jsonFileName, /not valid JSON/));
  it("rejects a LATENCY that does not increase", () => {
    const channels = CHANNELS + "\nlatency\tn/a\tLATENCY\tn/a\ts";
    const motion = [0, 1].map((i) => ROW(i) + "\t0.5").join("\n");
    expectError(() => readBidsMotion({ ...base, channelsTsv: channels, motionTsv: motion }), base.motionFileName, /does not increase/, 2);
  });
  it("rejects a motion file above the size limit", () =>
    expectError(() => readBidsMotion({ ...base, maxChars: 10 }), base.motionFileName, /larger than/));
});

describe("placementFromLabel(label) — tracked-point table", () => {
  it.each([
    ["LeftShank", "left_shank"],
    ["left_shank", "left_shank"],
    ["left-shank", "left_shank"],
    ["LEFT SHANK", "left_shank"],
    ["RightShank", "right_shank"],
    ["LeftWrist", "left_wrist"],
    ["right_wrist", "right_wrist"],
    ["LeftFoot", "left_foot"],
    ["Right-Foot", "right_foot"],
    ["LowerBack", "lower_back"],
  ])("%s → %s", (label, placement) => expect(placementFromLabel(label)).toBe(placement));
  it("returns null for labels outside the table", () => expect(placementFromLabel("LeftKnee")).toBeNull());
});

describe("bidsSidecarNames(motionFileName)", () => {
  it("derives the channels and JSON sidecars from the same entities", () =>
    expect(bidsSidecarNames("sub-01_task-walk_tracksys-imu_run-1_motion.tsv")).toEqual({
      channels: "sub-01_task-walk_tracksys-imu_run-1_channels.tsv",
      json: "sub-01_task-walk_tracksys-imu_run-1_motion.json",
    }));
  it("rejects other names", () => expect(() => bidsSidecarNames("walk.tsv")).toThrow(SignalInputError));
});

describe("sniffFormat(text)", () => {
  it.each([
    ["# pendula-sensor: 1\n# device: x\n", "pendula-csv-v1"],
    [CHANNELS, "bids-channels-tsv"],
    [JSON_TEXT, "bids-motion-json"],
    [MOTION, "bids-motion-tsv"],
    ["n/a\t1.5\t-2e3\n", "bids-motion-tsv"],
    ["hello world", "unknown"],
    ["", "unknown"],
  ])("%#: detects %s", (text, format) => expect(sniffFormat(text)).toBe(format));
});
