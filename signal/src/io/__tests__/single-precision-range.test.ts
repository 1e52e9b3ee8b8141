import { describe, expect, it } from "vitest";
import { readBidsMotion } from "../read-bids-motion";
import { readSensorCsv } from "../read-sensor-csv";
import { SignalInputError } from "../../types";

// Regression: 1e39 is a valid decimal but beyond single precision (max ≈ 3.4e38, IEEE 754 binary32),
// so the readers stored Infinity and handed it to the analysis.
const csv = (cell: string) =>
  [
    "# pendula-sensor: 1",
    "# device: X-1",
    "# sample_rate_hz: 100",
    "# start_utc: 2026-01-05T10:00:00.000Z",
    "# units: acc=g, gyro=deg/s",
    "t_s,acc_x,acc_y,acc_z,gyro_x,gyro_y,gyro_z",
    "0.00,0,0,1,1,2,3",
    `0.01,${cell},0,1,1,2,3`,
  ].join("\n");

describe("readers and values beyond single precision", () => {
  it("readSensorCsv refuses 1e39 (and 3e38 g, which overflows once scaled to m/s²) naming line and column", () => {
    for (const cell of ["1e39", "3e38"]) {
      expect(() => readSensorCsv(csv(cell), "big.csv")).toThrow(SignalInputError);
      expect(() => readSensorCsv(csv(cell), "big.csv")).toThrow(/line 8, column acc_x/);
    }
    expect(readSensorCsv(csv("1e30"), "fine.csv").accX[1]).toBeCloseTo(1e30 * 9.80665, -25);
  });

  it("readBidsMotion refuses 1e39 in a GYRO channel", () => {
    const channels = [
      "name\tcomponent\ttype\ttracked_point\tunits",
      ...["x", "y", "z"].map((c) => `A${c}\t${c}\tACCEL\tLeftShank\tm/s^2`),
      ...["x", "y", "z"].map((c) => `G${c}\t${c}\tGYRO\tLeftShank\tdeg/s`),
    ].join("\n");
    const read = (v: string) => () =>
      readBidsMotion({
        motionTsv: `0\t0\t9.8\t1\t2\t3\n0\t0\t9.8\t${v}\t2\t3`,
        motionFileName: "s_motion.tsv",
        channelsTsv: channels,
        channelsFileName: "s_channels.tsv",
        motionJson: '{"SamplingFrequency": 100}',
        jsonFileName: "s_motion.json",
      });
    expect(read("1e39")).toThrow(SignalInputError);
    expect(read("1e39")).toThrow(/column Gx/);
    expect(read("5")()[0]!.gyroX[1]).toBe(5);
  });
});
