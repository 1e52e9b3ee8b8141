import { describe, expect, it } from "vitest";
import { analyze } from "../../analyze";
import type { Analysis, Placement, SensorRecording, Side } from "../../types";
import { type EventScore, scoreEvents } from "./support/real-walk-trials";
import {
  FEET,
  SHANKS,
  type StrokeTreadmillTrial,
  referenceStrideTimesS,
  strokeTreadmillAvailable,
  strokeTreadmillTrials,
} from "./support/stroke-treadmill-trials";

// Real treadmill walks of people with chronic stroke (Ensink et al., Sensors 2024, 24:710; data set
// SintMaartenskliniek/MovingReality, MIT licence), read from ../shared/data/stroke-treadmill. The
// reference events come from the FOOT IMUs by a published foot-gyroscope rule (Rampp et al. 2015 for
// IC; the push-off minimum for FC) — NOT a gold standard (the source's force plates are not in the
// copy). Scoring as the data's README suggests: ±100 ms matching window, over `walk` minus 0.5 s at
// each end; plus the signed median bias (detected − reference) and the median absolute error.

/** Target for every side the data's README does not flag (±100 ms window; common practice). */
const F1_TARGET = 0.95;
/** Cadence target against cadence from the reference ICs (common practice for this validation). */
const CADENCE_TOLERANCE = 0.02;

/**
 * pp03's left shank sensor rotates mainly about the shank's long axis (loose or rotated strap, says
 * the data's README): shank-based left events are expected to be poor there and the analysis must
 * flag the sensor. Its F1 is printed, not asserted.
 */
const FLAGGED_SHANK: ReadonlySet<string> = new Set(["pp03-1Reg:left", "pp03-2Reg:left"]);
/**
 * pp01's left foot dips in terminal swing about 0.2 s before it lands (data README); the foot
 * reference puts its IC in that dip in about half of the strides and at the landing in the rest
 * (reference IC − shank mid-swing is bimodal, ~0.2 s and ~0.4 s; the shank's own accelerometer
 * shows the impact at the later one). No single contact rule can match both modes within ±100 ms,
 * so there the check is one IC per reference stride (no missed or extra events, the criterion of
 * Trojaniello et al. 2014) instead of F1 against the ambiguous timing.
 */
const AMBIGUOUS_REFERENCE_IC: ReadonlySet<string> = new Set(["pp01-1Reg:left", "pp01-2Reg:left"]);

interface SideRow {
  trial: string;
  side: Side;
  ic: EventScore & { biasMs: number };
  fc: EventScore & { biasMs: number };
  stancePct: number | null;
  refStancePct: number | null;
}

interface TrialRow {
  trial: string;
  sides: SideRow[];
  cadenceFromIcs: number | null;
  cadenceMetric: number | null;
  refCadence: number;
  turns: number;
  analysis: Analysis;
}

function signedMedianBiasMs(detected: number[], reference: number[]): number {
  const pairs: Array<[number, number, number]> = [];
  detected.forEach((d, i) => reference.forEach((r, j) => Math.abs(d - r) <= 0.1 && pairs.push([Math.abs(d - r), i, j])));
  pairs.sort((a, b) => a[0] - b[0]);
  const usedD = new Set<number>();
  const usedR = new Set<number>();
  const signed: number[] = [];
  for (const [, i, j] of pairs) {
    if (usedD.has(i) || usedR.has(j)) continue;
    usedD.add(i);
    usedR.add(j);
    signed.push(detected[i]! - reference[j]!);
  }
  return 1000 * (median(signed) ?? Number.NaN);
}

function median(xs: number[]): number | null {
  if (xs.length === 0) return null;
  const s = [...xs].sort((a, b) => a - b);
  const h = s.length >> 1;
  return s.length % 2 ? s[h]! : (s[h - 1]! + s[h]!) / 2;
}

/** Median stance % over strides IC → next IC holding exactly one FC (docs/methods.md#stance-swing-and-double-support: 100·(FC − IC)/stride). */
function stancePct(ic: number[], fc: number[]): number | null {
  const values: number[] = [];
  for (let k = 0; k + 1 < ic.length; k++) {
    const inside = fc.filter((f) => f > ic[k]! && f < ic[k + 1]!);
    if (inside.length === 1) values.push((100 * (inside[0]! - ic[k]!)) / (ic[k + 1]! - ic[k]!));
  }
  return median(values);
}

