import { afterAll, describe, expect, it } from "vitest";
import { analyze } from "../analyze";
import { synthesizeKinematicSession, type KinematicOptions, type KinematicSession } from "../synth";
import type { Analysis, Side } from "../types";

// The real analysis on sessions from the kinematic body model (signal/src/synth/kinematic). Truth is
// the model's own contacts (schedule knots of the segment-angle phase), not features of ω, so these
// cases are not circular with the detector. Targets: F1 ≥ 0.95 within ±100 ms (event tolerance of
// common practice; Trojaniello et al. 2014 report no missed or extra shank events in impaired gait),
// cadence within 2 % of the model's (project target; the model's cadence = 120 / mean stride time of
// strides away from bout edges and pauses, docs/methods.md#stride-step-and-cadence). Signed bias
// and median |error| are printed per case with the numbers of events behind them.

const TOLERANCE_S = 0.1;
const F1_MIN = 0.95;
const CADENCE_TOL_PCT = 2;

interface EventScore {
  truth: number;
  detected: number;
  matched: number;
  f1: number;
  biasMs: number;
  medianAbsMs: number;
}

interface CaseResult {
  name: string;
  ic: Record<Side, EventScore>;
  fc: Record<Side, EventScore>;
  cadenceTruth: number;
  cadenceAnalysis: number | null;
  cadenceErrPct: number | null;
  cadenceSteps: number | null;
  truthStrides: number;
  steadyStrides: number;
  speedTruth: number;
  speedAnalysis: number | null;
}

const results: CaseResult[] = [];

/**
 * One-to-one matching, nearest first, within the tolerance. Truth contacts made while the pattern
 * is still fading in (gait initiation: before the bout's first IC) are not scored, and detections
 * within the tolerance of them are not counted as extra.
 */
function scoreEvents(detected: readonly number[], truth: readonly number[], unscored: readonly number[]): EventScore {
  const pairs: { d: number; t: number; err: number }[] = [];
  for (const t of truth) for (const d of detected) if (Math.abs(d - t) <= TOLERANCE_S) pairs.push({ d, t, err: d - t });
  pairs.sort((a, b) => Math.abs(a.err) - Math.abs(b.err));
  const usedD = new Set<number>();
  const usedT = new Set<number>();
  const errs: number[] = [];
  for (const p of pairs) {
    if (usedD.has(p.d) || usedT.has(p.t)) continue;
    usedD.add(p.d);
    usedT.add(p.t);
    errs.push(p.err);
  }
  const extra = detected.filter((d) => !usedD.has(d) && !unscored.some((u) => Math.abs(u - d) <= TOLERANCE_S)).length;
  const tp = errs.length;
  const fn = truth.length - tp;
  const abs = errs.map(Math.abs).sort((a, b) => a - b);
  return {
    truth: truth.length,
    detected: tp + extra,
    matched: tp,
    f1: tp === 0 ? 0 : (2 * tp) / (2 * tp + extra + fn),
    biasMs: tp ? (1000 * errs.reduce((a, b) => a + b, 0)) / tp : Number.NaN,
    medianAbsMs: tp ? 1000 * abs[abs.length >> 1]! : Number.NaN,
  };
}

