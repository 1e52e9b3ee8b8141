import type { PerSide, Stride } from "../types";
import { coefficientOfVariationPct, mean } from "./descriptive";

export interface StrideMetrics {
  steadyStrideCount: number;
  cadenceStepsPerMin: number | null;
  strideTimeMeanS: number | null;
  strideTimeCvPct: number | null;
  stepTimeMeanS: PerSide<number | null>;
  stancePct: PerSide<number | null>;
  swingPct: PerSide<number | null>;
  swingTimeMeanS: PerSide<number | null>;
  doubleSupportPct: number | null;
}

const values = (strides: readonly Stride[], pick: (s: Stride) => number | null | undefined): number[] =>
  strides.map(pick).filter((v): v is number => typeof v === "number" && Number.isFinite(v));

/**
 * Temporal metrics over steady-state strides (definitions in DOMAIN.md §3, Mobilise-D protocol):
 * cadence = 60 / mean step time (steps of both sides pooled); stride time mean and CV (both legs
 * pooled, SD with n − 1); step time, stance % and swing % per side (means over strides);
 * double support % = mean over strides of 100·(initial + terminal DS)/stride.
 */
export function strideMetrics(strides: readonly Stride[]): StrideMetrics {
  const steady = strides.filter((s) => s.steady);
  const side = (sd: "left" | "right") => steady.filter((s) => s.side === sd);
  const left = side("left");
  const right = side("right");
  const stepMean = mean(values(steady, (s) => s.stepTimeS));
  const strideTimes = values(steady, (s) => s.strideTimeS);
  return {
    steadyStrideCount: steady.length,
    cadenceStepsPerMin: stepMean === null ? null : 60 / stepMean,
    strideTimeMeanS: mean(strideTimes),
    strideTimeCvPct: coefficientOfVariationPct(strideTimes, 1),
    stepTimeMeanS: { left: mean(values(left, (s) => s.stepTimeS)), right: mean(values(right, (s) => s.stepTimeS)) },
    stancePct: { left: mean(values(left, (s) => s.stancePct)), right: mean(values(right, (s) => s.stancePct)) },
    swingPct: { left: mean(values(left, (s) => s.swingPct)), right: mean(values(right, (s) => s.swingPct)) },
    swingTimeMeanS: { left: mean(values(left, (s) => s.swingTimeS)), right: mean(values(right, (s) => s.swingTimeS)) },
    doubleSupportPct: mean(values(steady, (s) => s.doubleSupportPct)),
  };
}
