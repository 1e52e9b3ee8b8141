import { describe, expect, it } from "vitest";
import { readSensorCsv } from "../../io/read-sensor-csv";
import { synthesizeSession, synthesizeSessionText } from "..";
import { type Columns, readColumns } from "./read-columns";

const byPlacement = (s: ReturnType<typeof synthesizeSession>) =>
  Object.fromEntries(s.files.map((f) => [f.placement, readColumns(f.text)])) as Record<string, Columns>;

function mean(x: readonly number[]): number {
  return x.reduce((a, b) => a + b, 0) / x.length;
}
function cvPct(x: readonly number[]): number {
  const m = mean(x);
  return (100 * Math.sqrt(x.reduce((a, b) => a + (b - m) ** 2, 0) / (x.length - 1))) / m;
}

describe("synthesizeSession(options) determinism and format", () => {
  it("gives byte-identical files for the same seed and different files for another seed", () => {
    const a = synthesizeSessionText({ seed: 5, durationS: 30 });
    const b = synthesizeSessionText({ seed: 5, durationS: 30 });
    const c = synthesizeSessionText({ seed: 6, durationS: 30 });
    expect(a).toEqual(b);
    expect(Object.values(a)[0]).not.toEqual(Object.values(c)[0]);
  });

  it("writes four sensor CSV v1 files that the product reader accepts", () => {
    const s = synthesizeSession({ seed: 1, durationS: 20, sampleRateHz: 128 });
    expect(s.files.map((f) => f.placement)).toEqual(["left_shank", "right_shank", "left_wrist", "right_wrist"]);
    for (const f of s.files) {
      expect(f.text.startsWith("# pendula-sensor: 1\n")).toBe(true);
      expect(f.deviceSerial).toMatch(/^PND-S-\d{4}$/);
      const rec = readSensorCsv(f.text, f.fileName);
      expect(rec.placement).toBe(f.placement);
      expect(rec.nominalSampleRateHz).toBe(128);
      expect(rec.timeS.length).toBe(f.rowCount);
      expect(rec.deviceSerial).toBe(f.deviceSerial);
    }
  });

  it("accepts 60–200 Hz and rejects rates outside", () => {
    for (const fs of [60, 200]) {
      const s = synthesizeSession({ durationS: 10, sampleRateHz: fs });
      expect(s.files[0]!.rowCount).toBe(10 * fs);
    }
    expect(() => synthesizeSession({ sampleRateHz: 50 })).toThrow(RangeError);
    expect(() => synthesizeSession({ sampleRateHz: 250 })).toThrow(RangeError);
  });

  it("writes rad/s as the deg/s values × π/180 (to the written precision)", () => {
    const deg = byPlacement(synthesizeSession({ seed: 2, durationS: 15 }));
    const rad = byPlacement(synthesizeSession({ seed: 2, durationS: 15, gyroUnits: "rad/s" }));
    expect(rad.left_shank!.header.get("units")).toBe("acc=m/s2, gyro=rad/s");
    const gd = deg.left_shank!.gyro[2];
    const gr = rad.left_shank!.gyro[2];
    let err = 0;
    for (let i = 0; i < gd.length; i++) err = Math.max(err, Math.abs((gr[i]! * 180) / Math.PI - gd[i]!));
    expect(err).toBeLessThan(0.01);
    expect(Math.max(...gd.map(Math.abs))).toBeGreaterThan(200);
  });

  it("runs the sample clock at the effective rate and keeps jittered timestamps increasing", () => {
    const s = synthesizeSession({ seed: 3, durationS: 60, sampleRateHz: 100, rateErrorPct: 3, timestampJitterS: 0.002 });
    const t = byPlacement(s).left_shank!.t;
    expect(s.truth.effectiveSampleRateHz).toBeCloseTo(103, 10);
    expect((t.length - 1) / (t[t.length - 1]! - t[0]!)).toBeCloseTo(103, 0);
    const dts: number[] = [];
    for (let i = 1; i < t.length; i++) dts.push(t[i]! - t[i - 1]!);
    expect(Math.min(...dts)).toBeGreaterThan(0);
    // Jitter SD 2 ms on each stamp → SD of differences ≈ √2·2 ms (clipped at ±0.45 period).
    const m = mean(dts);
    const sd = Math.sqrt(mean(dts.map((d) => (d - m) ** 2)));
    expect(sd).toBeGreaterThan(0.0022);
    expect(sd).toBeLessThan(0.0032);
  });

  it("starts files at their offsets: start_utc shifted, truth on the earliest file's clock", () => {
    const s = synthesizeSession({ seed: 4, durationS: 40, startOffsetsS: { left_shank: 1.25, right_wrist: 0.4, left_wrist: 0.4, right_shank: 0.4 } });
    const start = (p: string) => Date.parse(s.files.find((f) => f.placement === p)!.startUtc);
    expect(start("left_shank") - start("right_shank")).toBe(850);
    expect(s.files.find((f) => f.placement === "right_shank")!.startUtc).toBe("2026-11-23T09:15:02.120Z");
    expect(s.files.find((f) => f.placement === "left_shank")!.startOffsetS).toBeCloseTo(0.85, 12);
    // Walking begins after the last file has started plus the 3 s lead-in.
    expect(s.truth.walkingBouts[0]!.startS).toBeCloseTo(3.85, 12);
    expect(Math.min(...s.truth.left.fc)).toBeGreaterThan(3.85);
  });
});

