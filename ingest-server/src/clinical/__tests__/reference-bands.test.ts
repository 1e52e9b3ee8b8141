import { describe, expect, it } from "vitest";
import { REFERENCE_BANDS, bandsFor } from "../reference-bands";
import { BASE_METRICS } from "../metric-catalog";

describe("bandsFor", () => {
  it("gives stride-time CV controls 1.94 ± 0.36 % as 1.58–2.30 for any condition (Frenkel-Toledo 2005, JNER 2:23, Table 2)", () => {
    const bands = bandsFor("strideTimeCvPct", { age: 70, condition: "stroke" });
    expect(bands).toHaveLength(1);
    expect(bands[0]!.low).toBeCloseTo(1.58, 9);
    expect(bands[0]!.high).toBeCloseTo(2.3, 9);
    expect(bands[0]!.citation).toMatch(/Frenkel-Toledo.*2:23/);
    expect(bands[0]!.confirmed).toBe(true);
  });

  it("adds the PD band 2.24 ± 0.74 % (1.50–2.98) for a patient with Parkinson's disease (Frenkel-Toledo 2005)", () => {
    const bands = bandsFor("strideTimeCvPct", { age: 70, condition: "parkinsons" });
    expect(bands).toHaveLength(2);
    const pd = bands.find((b) => b.conditions?.includes("parkinsons"))!;
    expect(pd.low).toBeCloseTo(1.5, 9);
    expect(pd.high).toBeCloseTo(2.98, 9);
  });

  it("gives the lab cadence range 100–120 steps/min (Winter 1991 via Baker) at any age", () => {
    const bands = bandsFor("cadenceStepsPerMin", { age: 80, condition: "other" });
    expect(bands.some((b) => b.low === 100 && b.high === 120 && /Winter 1991/.test(b.citation))).toBe(true);
    // The under-70 band (from memory) is not offered at 80.
    expect(bands.some((b) => b.ageMax === 69)).toBe(false);
    expect(bandsFor("cadenceStepsPerMin", { age: 45, condition: "other" }).some((b) => b.ageMax === 69)).toBe(true);
  });

  it("applies per-side keys to the stance band 60–65 % (textbook-level source, DOMAIN.md §4)", () => {
    const [band] = bandsFor("stancePctLeft", { age: 50, condition: "stroke" });
    expect(band?.low).toBe(60);
    expect(band?.high).toBe(65);
  });

  it("marks values DOMAIN.md gives from memory as unconfirmed (PCI 2–3 / 3–4 / 4–7 %)", () => {
    const pci = REFERENCE_BANDS.filter((b) => b.metric === "phaseCoordinationIndexPct");
    expect(pci.length).toBe(3);
    for (const b of pci) expect(b.confirmed).toBe(false);
  });

  it("has no band where no source fits: gait asymmetry, step time, arm–leg metrics", () => {
    for (const key of [
      "gaitAsymmetryPct",
      "stepTimeMeanSLeft",
      "armLegLeftArmRightLegFrequencyRatio",
      "armLegLeftArmRightLegCouplingStrength",
      "armLegRightArmLeftLegMeanRelativePhaseDeg",
      "steadyStrideCount",
    ]) {
      expect(bandsFor(key, { age: 60, condition: "parkinsons" }), key).toEqual([]);
    }
  });

  it("leaves age-limited bands out when the age is unknown", () => {
    expect(bandsFor("dfaAlpha", { age: null, condition: "other" })).toEqual([]);
    expect(bandsFor("dfaAlpha", { age: 25, condition: "other" })).toHaveLength(1);
  });

  it("every band is well-formed and cited", () => {
    for (const b of REFERENCE_BANDS) {
      expect(BASE_METRICS).toContain(b.metric);
      expect(b.low).toBeLessThan(b.high);
      expect(b.citation.length).toBeGreaterThan(5);
    }
  });
});
