import type { PerSide, Side, Stride } from "../types";
import { mean } from "./descriptive";
import { gaitAsymmetryPct } from "./gait-asymmetry";
import { pooledWithinBoutCvPct } from "./pooled-variability";
import { stepTimeAsymmetryPct } from "./step-asymmetry";

export interface StrideMetrics {
  steadyStrideCount: number;
  cadenceStepsPerMin: number | null;
  strideTimeMeanS: number | null;
  strideTimeCvPct: number | null;
  stepTimeMeanS: PerSide<number | null>;
  stancePct: PerSide<number | null>;
  swingPct: PerSide<number | null>;
  swingTimeMeanS: PerSide<number | null>;
  swingTimeCvPct: PerSide<number | null>;
  doubleSupportPct: number | null;
  gaitAsymmetryPct: number | null;
  stepTimeAsymmetryPct: number | null;
  /** Strides or steps behind each metric above, keyed by its name in `Metrics` (per side: `…Left`/`…Right`). */
  counts: Record<string, number>;
}

const values = (strides: readonly Stride[], pick: (s: Stride) => number | null | undefined): number[] =>
  strides.map(pick).filter((v): v is number => typeof v === "number" && Number.isFinite(v));

/** Values of steady strides grouped by walking bout (strides outside any bout form one group). */
function byBout(strides: readonly Stride[], pick: (s: Stride) => number | null | undefined): number[][] {
  const groups = new Map<number, Stride[]>();
  for (const s of strides) {
    const k = s.boutIndex ?? -1;
    const g = groups.get(k) ?? [];
    g.push(s);
    groups.set(k, g);
  }
  return [...groups.values()].map((g) => values(g, pick));
}

/**
 * Temporal metrics over steady-state strides (definitions in
 * docs/methods.md#stride-step-and-cadence, Mobilise-D protocol): cadence = 60 / mean step time
 * (steps of both sides pooled; 120 / mean stride time when only one leg's events are usable, and
 * then `counts.cadenceStepsPerMin` counts strides); stride time mean (both legs pooled);
 * stride-time CV and swing-time CV (per side) as the pooled within-bout SD over the grand mean
 * (pooled-variability.ts; SD with n − 1 within each bout), so a change of pace between bouts does
 * not count as variability; step time, stance % and swing % per side (means over strides);
 * double support % = mean over strides of 100·(initial + terminal DS)/stride; gait asymmetry from
 * the mean swing times and step-time asymmetry from the mean step times (same log-ratio form).
 */
export function strideMetrics(strides: readonly Stride[]): StrideMetrics {
  const steady = strides.filter((s) => s.steady);
  const side = (sd: Side) => steady.filter((s) => s.side === sd);
  const left = side("left");
  const right = side("right");
  const steps = values(steady, (s) => s.stepTimeS);
  const stepMean = mean(steps);
  const strideTimes = values(steady, (s) => s.strideTimeS);
  const strideCv = pooledWithinBoutCvPct(byBout(steady, (s) => s.strideTimeS));
  const swingCvL = pooledWithinBoutCvPct(byBout(left, (s) => s.swingTimeS));
  const swingCvR = pooledWithinBoutCvPct(byBout(right, (s) => s.swingTimeS));
  const stepL = values(left, (s) => s.stepTimeS);
  const stepR = values(right, (s) => s.stepTimeS);
  const stanceL = values(left, (s) => s.stancePct);
  const stanceR = values(right, (s) => s.stancePct);
  const swingPctL = values(left, (s) => s.swingPct);
  const swingPctR = values(right, (s) => s.swingPct);
  const swingL = values(left, (s) => s.swingTimeS);
  const swingR = values(right, (s) => s.swingTimeS);
  const ds = values(steady, (s) => s.doubleSupportPct);
  const swingTimeMeanS = { left: mean(swingL), right: mean(swingR) };
  const stepTimeMeanS = { left: mean(stepL), right: mean(stepR) };
  const ga = gaitAsymmetryPct(swingTimeMeanS.left, swingTimeMeanS.right);
  const sta = stepTimeAsymmetryPct(stepTimeMeanS.left, stepTimeMeanS.right);
  // With one leg's events only (the other sensor unreliable or missing) there are no steps; cadence
  // then comes from the stride time, 120 / mean stride (docs/methods.md#stride-step-and-cadence),
  // and its count is strides.
  const strideMean = mean(strideTimes);
  const cadence = stepMean !== null ? 60 / stepMean : strideMean !== null ? 120 / strideMean : null;
  return {
    steadyStrideCount: steady.length,
    cadenceStepsPerMin: cadence,
    strideTimeMeanS: mean(strideTimes),
    strideTimeCvPct: strideCv.cvPct,
    stepTimeMeanS,
    stancePct: { left: mean(stanceL), right: mean(stanceR) },
    swingPct: { left: mean(swingPctL), right: mean(swingPctR) },
    swingTimeMeanS,
    swingTimeCvPct: { left: swingCvL.cvPct, right: swingCvR.cvPct },
    doubleSupportPct: mean(ds),
    gaitAsymmetryPct: ga,
    stepTimeAsymmetryPct: sta,
    counts: {
      steadyStrideCount: steady.length,
      cadenceStepsPerMin: stepMean !== null ? steps.length : strideTimes.length,
      strideTimeMeanS: strideTimes.length,
      strideTimeCvPct: strideCv.count,
      stepTimeMeanSLeft: stepL.length,
      stepTimeMeanSRight: stepR.length,
      stancePctLeft: stanceL.length,
      stancePctRight: stanceR.length,
      swingPctLeft: swingPctL.length,
      swingPctRight: swingPctR.length,
      swingTimeCvPctLeft: swingCvL.count,
      swingTimeCvPctRight: swingCvR.count,
      doubleSupportPct: ds.length,
      gaitAsymmetryPct: ga === null ? 0 : swingL.length + swingR.length,
      stepTimeAsymmetryPct: sta === null ? 0 : stepL.length + stepR.length,
    },
  };
}
