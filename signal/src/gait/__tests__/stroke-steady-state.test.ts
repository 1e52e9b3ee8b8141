import { beforeAll, describe, expect, it } from "vitest";
import { analyze } from "../../analyze";
import type { Analysis, Stride } from "../../types";
import { coefficientOfVariationPct } from "../descriptive";
import { excludedStrideCounts } from "../excluded-strides";
import { strideMetrics } from "../stride-metrics";
import { buildSessionStrides } from "../strides";
import { scoreEvents } from "./support/real-walk-trials";
import {
  referenceStrideTimesS,
  SHANKS,
  strokeTreadmillAvailable,
  strokeTreadmillTrials,
  type StrokeTreadmillTrial,
} from "./support/stroke-treadmill-trials";

// Stride-time CV on real stroke walks (Ensink et al. 2024 data set, shared folder, shanks only)
// against the same CV computed from the folder's reference events (foot-IMU rule, not a gold
// standard). The reference CV is defined exactly as Pendula's: the reference ICs and FCs of both
// legs over the folder's `walk` window go through the same stride rules (buildSessionStrides with
// `walk` as the one bout) and the same pooled within-bout CV (strideMetrics). So the comparison
// isolates the detected events; the raw CV of every reference stride in `walk` (which still holds
// the end of the belt start-up) is printed beside it for information.
//
// Target: |ours − reference| ≤ 0.5 CV points. It can only be checked where the events being
// compared are good enough: the legs used meet the folder README's event check (IC F1 ≥ 0.95 within
// ±100 ms, median |error| ≤ 30 ms; common practice) and the per-stride disagreement between our
// stride times and the reference's (SD of the difference, as % of the mean stride) is smaller than
// the reference CV itself. Otherwise event timing noise — ours or the reference's — dominates the
// variability being measured, no stride rule can take it out, and the bound is the per-stride
// disagreement instead (docs/methods.md#steady-state-and-stride-selection: variability needs looser
// tolerances, Godfrey et al. 2015).

const TARGET_POINTS = 0.5;
const EVENT_F1 = 0.95;
const EVENT_MEDIAN_MS = 30;
/** At least this many of the eight trials must be comparable, or the check says little. */
const MIN_COMPARABLE_TRIALS = 3;

interface Row {
  trial: string;
  oursPct: number | null;
  refPct: number | null;
  rawWalkPct: number | null;
  strides: number;
  refStrides: number;
  excluded: Partial<Record<NonNullable<Stride["excludedReason"]>, number>>;
  eventsOk: boolean;
  /** 100·SD(our stride time − the matched reference stride time)/mean stride. */
  jitterCvPct: number | null;
  analysis: Analysis;
}

const fmt = (v: number | null, d = 2) => (v === null ? "—" : v.toFixed(d));
const comparable = (r: Row) => r.eventsOk && r.jitterCvPct !== null && r.refPct !== null && r.jitterCvPct < r.refPct;

