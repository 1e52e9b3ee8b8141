import { describe, expect, it } from "vitest";
import { SignalInputError } from "../../types";
import { MAX_SENSOR_FILE_CHARS, readSensorCsv } from "../read-sensor-csv";
import { parseDecimal } from "../parse-number";

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

function expectInputError(fn: () => unknown, line: number | undefined, column: string | undefined, pattern: RegExp): void {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(SignalInputError);
    const err = e as SignalInputError;
    expect(err.fileName).toBe("walk.csv");
    expect(err.line).toBe(line);
    expect(err.column).toBe(column);
    expect(err.message).toMatch(/^walk\.csv/);
    expect(err.message).toMatch(pattern);
    return;
  }
  throw new Error("expected a SignalInputError");
}

describe("readSensorCsv(text, fileName)", () => {
  it("reads header fields and samples into typed arrays", () => {
    const r = readSensorCsv(make(), "walk.csv");
    expect(r.deviceSerial).toBe("PX-0042");
    expect(r.placement).toBe("left_shank");
    expect(r.nominalSampleRateHz).toBe(128);
    expect(r.startUtc).toBe("2026-11-23T09:15:02.120Z");
    expect(r.timeS).toBeInstanceOf(Float64Array);
    expect(Array.from(r.timeS)).toEqual([0, 0.00781, 0.01563]);
    expect(r.gyroZ[1]).toBeCloseTo(4.1, 5);
    expect(r.accY[2]).toBeCloseTo(9.81, 5);
  });

  it("converts rad/s to deg/s (×180/π) and g to m/s² (×9.80665, CGPM standard gravity)", () => {
    const header = HEADER.map((l) => (l.startsWith("# units") ? "# units: acc=g, gyro=rad/s" : l));
    const r = readSensorCsv(make(header, ["0,0,1,0,0,0,3.141592653589793"]), "walk.csv");
    expect(r.gyroZ[0]).toBeCloseTo(180, 4);
    expect(r.accY[0]).toBeCloseTo(9.80665, 5);
  });

  it("accepts CRLF line endings, a BOM, a missing placement, extra columns in any order and blank lines", () => {
    const header = HEADER.filter((l) => !l.startsWith("# placement")).map((l) =>
      l.startsWith("t_s") ? "gyro_z,t_s,temp_c,acc_x,acc_y,acc_z,gyro_x,gyro_y" : l,
    );
    const text = "\uFEFF" + [...header, "3.9,0,21.5,0.12,9.79,0.31,1.2,-0.4", "", "4.0,0.01,21.5,0.1,9.8,0.3,1,-0.5"].join("\r\n");
    const r = readSensorCsv(text, "walk.csv");
    expect(r.placement).toBeNull();
    expect(Array.from(r.gyroZ)).toEqual([Math.fround(3.9), 4]);
    expect(r.timeS.length).toBe(2);
  });

  it("rejects an empty file", () => expectInputError(() => readSensorCsv("", "walk.csv"), 1, undefined, /empty/));
  it("rejects a file that is not sensor CSV v1", () =>
    expectInputError(() => readSensorCsv("t_s,acc_x\n0,1\n", "walk.csv"), 1, undefined, /not a Pendula sensor CSV/));
  it("rejects an unsupported version", () =>
    expectInputError(() => readSensorCsv(make(["# pendula-sensor: 2", ...HEADER.slice(1)]), "walk.csv"), 1, "pendula-sensor", /version/));
  it("rejects a header line without a colon", () =>
    expectInputError(() => readSensorCsv(make([HEADER[0]!, "# device PX", ...HEADER.slice(2)]), "walk.csv"), 2, undefined, /key: value/));
  it("rejects a missing start_utc", () =>
    expectInputError(() => readSensorCsv(make(HEADER.filter((l) => !l.includes("start_utc"))), "walk.csv"), 6, "start_utc", /missing/));
  it("rejects a start time that is not UTC ISO 8601", () =>
    expectInputError(
      () => readSensorCsv(make(HEADER.map((l) => (l.includes("start_utc") ? "# start_utc: 2026-02-31T10:00:00+01:00" : l))), "walk.csv"),
      5,
      "start_utc",
      /ISO 8601/,
    ));
  it("rejects a non-positive sample rate", () =>
    expectInputError(
      () => readSensorCsv(make(HEADER.map((l) => (l.includes("sample_rate") ? "# sample_rate_hz: 0" : l))), "walk.csv"),
      4,
      "sample_rate_hz",
      /sample rate/,
    ));
  it("rejects an unknown placement", () =>
    expectInputError(
      () => readSensorCsv(make(HEADER.map((l) => (l.includes("placement") ? "# placement: left_knee" : l))), "walk.csv"),
      3,
      "placement",
      /unknown placement/,
    ));
  it("rejects unknown gyro units", () =>
    expectInputError(
      () => readSensorCsv(make(HEADER.map((l) => (l.includes("units") ? "# units: acc=m/s2, gyro=rpm" : l))), "walk.csv"),
      6,
      "units",
      /gyroscope unit "rpm"/,
    ));
  it("rejects unknown acceleration units", () =>
    expectInputError(
      () => readSensorCsv(make(HEADER.map((l) => (l.includes("units") ? "# units: acc=ft/s2, gyro=deg/s" : l))), "walk.csv"),
      6,
      "units",
      /acceleration unit/,
    ));
  it("rejects a missing gyro column", () =>
    expectInputError(
      () => readSensorCsv(make(HEADER.map((l) => (l.startsWith("t_s") ? "t_s,acc_x,acc_y,acc_z,gyro_x,gyro_z" : l))), "walk.csv"),
      7,
      "gyro_y",
      /gyroscope column "gyro_y" is missing/,
    ));
  it("rejects a duplicated column", () =>
    expectInputError(
      () => readSensorCsv(make(HEADER.map((l) => (l.startsWith("t_s") ? l + ",gyro_x" : l))), "walk.csv"),
      7,
      "gyro_x",
      /twice/,
    ));
  it("rejects a missing column header", () =>
    expectInputError(() => readSensorCsv(HEADER.slice(0, 6).join("\n") + "\n", "walk.csv"), 7, undefined, /column header/));
  it("rejects a header without data rows", () =>
    expectInputError(() => readSensorCsv(make(HEADER, []), "walk.csv"), 7, undefined, /no data rows/));
  it("rejects a non-numeric cell, naming line and column", () =>
    expectInputError(
      () => readSensorCsv(make(HEADER, [ROWS[0]!, "0.00781,0.10,9.80,0.30,1.0,abc,4.1"]), "walk.csv"),
      9,
      "gyro_y",
      /"abc" is not a number/,
    ));
  it("rejects an empty cell", () =>
    expectInputError(() => readSensorCsv(make(HEADER, ["0,0.1,9.8,0.3,1,,4"]), "walk.csv"), 8, "gyro_y", /is not a number/));
  it("rejects NaN and Infinity written as text", () =>
    expectInputError(() => readSensorCsv(make(HEADER, ["0,0.1,9.8,0.3,1,NaN,4"]), "walk.csv"), 8, "gyro_y", /not a number/));
  it("rejects a short row", () =>
    expectInputError(() => readSensorCsv(make(HEADER, ["0,0.1,9.8,0.3,1,2"]), "walk.csv"), 8, "gyro_y", /expected 7 cells, found 6/));
  it("rejects a long row", () =>
    expectInputError(() => readSensorCsv(make(HEADER, ["0,0.1,9.8,0.3,1,2,3,4"]), "walk.csv"), 8, undefined, /found more/));
  it("rejects time going backwards", () =>
    expectInputError(
      () => readSensorCsv(make(HEADER, [ROWS[0]!, ROWS[2]!, ROWS[1]!]), "walk.csv"),
      10,
      "t_s",
      /does not increase/,
    ));
  it("rejects a repeated time stamp", () =>
    expectInputError(() => readSensorCsv(make(HEADER, [ROWS[0]!, ROWS[0]!]), "walk.csv"), 9, "t_s", /does not increase/));
  it("rejects a file above the size limit before parsing it", () => {
    expect(MAX_SENSOR_FILE_CHARS).toBe(64 * 1024 * 1024);
    expectInputError(() => readSensorCsv(make(), "walk.csv", { maxChars: 100 }), undefined, undefined, /larger than/);
  });
});

describe("parseDecimal(text, start, end)", () => {
  it.each([
    ["0.12", 0.12],
    ["-3.5", -3.5],
    ["+7", 7],
    ["1.2e-3", 0.0012],
    ["5E2", 500],
    [" 2.5 ", 2.5],
    [".5", 0.5],
    ["12345678901234567890", Number("12345678901234567890")],
    ["0.1234567890123456789", Number("0.1234567890123456789")],
  ])("parses %s like Number()", (s, v) => expect(parseDecimal(s, 0, s.length)).toBe(v));
  it.each(["", "-", "1.2.3", "1e", "0x10", "NaN", "Infinity", "1,5", "e5"])("returns NaN for %j", (s) =>
    expect(parseDecimal(s, 0, s.length)).toBeNaN(),
  );
});
