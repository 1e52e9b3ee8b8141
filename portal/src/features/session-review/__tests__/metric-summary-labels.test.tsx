import { render, screen, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { BASE_METRIC_INFO, formatMetricValue, metricDefinition } from "@pendula/ingest-server/contracts";
import { storedAnalysis } from "@/testing/analysis-fixtures";
import { ArmSwingSummary, CouplingCard, MetricsGrid } from "../components/metric-summary";

// The worked-example walk (docs/methods.md#worked-examples): cadence 109.0909 steps/min, stride-time
// CV 1.2856 %, stance 60 % left (61 % right, invented), left arm swing 31.46°.
const a = storedAnalysis();
const coupling = a.metrics.armLeg.leftArmRightLeg;
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