describe("synthesizeSession(options) truth", () => {
  it("orders events IC < FC < next IC per leg and alternates left and right ICs", () => {
    const s = synthesizeSession({ seed: 7, durationS: 120, strideTimeCvPct: 4 });
    for (const leg of [s.truth.left, s.truth.right]) {
      for (let k = 0; k + 1 < leg.ic.length; k++) {
        const fc = leg.fc.find((f) => f > leg.ic[k]! && f < leg.ic[k + 1]!);
        expect(fc).toBeDefined();
      }
    }
    const all = [...s.truth.left.ic.map((t) => ({ t, side: "L" })), ...s.truth.right.ic.map((t) => ({ t, side: "R" }))].sort((a, b) => a.t - b.t);
    for (let i = 1; i < all.length; i++) expect(all[i]!.side).not.toBe(all[i - 1]!.side);
  });

  it("matches the requested stride time, stance fraction and variability", () => {
    const s = synthesizeSession({ seed: 8, durationS: 300, strideTimeS: 1.2, strideTimeCvPct: 3, stanceFraction: 0.62 });
    expect(mean(s.truth.strideTimesS)).toBeCloseTo(1.2, 1);
    expect(Math.abs(cvPct(s.truth.strideTimesS) - 3)).toBeLessThan(0.6);
    const { ic, fc } = s.truth.left;
    const stance: number[] = [];
    for (let k = 0; k + 1 < ic.length; k++) {
      const f = fc.find((x) => x > ic[k]! && x < ic[k + 1]!);
      if (f !== undefined) stance.push((f - ic[k]!) / (ic[k + 1]! - ic[k]!));
    }
    expect(mean(stance)).toBeCloseTo(0.62, 6);
  });

  it("produces high stride variability when asked (CV 8 %)", () => {
    const s = synthesizeSession({ seed: 9, durationS: 400, strideTimeCvPct: 8 });
    expect(Math.abs(cvPct(s.truth.strideTimesS) - 8)).toBeLessThan(1.5);
  });

  it("builds asymmetric impaired gait: per-side stance, longer right step, weaker right swing", () => {
    const s = synthesizeSession({
      seed: 10,
      durationS: 120,
      stanceFraction: { left: 0.6, right: 0.7 },
      stepFraction: 0.56,
      midSwingPeakDegS: { left: 320, right: 160 },
      gyroNoiseDegS: 0,
    });
    const stepLR: number[] = [];
    for (const t of s.truth.left.ic) {
      const r = s.truth.right.ic.find((x) => x > t);
      const nextL = s.truth.left.ic.find((x) => x > t);
      if (r !== undefined && nextL !== undefined && r < nextL) stepLR.push((r - t) / (nextL - t));
    }
    expect(mean(stepLR)).toBeCloseTo(0.56, 6);
    const c = byPlacement(s);
    const peak = (g: Float64Array) => g.reduce((m, v) => Math.max(m, v), -Infinity);
    expect(peak(c.left_shank!.gyro[2])).toBeGreaterThan(1.5 * peak(c.right_shank!.gyro[2]));
  });

  // Mid-swing-peak method (Aminian et al. 2002; Salarian et al. 2004) with the thresholds of
  // Salarian 2004 thresholds (docs/methods.md#shank-gyroscope-events): MS > 50 °/s, IC minimum <
  // −10 °/s, FC minimum < −20 °/s.
  it("puts each truth IC/FC on a shank gyro minimum with a > 50 °/s mid-swing peak between FC and IC", () => {
    const s = synthesizeSession({ seed: 11, durationS: 60, sampleRateHz: 200, gyroNoiseDegS: 0 });
    const c = byPlacement(s);
    for (const side of ["left", "right"] as const) {
      const { t, gyro } = c[`${side}_shank`]!;
      const g = gyro[2];
      const idx = (time: number) => Math.round(time * 200);
      const isMin = (i: number) => g[i]! <= g[i - 1]! && g[i]! <= g[i + 1]!;
      const nearMin = (time: number) => [-1, 0, 1].some((d) => isMin(idx(time) + d));
      for (const ic of s.truth[side].ic) {
        expect(nearMin(ic)).toBe(true);
        expect(g[idx(ic)]!).toBeLessThan(-10);
      }
      for (const fc of s.truth[side].fc) {
        expect(nearMin(fc)).toBe(true);
        expect(g[idx(fc)]!).toBeLessThan(-20);
        const nextIc = s.truth[side].ic.find((x) => x > fc)!;
        let ms = -Infinity;
        for (let i = idx(fc); i < idx(nextIc); i++) ms = Math.max(ms, g[i]!);
        expect(ms).toBeGreaterThan(50);
      }
      expect(t[0]).toBe(0);
    }
  });

  it("keeps standing periods free of events and of arm swing", () => {
    const s = synthesizeSession({ seed: 12, durationS: 90, standing: [{ startS: 40, durationS: 10 }] });
    expect(s.truth.walkingBouts).toHaveLength(2);
    for (const leg of [s.truth.left, s.truth.right]) {
      expect([...leg.ic, ...leg.fc].filter((x) => x > 40.5 && x < 50)).toHaveLength(0);
    }
    const w = byPlacement(s).left_wrist!;
    let sumSq = 0;
    let n = 0;
    w.t.forEach((t, i) => {
      if (t > 41 && t < 49) {
        sumSq += w.gyro[2][i]! ** 2;
        n++;
      }
    });
    expect(Math.sqrt(sumSq / n)).toBeLessThan(5);
  });

  it("records turns as yaw about the vertical integrating to the turn angle", () => {
    const s = synthesizeSession({ seed: 13, durationS: 60, sampleRateHz: 100, turns: [{ startS: 20, durationS: 2, angleDeg: 180 }] });
    const c = byPlacement(s).left_shank!;
    let yaw = 0;
    c.t.forEach((t, i) => {
      if (t >= 20 && t < 22) yaw += c.gyro[1][i]! / 100;
    });
    expect(Math.abs(yaw - 180)).toBeLessThan(5);
    expect(s.truth.turns).toEqual([{ startS: 20, endS: 22, angleDeg: 180 }]);
  });
});