/** Steps/min from the ICs of one side over its own span: 2 steps per stride (docs/methods.md#stride-step-and-cadence). */
function cadenceOfSide(ic: number[]): number | null {
  if (ic.length < 3) return null;
  return (120 * (ic.length - 1)) / (ic[ic.length - 1]! - ic[0]!);
}

function meanOf(xs: Array<number | null>): number | null {
  const v = xs.filter((x): x is number => x !== null);
  return v.length ? v.reduce((a, b) => a + b, 0) / v.length : null;
}

function evaluate(t: StrokeTreadmillTrial, placements: readonly Placement[], unusable: ReadonlySet<string>, slowBy = 1): TrialRow {
  const recordings = t.recordings(placements);
  const a = analyze(slowBy === 1 ? recordings : recordings.map((r) => slowedDown(r, slowBy)));
  const back = (times: number[]) => times.map((x) => x / slowBy).filter(t.keep);
  const ref = t.reference;
  const sides = (["left", "right"] as const).map((side): SideRow => {
    const detIc = back(a.events[side].initialContacts);
    const detFc = back(a.events[side].finalContacts);
    const refIc = ref.events[side].ic.filter(t.keep);
    const refFc = ref.events[side].fc.filter(t.keep);
    return {
      trial: t.trial,
      side,
      ic: { ...scoreEvents(detIc, refIc), biasMs: signedMedianBiasMs(detIc, refIc) },
      fc: { ...scoreEvents(detFc, refFc), biasMs: signedMedianBiasMs(detFc, refFc) },
      stancePct: stancePct(detIc, detFc),
      refStancePct: stancePct(refIc, refFc),
    };
  });
  // Cadence from each usable side's detected ICs over the walk window, against the same count on
  // the reference ICs of both sides.
  const usable = (["left", "right"] as const).filter((s) => !unusable.has(`${t.trial}:${s}`));
  return {
    trial: t.trial,
    sides,
    cadenceFromIcs: meanOf(usable.map((s) => cadenceOfSide(back(a.events[s].initialContacts)))),
    cadenceMetric: a.metrics.cadenceStepsPerMin === null ? null : a.metrics.cadenceStepsPerMin * slowBy,
    refCadence: meanOf((["left", "right"] as const).map((s) => cadenceOfSide(ref.events[s].ic.filter(t.keep))))!,
    turns: a.turns.length,
    analysis: a,
  };
}

/**
 * The same walk played k times slower, kept at the file's rate: every channel is linearly
 * interpolated at t/k and angular velocity divided by k (the same segment angles covered in k times
 * the time). Detected times are divided by k again before scoring, so the ±100 ms window and the
 * reference keep their meaning. A check that no search window is a fixed number of seconds.
 */
function slowedDown(r: SensorRecording, k: number): SensorRecording {
  const n0 = r.timeS.length;
  const n = Math.floor((n0 - 1) * k) + 1;
  const timeS = new Float64Array(n);
  for (let i = 0; i < n; i++) timeS[i] = r.timeS[0]! * k + i / r.nominalSampleRateHz;
  const stretch = (x: Float32Array, scale: number) => {
    const out = new Float32Array(n);
    for (let i = 0; i < n; i++) {
      const u = i / k;
      const j = Math.min(n0 - 2, Math.floor(u));
      out[i] = scale * (x[j]! + (u - j) * (x[j + 1]! - x[j]!));
    }
    return out;
  };
  return {
    ...r,
    timeS,
    accX: stretch(r.accX, 1),
    accY: stretch(r.accY, 1),
    accZ: stretch(r.accZ, 1),
    gyroX: stretch(r.gyroX, 1 / k),
    gyroY: stretch(r.gyroY, 1 / k),
    gyroZ: stretch(r.gyroZ, 1 / k),
  };
}