describe.skipIf(!strokeTreadmillAvailable)("stroke treadmill walks: stride-time CV over steady state vs the reference events", () => {
  const rows: Row[] = [];

  beforeAll(() => {
    for (const t of strokeTreadmillTrials() as StrokeTreadmillTrial[]) {
      const a = analyze(t.recordings(SHANKS));
      const ref = t.reference;
      const legEvents = (side: "left" | "right") => ({ initialContactsS: ref.events[side].ic, finalContactsS: ref.events[side].fc, midSwingsS: [] });
      // A leg the analysis called unreliable is left out of the reference too (same definition).
      const unreliableSides = (["left", "right"] as const).filter((side) => a.strides.some((s) => s.side === side && s.excludedReason === "unreliable-sensor"));
      const refStrides = buildSessionStrides(legEvents("left"), legEvents("right"), {
        bouts: [{ startS: ref.walk[0] - 1e-6, endS: ref.walk[1] + 1e-6 }],
        turns: [],
        invalidSpans: [],
        unreliableSides,
      });
      const rm = strideMetrics(refStrides);
      const usedSides = (["left", "right"] as const).filter((side) => !unreliableSides.includes(side));
      const eventsOk = usedSides.every((side) => {
        const s = scoreEvents(a.events[side].initialContacts.filter(t.keep), ref.events[side].ic.filter(t.keep));
        // Half a sample of slack: both event lists sit on the 10 ms grid.
        return s.f1 >= EVENT_F1 && s.medianAbsMs <= EVENT_MEDIAN_MS + 5;
      });
      // Per-stride timing error d = our stride time − the reference stride with both ICs within
      // ±100 ms, over our steady strides: event jitter adds var(d) to the stride-time variance.
      const d: number[] = [];
      for (const s of a.strides) {
        if (!s.steady) continue;
        const ic = ref.events[s.side].ic;
        const k = ic.findIndex((x) => Math.abs(x - s.icS) <= 0.1);
        if (k >= 0 && k + 1 < ic.length && Math.abs(ic[k + 1]! - s.nextIcS) <= 0.1) d.push(s.strideTimeS - (ic[k + 1]! - ic[k]!));
      }
      const dSdS = d.length > 1 ? Math.sqrt(d.reduce((acc, x) => acc + x * x, 0) / d.length - (d.reduce((acc, x) => acc + x, 0) / d.length) ** 2) : null;
      const jitterCvPct = dSdS !== null && a.metrics.strideTimeMeanS ? (100 * dSdS) / a.metrics.strideTimeMeanS : null;
      rows.push({
        trial: t.trial,
        oursPct: a.metrics.strideTimeCvPct,
        refPct: rm.strideTimeCvPct,
        rawWalkPct: coefficientOfVariationPct([...referenceStrideTimesS(ref, "left"), ...referenceStrideTimesS(ref, "right")]),
        strides: a.metrics.counts.strideTimeCvPct ?? 0,
        refStrides: rm.counts.strideTimeCvPct ?? 0,
        excluded: excludedStrideCounts(a.strides),
        eventsOk,
        jitterCvPct,
        analysis: a,
      });
    }
  });

  it("prints trial, our CV, reference CV, strides used and strides excluded by reason", () => {
    const lines = ["trial      | ours % | ref %  | ours−ref | raw walk % | strides ours/ref | events ok | per-stride diff SD % | comparable | excluded by reason"];
    for (const r of rows) {
      const d = r.oursPct !== null && r.refPct !== null ? r.oursPct - r.refPct : null;
      const ex = Object.entries(r.excluded)
        .map(([k, v]) => `${k} ${v}`)
        .join(", ");
      lines.push(
        `${r.trial.padEnd(10)} | ${fmt(r.oursPct).padStart(6)} | ${fmt(r.refPct).padStart(6)} | ${(d === null ? "—" : (d >= 0 ? "+" : "") + d.toFixed(2)).padStart(8)} | ${fmt(r.rawWalkPct).padStart(10)} | ${`${r.strides}/${r.refStrides}`.padStart(16)} | ${(r.eventsOk ? "yes" : "no").padEnd(9)} | ${fmt(r.jitterCvPct).padStart(20)} | ${(comparable(r) ? "yes" : "no").padEnd(10)} | ${ex}`,
      );
    }
    const diffs = rows.filter((r) => r.oursPct !== null && r.refPct !== null).map((r) => r.oursPct! - r.refPct!);
    const bias = diffs.reduce((a, b) => a + b, 0) / diffs.length;
    const mae = diffs.reduce((a, b) => a + Math.abs(b), 0) / diffs.length;
    lines.push(`signed bias ${bias >= 0 ? "+" : ""}${bias.toFixed(2)} points, mean |error| ${mae.toFixed(2)} points over ${diffs.length} trials`);
    console.log(lines.join("\n"));
    expect(rows.length).toBe(8);
  });

  it("our CV is within 0.5 points of the reference CV where the events are comparable, else within the per-stride disagreement", () => {
    for (const r of rows) {
      expect(r.oursPct, r.trial).not.toBeNull();
      expect(r.refPct, r.trial).not.toBeNull();
      const tol = comparable(r) ? TARGET_POINTS : Math.max(TARGET_POINTS, r.jitterCvPct!);
      expect(Math.abs(r.oursPct! - r.refPct!), `${r.trial} ours ${fmt(r.oursPct)} ref ${fmt(r.refPct)}`).toBeLessThanOrEqual(tol);
    }
    expect(rows.filter(comparable).length).toBeGreaterThanOrEqual(MIN_COMPARABLE_TRIALS);
  });

  it("takes out the treadmill start-up: every trial reports its exclusions, and the CV is below the raw walk-window CV where the belt start-up reaches into `walk`", () => {
    for (const r of rows) {
      const item = r.analysis.quality.find((q) => q.code === "strides-excluded");
      expect(item?.severity, r.trial).toBe("info");
      // Steady state keeps most strides of these 2–3 minute walks (the reference counts the same legs).
      expect(r.strides, r.trial).toBeGreaterThan(0.5 * r.refStrides);
      expect(r.analysis.metrics.counts.cadenceStepsPerMin, r.trial).toBeGreaterThan(0);
    }
    // Where the raw reference CV over `walk` is inflated by the end of the start-up (it is more
    // than 1.5 × the steady-state reference), ours follows the steady-state one, not the raw one.
    const inflated = rows.filter((r) => r.rawWalkPct! > 1.5 * r.refPct!);
    expect(inflated.length).toBeGreaterThan(0);
    for (const r of inflated) expect(Math.abs(r.oursPct! - r.refPct!), r.trial).toBeLessThan(Math.abs(r.oursPct! - r.rawWalkPct!));
  });
});
