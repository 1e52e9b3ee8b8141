import { render, screen, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import type { Analysis, Metrics } from "@pendula/signal";
import { BASE_METRIC_INFO, formatMetricValue, metricDefinition } from "@pendula/ingest-server/contracts";
import { ArmSwingSummary, CouplingCard, MetricsGrid } from "../components/metric-summary";

// Invented values: stride 1.10 s, stance 0.66 s (60 %), step 0.55 s, as in docs/methods.md#worked-examples.
const coupling = { frequencyRatio: 1, meanRelativePhaseDeg: -20, couplingStrength: 0.8, circularSdDeg: 30, reason: null };
const metrics: Metrics = {
  steadyStrideCount: 40,
  cadenceStepsPerMin: 109.0909,
  strideTimeMeanS: 1.1,
  strideTimeCvPct: 1.2856,
  stepTimeMeanS: { left: 0.55, right: 0.55 },
  stancePct: { left: 60, right: 61 },
  swingPct: { left: 40, right: 39 },
  doubleSupportPct: 20,
  phaseCoordinationIndexPct: 4.2,
  gaitAsymmetryPct: 10.0083,
  dfaAlpha: null,
  dfaAlphaReason: "fewer than 256 strides",
  walkingSpeedMPerS: 1.1,
  strideLengthM: 1.21,
  walkingSpeedReason: null,
  swingTimeCvPct: { left: 3.1, right: 3.9 },
  stepTimeAsymmetryPct: 2.5,
  armSwing: { left: { amplitudeDeg: 31.46 }, right: { amplitudeDeg: 12 }, asymmetryPct: 89.6 },
  armSwingReason: null,
  counts: {},
  armLeg: { leftArmRightLeg: coupling, rightArmLeftLeg: coupling },
};
const a = { metrics } as unknown as Analysis;
const labels = (el: HTMLElement) => [...el.querySelectorAll("dt")].map((dt) => dt.textContent);
const def = (key: string) => metricDefinition(key)!;

describe("the session summary names and prints each metric from the one catalogue", () => {
  it("gait measures: catalogue short labels, decimals and units", () => {
    render(<MetricsGrid a={a} />);
    const grid = screen.getByLabelText("Gait measures");
    expect(labels(grid)).toEqual(
      [
        "walkingSpeedMPerS",
        "strideLengthM",
        "cadenceStepsPerMin",
        "strideTimeMeanS",
        "strideTimeCvPct",
        `${BASE_METRIC_INFO.swingTimeCvPct.name} L / R`,
        `${BASE_METRIC_INFO.stancePct.name} L / R`,
        "doubleSupportPct",
        "stepTimeAsymmetryPct",
        "gaitAsymmetryPct",
        "phaseCoordinationIndexPct",
        "steadyStrideCount",
      ].map((k) => (k.includes(" ") ? k : def(k).shortLabel)),
    );
    // 109.0909 steps/min at the catalogue's 1 decimal; 1.2856 % at 2.
    expect(within(grid).getByText(def("cadenceStepsPerMin").shortLabel).parentElement!.textContent).toContain("109.1 steps/min");
    expect(within(grid).getByText(def("strideTimeCvPct").shortLabel).parentElement!.textContent).toContain("1.29 %");
    expect(within(grid).getByText("Stance L / R").parentElement!.textContent).toContain("60.0 % / 61.0 %");
  });

  it("arm swing and an arm–leg pair: catalogue labels", () => {
    render(<ArmSwingSummary a={a} />);
    expect(labels(screen.getByLabelText("Arm swing"))).toEqual(["armSwingAmplitudeDegLeft", "armSwingAmplitudeDegRight", "armSwingAsymmetryPct"].map((k) => def(k).shortLabel));
    expect(screen.getByText(def("armSwingAmplitudeDegLeft").shortLabel).parentElement!.textContent).toContain(formatMetricValue(def("armSwingAmplitudeDegLeft"), 31.46));

    const { container } = render(<CouplingCard title="Left arm – right leg" c={coupling} />);
    expect(labels(container)).toEqual([BASE_METRIC_INFO.frequencyRatio.name, BASE_METRIC_INFO.couplingStrength.name, BASE_METRIC_INFO.meanRelativePhaseDeg.name]);
  });
});