describe("synthesizeSession(options) sensor faults", () => {
  it("rotates a misaligned sensor by exactly the requested angle (norms kept)", () => {
    const aligned = byPlacement(synthesizeSession({ seed: 14, durationS: 30 })).left_shank!;
    const s = synthesizeSession({ seed: 14, durationS: 30, misalignmentDeg: 25 });
    expect(s.truth.misalignmentDeg.left_shank).toBeCloseTo(25, 9);
    const turned = byPlacement(s).left_shank!;
    let maxAngle = 0;
    for (let i = 0; i < aligned.t.length; i++) {
      const a = [aligned.gyro[0][i]!, aligned.gyro[1][i]!, aligned.gyro[2][i]!];
      const b = [turned.gyro[0][i]!, turned.gyro[1][i]!, turned.gyro[2][i]!];
      const na = Math.hypot(...a);
      const nb = Math.hypot(...b);
      expect(Math.abs(na - nb)).toBeLessThan(0.02);
      if (na < 100) continue;
      const cos = (a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!) / (na * nb);
      maxAngle = Math.max(maxAngle, (Math.acos(Math.min(1, cos)) * 180) / Math.PI);
    }
    expect(maxAngle).toBeLessThan(25.1);
    expect(maxAngle).toBeGreaterThan(15);
  });

  it("turns an inverted shank upside down: gyro_z and acc_y change sign", () => {
    const normal = byPlacement(synthesizeSession({ seed: 15, durationS: 20 })).right_shank!;
    const s = synthesizeSession({ seed: 15, durationS: 20, invertedPlacement: "right_shank" });
    const flipped = byPlacement(s).right_shank!;
    expect(s.truth.invertedPlacement).toBe("right_shank");
    for (let i = 0; i < normal.t.length; i += 37) {
      expect(flipped.gyro[2][i]).toBeCloseTo(-normal.gyro[2][i]!, 6);
      expect(flipped.acc[1][i]).toBeCloseTo(-normal.acc[1][i]!, 6);
      expect(flipped.gyro[0][i]).toBeCloseTo(normal.gyro[0][i]!, 6);
    }
  });

  it("drops rows inside gaps, short and long", () => {
    const s = synthesizeSession({
      seed: 16,
      durationS: 60,
      sampleRateHz: 100,
      gaps: [
        { placement: "left_wrist", startS: 20, durationS: 0.1 },
        { placement: "left_wrist", startS: 30, durationS: 2 },
      ],
    });
    const t = byPlacement(s).left_wrist!.t;
    const dts: number[] = [];
    for (let i = 1; i < t.length; i++) dts.push(t[i]! - t[i - 1]!);
    const big = dts.filter((d) => d > 0.05).sort((a, b) => a - b);
    expect(big).toHaveLength(2);
    expect(big[0]).toBeCloseTo(0.11, 2);
    expect(big[1]).toBeCloseTo(2.01, 2);
    expect(s.files.find((f) => f.placement === "left_shank")!.rowCount).toBe(6000);
  });

  it("clips the gyro at its range (flat tops) and counts the clipped samples", () => {
    const s = synthesizeSession({ seed: 17, durationS: 30, gyroRangeDegS: 250 });
    const g = byPlacement(s).left_shank!.gyro[2];
    const atRange = g.filter((v) => Math.abs(v) === 250).length;
    expect(Math.max(...g.map(Math.abs))).toBe(250);
    expect(atRange).toBeGreaterThan(10);
    expect(s.truth.saturatedSamples.left_shank).toBeGreaterThanOrEqual(atRange);
  });

  it("adds a lower-back sensor when asked", () => {
    const s = synthesizeSession({ seed: 18, durationS: 20, placements: ["left_shank", "right_shank", "lower_back"] });
    expect(s.files.map((f) => f.placement)).toEqual(["left_shank", "right_shank", "lower_back"]);
    const acc = byPlacement(s).lower_back!.acc[1];
    expect(mean([...acc])).toBeCloseTo(9.81, 1);
  });
});