function runCase(name: string, options: KinematicOptions): { session: KinematicSession; analysis: Analysis; result: CaseResult } {
  const session = synthesizeKinematicSession(options);
  const analysis = analyze(session.recordings, { heightCm: options.heightCm ?? 172 });
  const firstIc = session.truth.bouts.map((b) => Math.min(...[...session.truth.left.ic, ...session.truth.right.ic].filter((t) => t >= b.startS)));
  const initiation = (t: number) => session.truth.bouts.some((b, i) => t >= b.startS && t < firstIc[i]!);
  const score = (kind: "ic" | "fc", side: Side) => {
    const truth = session.truth[side][kind];
    const detected = kind === "ic" ? analysis.events[side].initialContacts : analysis.events[side].finalContacts;
    return scoreEvents(detected, truth.filter((t) => !initiation(t)), truth.filter(initiation));
  };
  const cadenceTruth = session.truth.summary.cadenceStepsPerMin;
  const cadenceAnalysis = analysis.metrics.cadenceStepsPerMin;
  const result: CaseResult = {
    name,
    ic: { left: score("ic", "left"), right: score("ic", "right") },
    fc: { left: score("fc", "left"), right: score("fc", "right") },
    cadenceTruth,
    cadenceAnalysis,
    cadenceErrPct: cadenceAnalysis === null ? null : (100 * (cadenceAnalysis - cadenceTruth)) / cadenceTruth,
    cadenceSteps: analysis.metrics.counts?.cadenceStepsPerMin ?? null,
    truthStrides: session.truth.summary.strideCount,
    steadyStrides: analysis.metrics.steadyStrideCount,
    speedTruth: session.truth.summary.walkingSpeedMPerS,
    speedAnalysis: analysis.metrics.walkingSpeedMPerS ?? null,
  };
  results.push(result);
  return { session, analysis, result };
}

function expectKeeps(result: CaseResult): void {
  for (const side of ["left", "right"] as const) {
    expect(result.ic[side].f1, `${result.name}: ${side} IC F1`).toBeGreaterThanOrEqual(F1_MIN);
    expect(result.fc[side].f1, `${result.name}: ${side} FC F1`).toBeGreaterThanOrEqual(F1_MIN);
  }
  expect(result.cadenceAnalysis, `${result.name}: cadence`).not.toBeNull();
  expect(Math.abs(result.cadenceErrPct!), `${result.name}: cadence error %`).toBeLessThanOrEqual(CADENCE_TOL_PCT);
}

/** Invented sessions: each a scenario of the kinematic model (seeded, deterministic). */
const CASES: Record<string, KinematicOptions> = {
  "normal gait, 1.1 s strides": { seed: 11, bouts: [{ durationS: 60 }] },
  "stride-time CV 6 %": { seed: 12, bouts: [{ durationS: 70 }], strideTimeCvPct: 6 },
  "knee hyperextension 12° in stance (left)": { seed: 15, bouts: [{ durationS: 60 }], legs: { left: { hyperextensionDeg: 12 } } },
  "circumduction 15° (right)": { seed: 16, bouts: [{ durationS: 60, strideTimeS: 1.4 }], legs: { right: { circumductionDeg: 15 } } },
  "shuffling (ROM × 0.45, stance 72 %)": { seed: 17, bouts: [{ durationS: 60, strideTimeS: 1.0, romScale: 0.45 }], stanceFraction: 0.72 },
};

/** Paces, arm and mounting settings, and short festinating runs inside a bout. */
const PACE_CASES: Record<string, KinematicOptions> = {
  "three bouts at 1.0 / 1.4 / 2.0 s strides": {
    seed: 13,
    bouts: [
      { durationS: 30, strideTimeS: 1.0 },
      { durationS: 35, strideTimeS: 1.4, romScale: 0.8 },
      { durationS: 45, strideTimeS: 2.0, romScale: 0.65 },
    ],
  },
  "2:1 arms, mirrored wrist, wrist clock 150 ms late, shanks misaligned 20°": {
    seed: 19,
    bouts: [{ durationS: 70, strideTimeS: 1.8, romScale: 0.7 }],
    arms: { coupling: "2:1", wear: { right: "mirrored" } },
    clockOffsetS: { left_wrist: 0.15 },
    misalignmentDeg: { left_shank: 20, right_shank: 20 },
  },
  "festination-like episodes (stride × 0.6, ROM × 0.5, CV 8 %)": {
    seed: 32,
    bouts: [{ durationS: 80, strideTimeS: 1.2 }],
    shortStrideEpisodes: [
      { startS: 15, durationS: 15 },
      { startS: 50, durationS: 15 },
    ],
  },
};