/** Cadence the slowed walks are brought to (steps/min): the slow end the product must handle. */
const SLOW_CADENCE = 36;

const fmt = (x: number | null, d = 1) => (x === null || !Number.isFinite(x) ? "–" : x.toFixed(d));

function printTable(title: string, rows: TrialRow[]): void {
  const lines = [
    title,
    "trial      side  | IC F1  TP/ref/det   bias  med|err| ms | FC F1  TP/ref/det   bias  med|err| ms | stance % det/ref | cadence from ICs / metric / reference",
  ];
  for (const r of rows) {
    for (const s of r.sides) {
      const ev = (e: SideRow["ic"]) =>
        `${e.f1.toFixed(3)}  ${`${e.tp}/${e.nRef}/${e.nDet}`.padEnd(11)} ${fmt(e.biasMs, 0).padStart(5)}  ${fmt(e.medianAbsMs, 0).padStart(5)}`;
      lines.push(
        `${r.trial.padEnd(10)} ${s.side.padEnd(5)} | ${ev(s.ic)}       | ${ev(s.fc)}       | ${fmt(s.stancePct)} / ${fmt(s.refStancePct)}      | ${fmt(r.cadenceFromIcs)} / ${fmt(r.cadenceMetric)} / ${fmt(r.refCadence)}`,
      );
    }
  }
  console.log(lines.join("\n"));
}

/** IC and FC F1 ≥ target on every side the data's README does not flag (IC also skips the sides whose reference IC is ambiguous). */
function expectF1OnUsableSides(rows: ReturnType<typeof evaluate>[]): void {
  for (const r of rows) {
    for (const s of r.sides) {
      const key = `${r.trial}:${s.side}`;
      if (FLAGGED_SHANK.has(key)) continue;
      expect(s.fc.f1, `${key} FC`).toBeGreaterThanOrEqual(F1_TARGET);
      if (AMBIGUOUS_REFERENCE_IC.has(key)) continue;
      expect(s.ic.f1, `${key} IC`).toBeGreaterThanOrEqual(F1_TARGET);
    }
  }
}

