import { describe, expect, it } from "vitest";
import { CASELOAD_FLAG_SEVERITY, describeCaseloadFlag, orderCaseloadFlags } from "../caseload-flags";

describe("caseload flags: named in words, worst first", () => {
  it.each([
    [{ metricKey: "strideTimeCvPct", flag: "worsened" }, "worsened", "Stride-time variability worse than baseline"],
    [{ metricKey: "cadenceStepsPerMin", flag: "improved" }, "improved", "Cadence better than baseline"],
    [{ metricKey: "phaseCoordinationIndexPct", flag: "pci-rise" }, "left-right-coordination", "Left–right coordination (PCI) worse than baseline"],
    [{ metricKey: "armLegLeftArmRightLegCouplingStrength", flag: "coupling-drop" }, "coupling-drop", "Arm–leg coupling weaker than baseline (left arm – right leg)"],
    [{ metricKey: "armLegRightArmLeftLegFrequencyRatio", flag: "arm-leg-mode-change" }, "coordination-change", "Arm–leg coordination mode changed (right arm – left leg)"],
    [{ metricKey: "armLegRightArmLeftLegMeanRelativePhaseDeg", flag: "changed" }, "phase-shift", "Arm–leg phase shifted (right arm – left leg)"],
    [{ metricKey: "strideTimeCvPct", flag: "few-strides" }, "few-strides", "Stride-time variability not compared: too few strides"],
    [{ metricKey: "cadenceStepsPerMin", flag: "something-new" }, "other", "Cadence: something-new"],
  ])("%o → %s, “%s”", (input, kind, label) => {
    const d = describeCaseloadFlag(input);
    expect(d.kind).toBe(kind);
    expect(d.label).toBe(label);
    expect(d.severity).toBe(CASELOAD_FLAG_SEVERITY[d.kind]);
    expect(d).toMatchObject(input);
  });

  it("orders worse-than-baseline first, coordination events next, improvements last", () => {
    const ordered = orderCaseloadFlags([
      { metricKey: "cadenceStepsPerMin", flag: "improved" },
      { metricKey: "armLegLeftArmRightLegFrequencyRatio", flag: "arm-leg-mode-change" },
      { metricKey: "phaseCoordinationIndexPct", flag: "worsened" },
      { metricKey: "cadenceStepsPerMin", flag: "worsened" },
    ]);
    expect(ordered.map((f) => f.kind)).toEqual(["worsened", "worsened", "coordination-change", "improved"]);
    expect(ordered[0]!.label).toBe("Cadence worse than baseline"); // ties by label
    expect(orderCaseloadFlags([])).toEqual([]);
  });
});