/**
 * Cases whose final contacts the current shank rule does not place (FC F1 below target). Each keeps
 * the reason seen when it was written.
 *  - stiff knee / hemiparetic: with reduced knee flexion before toe-off the model's shank ω has no
 *    minimum near its FC. Its only pre-swing minimum lies 140–175 ms before the FC (on the hemiparetic
 *    left leg it coincides with the other leg's IC); from there ω rises without a turn (−85 → −33 °/s
 *    at FC in the stiff-knee case) and crosses zero 50–90 ms after FC. The FC rule (last minimum before
 *    mid-swing, Aminian 2002 / Salarian 2004) therefore lands ≈ 145–175 ms early, before the other
 *    leg's IC; those strides keep their IC timing and lose their FC-derived values.
 */
/** Cases whose early FCs fall before the other leg's IC, so the order check catches every one. */
const FC_ORDER_BREAKS = new Set(["stiff knee (swing flexion × 0.4, both legs)"]);

const PENDING_CASES: Record<string, KinematicOptions> = {
  "stiff knee (swing flexion × 0.4, both legs)": {
    seed: 14,
    bouts: [{ durationS: 60, strideTimeS: 1.3 }],
    legs: { left: { swingKneeScale: 0.4 }, right: { swingKneeScale: 0.4 } },
  },
  "hemiparetic (left: slow long swing, stiff knee; arm held still)": {
    seed: 18,
    bouts: [{ durationS: 80, strideTimeS: 1.7 }],
    stepFraction: 0.45,
    legs: { left: { stanceFraction: 0.55, swingKneeScale: 0.5, romScale: 0.7 }, right: { stanceFraction: 0.74, romScale: 0.85 } },
    arms: { heldStill: ["left"] },
  },
};

const SLOW_CASES: Record<string, KinematicOptions> = {
  "very slow, 40 steps/min (3.0 s strides, stance 75 %)": {
    seed: 21,
    bouts: [{ durationS: 120, strideTimeS: 3.0, romScale: 0.55 }],
    stanceFraction: 0.75,
    arms: { coupling: "none" },
  },
  "very slow, 35 steps/min (3.43 s strides, stance 78 %)": {
    seed: 22,
    bouts: [{ durationS: 130, strideTimeS: 120 / 35, romScale: 0.5 }],
    stanceFraction: 0.78,
    arms: { coupling: "none" },
  },
};

const IRREGULAR_CASES: Record<string, KinematicOptions> = {
  "hesitations of 1, 2 and 3 s inside a bout": {
    seed: 31,
    bouts: [{ durationS: 75, strideTimeS: 1.3 }],
    hesitations: [
      { atS: 15, durationS: 1 },
      { atS: 35, durationS: 2 },
      { atS: 55, durationS: 3 },
    ],
  },
  "short quick irregular strides throughout (0.75 s, ROM × 0.45, CV 7 %)": {
    seed: 33,
    bouts: [{ durationS: 60, strideTimeS: 0.75, romScale: 0.45, strideTimeCvPct: 7 }],
    stanceFraction: 0.64,
  },
};