describe.skipIf(!strokeTreadmillAvailable)("stroke treadmill recordings: shank and foot events vs foot-IMU reference", () => {
  const trials = strokeTreadmillTrials();

  describe("two shank sensors (the target use)", () => {
    const rows = trials.map((t) => evaluate(t, SHANKS, FLAGGED_SHANK));

    it("prints the per-trial table", () => {
      printTable("SHANKS ONLY (reference = foot IMU rule, not a gold standard)", rows);
      expect(rows.length).toBe(8);
    });

    it("finds IC and FC with F1 ≥ 0.95 on every side not flagged or ambiguous", () => {
      expectF1OnUsableSides(rows);
    });

    it("finds one IC per reference stride where the reference timing is ambiguous", () => {
      for (const r of rows) {
        for (const s of r.sides) {
          if (!AMBIGUOUS_REFERENCE_IC.has(`${r.trial}:${s.side}`)) continue;
          expect(Math.abs(s.ic.nDet - s.ic.nRef) / s.ic.nRef, `${r.trial}:${s.side}`).toBeLessThanOrEqual(0.03);
        }
      }
    });

    it("flags the rotated left shank strap of pp03 and no other shank", () => {
      for (const r of rows) {
        const flagged = r.analysis.quality.filter((q) => q.code === "misalignment" && q.severity === "warning").map((q) => q.placement);
        const expected = (["left", "right"] as const).filter((s) => FLAGGED_SHANK.has(`${r.trial}:${s}`)).map((s) => `${s}_shank`);
        expect(flagged.sort(), r.trial).toEqual(expected);
      }
    });

    it("gives cadence from the detected ICs, and the analysis' steady-state cadence, within 2 % of the reference", () => {
      for (const r of rows) {
        expect(Math.abs(r.cadenceFromIcs! / r.refCadence - 1), `${r.trial} from ICs`).toBeLessThanOrEqual(CADENCE_TOLERANCE);
        expect(Math.abs(r.cadenceMetric! / r.refCadence - 1), `${r.trial} metric`).toBeLessThanOrEqual(CADENCE_TOLERANCE);
      }
    });

    it("reports no turns on the treadmill", () => {
      for (const r of rows) expect(r.turns, r.trial).toBe(0);
    });

    it("keeps the stance % of usable sides within the matching window's tolerance of the reference's", () => {
      // Stance % is a difference of two events, each accepted within ±100 ms: the same 100 ms on the
      // stance duration, in % of the reference's median stride (common practice; ≈ 10 points at
      // 1 s, 6 at 1.7 s). The shank–foot biases in the table (IC −40…+70 ms, FC −60…+20 ms) are
      // what moves it.
      for (const r of rows) {
        for (const s of r.sides) {
          const key = `${r.trial}:${s.side}`;
          if (FLAGGED_SHANK.has(key) || AMBIGUOUS_REFERENCE_IC.has(key)) continue;
          const strideS = median(referenceStrideTimesS(trials.find((t) => t.trial === r.trial)!.reference, s.side))!;
          expect(Math.abs(s.stancePct! - s.refStancePct!), key).toBeLessThanOrEqual((100 * 0.1) / strideS);
        }
      }
    });
  });

  describe(`two shank sensors, the same walks slowed to ${SLOW_CADENCE} steps/min (strides ≈ 3.3 s)`, () => {
    const rows = trials.map((t) => {
      const refCadence = meanOf((["left", "right"] as const).map((s) => cadenceOfSide(t.reference.events[s].ic.filter(t.keep))))!;
      return evaluate(t, SHANKS, FLAGGED_SHANK, refCadence / SLOW_CADENCE);
    });

    it("prints the per-trial table (times and cadence scaled back to the recorded walk)", () => {
      printTable(`SHANKS ONLY, SLOWED TO ${SLOW_CADENCE} STEPS/MIN`, rows);
      expect(rows.length).toBe(8);
    });

    it("still finds IC and FC with F1 ≥ 0.95 on every side not flagged or ambiguous", () => {
      expectF1OnUsableSides(rows);
    });

    it("keeps cadence from the detected ICs within 2 % of the reference", () => {
      for (const r of rows) expect(Math.abs(r.cadenceFromIcs! / r.refCadence - 1), r.trial).toBeLessThanOrEqual(CADENCE_TOLERANCE);
    });
  });

  describe("two foot sensors (the foot path)", () => {
    const rows = trials.map((t) => evaluate(t, FEET, new Set()));

    it("prints the per-trial table", () => {
      printTable("FEET ONLY (same rule family as the reference for IC; FC by zero crossing, see README)", rows);
      expect(rows.length).toBe(8);
    });

    it("finds foot ICs with F1 ≥ 0.95 on every side whose reference timing is not ambiguous", () => {
      for (const r of rows) {
        for (const s of r.sides) {
          const key = `${r.trial}:${s.side}`;
          if (AMBIGUOUS_REFERENCE_IC.has(key)) continue;
          expect(s.ic.f1, `${key} IC`).toBeGreaterThanOrEqual(F1_TARGET);
        }
      }
    });

    it("puts foot FC (Rampp's zero crossing) after the reference's push-off minimum, within 100 ms", () => {
      // The data's README: Rampp's zero-crossing toe-off lies 50–90 ms after the push-off minimum
      // the reference uses. A different definition, so the check is the sign and size of the bias.
      for (const r of rows) {
        for (const s of r.sides) {
          expect(s.fc.biasMs, `${r.trial}:${s.side}`).toBeGreaterThan(0);
          expect(s.fc.biasMs, `${r.trial}:${s.side}`).toBeLessThanOrEqual(100);
          expect(s.fc.nDet / s.fc.nRef, `${r.trial}:${s.side}`).toBeGreaterThanOrEqual(0.95);
        }
      }
    });

    it("gives cadence from the detected ICs within 2 % of the reference", () => {
      for (const r of rows) expect(Math.abs(r.cadenceFromIcs! / r.refCadence - 1), r.trial).toBeLessThanOrEqual(CADENCE_TOLERANCE);
    });

    it("reports no turns on the treadmill", () => {
      for (const r of rows) expect(r.turns, r.trial).toBe(0);
    });
  });
});
