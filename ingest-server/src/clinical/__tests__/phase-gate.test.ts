import { describe, expect, it } from "vitest";
import fixtures from "./fixtures/reliability-fixtures.json";
import { annotateTrends } from "../annotate-trends";
import { PHASE_GATE_DEFAULT_STRIDES, gatePhaseSeries, phaseExclusion } from "../phase-gate";
import { weekly } from "./helpers";

const PHASE_L = "armLegLeftArmRightLegMeanRelativePhaseDeg";
const R_L = "armLegLeftArmRightLegCouplingStrength";
const PHASE_R = "armLegRightArmLeftLegMeanRelativePhaseDeg";
const R_R = "armLegRightArmLeftLegCouplingStrength";

describe("phaseExclusion: Rayleigh test of R at p < 0.05 (Zar's approximation, checked by Monte Carlo in the fixture script)", () => {
  it.each(fixtures.rayleigh)("n $n, R $r → passes only when p < 0.05 (p $p_monte_carlo by simulation)", (f) => {
    expect(phaseExclusion(f.r, f.n)).toBe(f.p_monte_carlo < 0.05 ? null : "weak-coupling");
  });

  it("uses 10 strides when the stride count is missing (the fewest for which R is reported)", () => {
    expect(PHASE_GATE_DEFAULT_STRIDES).toBe(10);
    expect(phaseExclusion(0.6, undefined)).toBeNull(); // p 0.023
    expect(phaseExclusion(0.5, undefined)).toBe("weak-coupling"); // p 0.079
    // With 40 strides the same R = 0.5 is far from uniform.
    expect(phaseExclusion(0.5, 40)).toBeNull();
  });

  it("excludes a phase without a coupling strength", () => {
    expect(phaseExclusion(undefined, 30)).toBe("no-coupling-strength");
    expect(phaseExclusion(Number.NaN, 30)).toBe("no-coupling-strength");
  });
});

describe("gatePhaseSeries", () => {
  it("marks a phase point whose same-pair R fails, using that session's stride count, and leaves the other pair alone", () => {
    const metrics = [
      { key: PHASE_L, points: weekly([170, 20, 175]) },
      { key: R_L, points: weekly([0.9, 0.3, 0.9]) },
      { key: PHASE_R, points: weekly([10, 12, 11]) },
      { key: R_R, points: weekly([0.3, 0.3, 0.3]) },
      { key: "steadyStrideCount", points: weekly([12, 12, 80]) },
    ];
    const gated = gatePhaseSeries(metrics);
    expect(gated[0]!.points.map((p) => p.excludedReason)).toEqual([undefined, "weak-coupling", undefined]);
    // R 0.3: p ≈ 0.34 with 12 strides (fails), p < 0.001 with 80 strides (passes).
    expect(gated[2]!.points.map((p) => p.excludedReason)).toEqual(["weak-coupling", "weak-coupling", undefined]);
    expect(gated[1]).toBe(metrics[1]);
  });
});

describe("annotateTrends compares phase only where coupling is real", () => {
  it("drops a weakly coupled session from the phase baseline; 175° vs −178° shows no change", () => {
    const r = annotateTrends({
      patient: { birthYear: 1960, condition: "stroke", enrolledOn: "2026-09-01" },
      metrics: [
        { key: PHASE_L, unit: "deg", points: weekly([172, 60, 175, 178, -178]) },
        { key: R_L, unit: "1", points: weekly([0.9, 0.2, 0.85, 0.9, 0.88]) },
        { key: "steadyStrideCount", unit: "{strides}", points: weekly([30, 30, 30, 30, 30]) },
      ],
    });
    const phase = r.metrics[0]!;
    expect(phase.points[1]).toMatchObject({ sessionId: "s2", excludedReason: "weak-coupling" });
    expect(phase.baseline?.mean).toBeCloseTo(175, 9);
    expect(phase.points[4]!.flag).toBe("within-error");
  });
});
