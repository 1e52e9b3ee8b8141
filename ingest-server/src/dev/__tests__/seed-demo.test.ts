import { readSensorCsv, type SensorRecording } from "@pendula/signal";
import { describe, expect, it } from "vitest";
import { DEMO_PATIENTS, type DemoPatient } from "../../../../db/seeds/demo-scenario";
import { DEMO_HEIGHTS_CM, demoSessionFiles, demoWalkingAid, weekKinematicOptions } from "../seed-demo";

const SERIALS = { left_shank: "T-1", right_shank: "T-2", left_wrist: "T-3", right_wrist: "T-4" };
const START = "2026-09-01T09:00:00.000Z";

/** A short recording with distinct values on every axis, so a sign or a lost row shows. */
function recording(placement: SensorRecording["placement"], fs: number, n: number): SensorRecording {
  const ramp = (k: number) => Float32Array.from({ length: n }, (_, j) => k + j / 8);
  return {
    fileName: `x-${placement}.csv`,
    deviceSerial: "GEN-1",
    placement,
    nominalSampleRateHz: fs,
    startUtc: START,
    timeS: Float64Array.from({ length: n }, (_, j) => j / fs),
    accX: ramp(1),
    accY: ramp(9),
    accZ: ramp(-2),
    gyroX: ramp(5),
    gyroY: ramp(-7),
    gyroZ: ramp(30),
  };
}

describe("demo session files", () => {
  const fs = 100;
  const recs = [recording("left_shank", fs, 400), recording("right_shank", fs, 400), recording("left_wrist", fs, 400)];
  const files = demoSessionFiles(recs, {
    serials: SERIALS,
    gyroUnits: "deg/s",
    startOffsetsS: { right_shank: 0.05, left_wrist: 0.03 },
    upsideDownShank: "right_shank",
    gaps: [{ placement: "left_wrist", startS: 2, durationS: 0.1 }],
  });
  const read = files.map((f) => readSensorCsv(f.text, f.fileName));

  it("names each file by placement and the patient's device serial", () => {
    expect(files.map((f) => f.fileName)).toEqual(["walk-left-shank-T-1.csv", "walk-right-shank-T-2.csv", "walk-left-wrist-T-3.csv"]);
    expect(read.map((r) => r.deviceSerial)).toEqual(["T-1", "T-2", "T-3"]);
  });

  it("starts a later device later: fewer rows, its own clock from 0 and start_utc moved by the offset", () => {
    const [ls, rs] = read;
    expect(ls!.startUtc).toBe(START);
    expect(ls!.timeS.length).toBe(400);
    expect(rs!.startUtc).toBe("2026-09-01T09:00:00.050Z");
    expect(rs!.timeS.length).toBe(395);
    expect(rs!.timeS[0]).toBe(0);
    // Sample k of the late device is sample k + 5 of the body's time base.
    expect(rs!.accX[0]).toBeCloseTo(recs[1]!.accX[5]!, 3);
  });

  it("turns an upside-down shank 180° about the forward axis: y and z change sign, x does not", () => {
    const rs = read[1]!;
    const src = recs[1]!;
    expect(rs.accX[10]).toBeCloseTo(src.accX[15]!, 3);
    expect(rs.accY[10]).toBeCloseTo(-src.accY[15]!, 3);
    expect(rs.accZ[10]).toBeCloseTo(-src.accZ[15]!, 3);
    expect(rs.gyroX[10]).toBeCloseTo(src.gyroX[15]!, 1);
    expect(rs.gyroY[10]).toBeCloseTo(-src.gyroY[15]!, 1);
    expect(rs.gyroZ[10]).toBeCloseTo(-src.gyroZ[15]!, 1);
  });

  it("drops the rows of a dropout and keeps the clock of the rest", () => {
    const lw = read[2]!;
    // 3 rows before the start, 10 rows inside [2.00, 2.10) of the body's time.
    expect(lw.timeS.length).toBe(400 - 3 - 10);
    const jump = Array.from(lw.timeS).findIndex((t, j) => j > 0 && t - lw.timeS[j - 1]! > 0.05);
    expect(lw.timeS[jump]! - lw.timeS[jump - 1]!).toBeCloseTo(0.11, 5);
  });

  it("writes rad/s when the device does, read back as the same deg/s", () => {
    const [rad] = demoSessionFiles([recs[0]!], { serials: SERIALS, gyroUnits: "rad/s", startOffsetsS: {}, upsideDownShank: null, gaps: [] });
    expect(rad!.text).toContain("gyro=rad/s");
    const r = readSensorCsv(rad!.text, rad!.fileName);
    expect(r.gyroZ[100]).toBeCloseTo(recs[0]!.gyroZ[100]!, 1);
  });
});

describe("a demo week as kinematic generator settings", () => {
  const find = (key: string): [DemoPatient, number] => {
    const index = DEMO_PATIENTS.findIndex((p) => p.key === key);
    return [DEMO_PATIENTS[index]!, index];
  };

  it("holds the arm opposite the weaker leg still on a cane and both arms on a rollator", () => {
    const [stroke, si] = find("p01");
    expect(demoWalkingAid(stroke, 0)).toBe("cane");
    expect(stroke.trajectory.affectedSide).toBe("left");
    expect(weekKinematicOptions(stroke, si, 0, SERIALS, START).options.arms?.heldStill).toEqual(["right"]);
    expect(demoWalkingAid(stroke, 6)).toBe("none");
    expect(weekKinematicOptions(stroke, si, 6, SERIALS, START).options.arms?.heldStill).toEqual([]);
    const [rollator, ri] = find("p18");
    expect(weekKinematicOptions(rollator, ri, 3, SERIALS, START).options.arms?.heldStill).toEqual(["left", "right"]);
  });

  it("swings the arms 2:1 below the patient's cadence threshold and 1:1 above it, with more range as they recover", () => {
    const [p, i] = find("p02");
    const threshold = p.trajectory.armOneToOneAboveCadence!;
    const weeks = Array.from({ length: 14 }, (_, w) => weekKinematicOptions(p, i, w, SERIALS, START).options);
    const cadence = (o: (typeof weeks)[number]) => 120 / o.strideTimeS!;
    expect(weeks.some((o) => cadence(o) < threshold) && weeks.some((o) => cadence(o) > threshold)).toBe(true);
    for (const o of weeks) expect(o.arms?.coupling).toBe(cadence(o) < threshold ? "2:1" : "1:1");
    const range = (o: (typeof weeks)[number]) => (o.arms!.rangeDeg as { left: number; right: number }).left;
    expect(range(weeks[13]!)).toBeGreaterThan(range(weeks[0]!) + 10);
  });

  it("gives the affected leg the longer swing, keeps both double supports equal and carries the height", () => {
    const [p, i] = find("p01");
    const o = weekKinematicOptions(p, i, 1, SERIALS, START).options;
    const left = o.legs!.left!.stanceFraction!;
    const right = o.legs!.right!.stanceFraction!;
    expect(left).toBeLessThan(right);
    expect(left - o.stepFraction!).toBeCloseTo(o.stepFraction! + right - 1, 10);
    expect(o.heightCm).toBe(DEMO_HEIGHTS_CM.p01);
  });
});
