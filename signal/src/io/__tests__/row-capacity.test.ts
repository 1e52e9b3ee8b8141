import { describe, expect, it } from "vitest";
import { readBidsMotion } from "../read-bids-motion";
import { readSensorCsv } from "../read-sensor-csv";
import { rowCapacity } from "../row-capacity";
import { SignalInputError } from "../../types";

describe("rowCapacity(text, from, minRowChars)", () => {
  it("counts lines when rows are long enough to fill them", () => {
    expect(rowCapacity("1,2\n3,4\n5,6", 0, 3)).toBe(3);
    expect(rowCapacity("header\n1,2\n3,4\n", 7, 3)).toBe(3);
  });

  it("never exceeds what the text can hold: blank lines do not reserve rows", () => {
    const blank = "\n".repeat(10_000);
    expect(rowCapacity(blank, 0, 11)).toBe(Math.floor(10_000 / 11) + 1);
    expect(rowCapacity(blank, 0, 1)).toBe(10_001);
    expect(rowCapacity("", 0, 5)).toBe(1);
    expect(rowCapacity("abc", 10, 5)).toBe(1);
  });

  it("is an upper bound on the rows a reader can parse (every row of minRowChars fits)", () => {
    const row = "1,2,3";
    for (const n of [1, 2, 7, 50]) {
      const text = Array.from({ length: n }, () => row).join("\n");
      expect(rowCapacity(text, 0, row.length)).toBeGreaterThanOrEqual(n);
    }
  });
});

// Regression: these inputs made the readers reserve cells × lines numbers before reading a row
// (20 000 channels × 20 000 blank lines ≈ 3 GB from a 0.7 MB upload).
describe("readers on many columns and many blank lines", () => {
  it("readBidsMotion refuses a wide channels.tsv over a motion.tsv of blank lines with a SignalInputError", () => {
    const n = 20_000;
    const ch = ["name\tcomponent\ttype\ttracked_point\tunits"];
    for (const t of ["ACCEL", "GYRO"]) for (const c of ["x", "y", "z"]) ch.push(`${t}_${c}\t${c}\t${t}\tLeftShank\t${t === "ACCEL" ? "m/s^2" : "rad/s"}`);
    for (let i = 0; i < n; i++) ch.push(`misc${i}\tn/a\tMISC\tLeftShank\tn/a`);
    const call = () =>
      readBidsMotion({
        motionTsv: `${"\n".repeat(n)}1\t2`,
        motionFileName: "sub-01_motion.tsv",
        channelsTsv: ch.join("\n"),
        channelsFileName: "sub-01_channels.tsv",
        motionJson: '{"SamplingFrequency":100}',
        jsonFileName: "sub-01_motion.json",
      });
    expect(call).toThrow(SignalInputError);
  });

  it("readSensorCsv reads every row of a file with many empty extra columns", () => {
    const extra = 40;
    const head = ["# pendula-sensor: 1", "# device: X-1", "# sample_rate_hz: 100", "# start_utc: 2026-01-05T10:00:00.000Z", "# units: acc=m/s2, gyro=deg/s"];
    const cols = `t_s,acc_x,acc_y,acc_z,gyro_x,gyro_y,gyro_z${Array.from({ length: extra }, (_, i) => `,note${i}`).join("")}`;
    const rows = Array.from({ length: 200 }, (_, i) => `${(i / 100).toFixed(2)},0,0,9,1,2,3${",".repeat(extra)}`);
    const r = readSensorCsv([...head, cols, ...rows].join("\n"), "wide.csv");
    expect(r.timeS.length).toBe(200);
    expect(r.gyroZ[199]).toBe(3);
  });
});