afterAll(() => {
  const f = (x: number, d = 0) => (Number.isFinite(x) ? x.toFixed(d) : "–");
  const rows = results.map((r) => {
    const ev = (s: EventScore) => `${f(s.f1, 3)} ${s.matched}/${s.truth}/${s.detected} ${f(s.biasMs)}/${f(s.medianAbsMs)}`;
    return [
      r.name.slice(0, 58).padEnd(58),
      ev(r.ic.left).padEnd(24),
      ev(r.ic.right).padEnd(24),
      ev(r.fc.left).padEnd(24),
      ev(r.fc.right).padEnd(24),
      `${f(r.cadenceTruth, 1)} ${r.cadenceAnalysis === null ? "–" : f(r.cadenceAnalysis, 1)} ${r.cadenceErrPct === null ? "–" : f(r.cadenceErrPct, 2)}% n=${r.cadenceSteps ?? "–"}`.padEnd(28),
      `${r.truthStrides}/${r.steadyStrides}`.padEnd(9),
      `${f(r.speedTruth, 2)} ${r.speedAnalysis === null ? "–" : f(r.speedAnalysis, 2)}`,
    ].join(" | ");
  });
  const head = [
    "case".padEnd(58),
    "IC left F1 m/t/d bias/med ms".padEnd(24),
    "IC right".padEnd(24),
    "FC left".padEnd(24),
    "FC right".padEnd(24),
    "cadence model/analysis err".padEnd(28),
    "strides model/steady".padEnd(9),
    "speed m/s model analysis (not asserted)",
  ].join(" | ");
  console.log(["kinematic cases (m/t/d = matched / model contacts / detections; bias = mean detected − model)", head, ...rows].join("\n"));
});

describe("analyze(recordings) on kinematic sessions: normal and pathological gait", () => {
  for (const [name, options] of Object.entries(CASES)) {
    it(`keeps events (F1 ≥ 0.95, ±100 ms) and cadence (± 2 %): ${name}`, () => expectKeeps(runCase(name, options).result));
  }
});

describe("analyze(recordings) on kinematic sessions: paces, arms and mounting, festinating runs", () => {
  for (const [name, options] of Object.entries(PACE_CASES)) {
    it(`keeps events and cadence: ${name}`, () => expectKeeps(runCase(name, options).result));
  }
});

describe("analyze(recordings) on kinematic sessions: very slow walks, 35–40 steps/min", () => {
  for (const [name, options] of Object.entries(SLOW_CASES)) {
    it(`keeps strides, events and cadence: ${name}`, () => {
      const { result } = runCase(name, options);
      expect(result.steadyStrides, `${name}: steady strides`).toBeGreaterThanOrEqual(0.8 * result.truthStrides);
      expectKeeps(result);
    });
  }
});

describe("analyze(recordings) on kinematic sessions: hesitations and short irregular strides", () => {
  for (const [name, options] of Object.entries(IRREGULAR_CASES)) {
    it(`keeps events and cadence: ${name}`, () => expectKeeps(runCase(name, options).result));
  }
});

describe("analyze(recordings) on kinematic sessions whose final contacts the shank rule cannot place", () => {
  // Known limitation (see PENDING_CASES): the FC rule lands 140–175 ms early on these legs, so FC
  // F1 stays below target. What must hold: ICs and cadence are kept (the strides are timed by their
  // ICs), and the wrong FCs do not reach a clinician as stance, swing or double support — the leg's
  // FC-derived values are withheld and a warning says why. When a detector change places these FCs,
  // the last assertion fails and the case moves to the strict groups above.
  for (const [name, options] of Object.entries(PENDING_CASES)) {
    it(`keeps ICs and cadence and withholds stance from misplaced final contacts: ${name}`, () => {
      const { analysis, result } = runCase(name, options);
      for (const side of ["left", "right"] as const) expect(result.ic[side].f1, `${name}: ${side} IC F1`).toBeGreaterThanOrEqual(F1_MIN);
      expect(result.cadenceAnalysis, `${name}: cadence`).not.toBeNull();
      expect(Math.abs(result.cadenceErrPct!), `${name}: cadence error %`).toBeLessThanOrEqual(CADENCE_TOL_PCT);
      const misplaced = (["left", "right"] as const).filter((side) => result.fc[side].f1 < F1_MIN);
      expect(misplaced.length, `${name}: sides with misplaced FCs`).toBeGreaterThan(0);
      if (FC_ORDER_BREAKS.has(name)) {
        for (const side of misplaced) expect(analysis.metrics.stancePct[side], `${name}: ${side} stance %`).toBeNull();
        expect(analysis.metrics.doubleSupportPct, `${name}: double support %`).toBeNull();
        expect(analysis.quality.some((q) => q.code === "event-order" && q.severity === "warning"), `${name}: FC warning`).toBe(true);
      } else {
        // The early FC still passes the order check here, so the error cannot be seen from the
        // events: it reaches stance %. Printed, and stated as unvalidated in signal/README.md.
        for (const side of misplaced) console.log(`${name}: ${side} stance % reported ${analysis.metrics.stancePct[side]?.toFixed(1) ?? "—"} from misplaced FCs (known limitation)`);
      }
    });
  }
});

/**
 * Arm–leg coordination against the model's arm truth (ψ on segment angles, swing range per arm cycle;
 * conventions in signal/docs/kinematic-generator.md). Tolerances are project targets.
 */
describe("analyze(recordings) on kinematic sessions: arm–leg coordination and arm swing against the model", () => {
  const ARM_CASES: Record<string, KinematicOptions> = {
    "1:1, ψ −40°, ranges 40° / 15°": { seed: 41, bouts: [{ durationS: 80 }], arms: { relativePhaseDeg: -40, rangeDeg: { left: 40, right: 15 } } },
    "1:1, mirrored right wrist, upside-down left wrist": {
      seed: 42,
      bouts: [{ durationS: 80 }],
      arms: { relativePhaseDeg: 30, wear: { right: "mirrored", left: "upside-down" } },
    },
    "2:1 at 1.8 s strides, ψ 20°": { seed: 43, bouts: [{ durationS: 90, strideTimeS: 1.8, romScale: 0.7 }], arms: { coupling: "2:1", relativePhaseDeg: 20 } },
  };
  for (const [name, options] of Object.entries(ARM_CASES)) {
    it(`recovers the ratio, ψ within 5° and the swing range within 5 %: ${name}`, () => {
      const session = synthesizeKinematicSession(options);
      const analysis = analyze(session.recordings, { heightCm: 172 });
      const pairs = [
        [session.truth.arms.left!, analysis.metrics.armLeg.leftArmRightLeg, analysis.metrics.armSwing?.left.amplitudeDeg],
        [session.truth.arms.right!, analysis.metrics.armLeg.rightArmLeftLeg, analysis.metrics.armSwing?.right.amplitudeDeg],
      ] as const;
      for (const [truth, coupling, amplitude] of pairs) {
        console.log(
          `${name} | ${truth.side} arm: ratio ${truth.ratio} / ${coupling.frequencyRatio}, ψ model ${truth.relativePhaseDeg!.toFixed(1)}° (${truth.cycles} strides) analysis ${coupling.meanRelativePhaseDeg?.toFixed(1)}° (error ${(coupling.meanRelativePhaseDeg! - truth.relativePhaseDeg!).toFixed(1)}°), range model ${truth.swingRangeDeg.toFixed(1)}° analysis ${amplitude?.toFixed(1)}°`,
        );
        expect(coupling.frequencyRatio).toBe(truth.ratio);
        const err = ((coupling.meanRelativePhaseDeg! - truth.relativePhaseDeg! + 540) % 360) - 180;
        expect(Math.abs(err)).toBeLessThan(5);
        expect(Math.abs(amplitude! - truth.swingRangeDeg)).toBeLessThan(0.05 * truth.swingRangeDeg);
      }
    });
  }

  it("reports no coupling for an arm held still on a walking aid", () => {
    const session = synthesizeKinematicSession({ seed: 44, bouts: [{ durationS: 80 }], arms: { heldStill: ["left"] } });
    const analysis = analyze(session.recordings, { heightCm: 172 });
    expect(session.truth.arms.left!.ratio).toBeNull();
    expect(analysis.metrics.armLeg.leftArmRightLeg.meanRelativePhaseDeg).toBeNull();
    expect(analysis.metrics.armLeg.rightArmLeftLeg.meanRelativePhaseDeg).not.toBeNull();
  });
});
