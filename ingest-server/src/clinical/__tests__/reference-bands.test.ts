import { describe, expect, it } from "vitest";
import { BASE_METRICS } from "../../contracts/metric-catalog";
import { NO_BAND_FOR_MEASURE, NO_BAND_FOR_PATIENT, REFERENCE_BANDS, bandNote, bandsFor } from "../reference-bands";
import { PUBLISHED_MDC } from "../reliability";

const labelsOf = (key: string, age: number | null, condition: string) => bandsFor(key, { age, condition }).map((b) => b.id);

describe("the band catalogue: every band is sourced, located and describes its population", () => {
  it.each(REFERENCE_BANDS.map((b) => [b.id, b] as const))("%s", (_id, b) => {
    expect(BASE_METRICS).toContain(b.metric);
    expect(b.low).toBeLessThan(b.high);
    expect(b.population.description.length).toBeGreaterThan(10);
    expect(["patient-group", "healthy-comparison"]).toContain(b.population.role);
    if (b.population.role === "patient-group") expect(b.population.conditions?.length).toBeGreaterThan(0);
    expect(b.walkingCondition.length).toBeGreaterThan(5);
    expect(b.measurementSystem.length).toBeGreaterThan(5);
    expect(b.publishedValue.length).toBeGreaterThan(3);
    expect(b.derivation.length).toBeGreaterThan(5);
    // A citation names authors, year and volume:page; the location names a table, figure or the abstract.
    expect(b.citation).toMatch(/\b(19|20)\d\d\b.*\d+:\d+/);
    expect(b.location).toMatch(/^(Table \d+|Figure \d+|abstract)/);
    // Nothing unconfirmed ships.
    expect(JSON.stringify(b)).not.toMatch(/from memory|unconfirmed|verify/i);
    // The band is the published value: mean ± 1 SD bands are centred on the published mean.
    const m = /^([\d.]+) ± ([\d.]+)/.exec(b.publishedValue);
    if (m && b.derivation.startsWith("mean ± 1")) {
      expect((b.low + b.high) / 2).toBeCloseTo(Number(m[1]), 9);
      expect((b.high - b.low) / 2).toBeCloseTo(Number(m[2]), 9);
    }
  });

  it("has unique ids", () => {
    expect(new Set(REFERENCE_BANDS.map((b) => b.id)).size).toBe(REFERENCE_BANDS.length);
  });

  it("every published MDC names its population, system, value and location", () => {
    for (const p of PUBLISHED_MDC) {
      expect(p.population.length, p.id).toBeGreaterThan(10);
      expect(p.measurementSystem.length, p.id).toBeGreaterThan(5);
      expect(p.publishedValue, p.id).toMatch(/MDC/);
      expect(p.citation, p.id).toMatch(/\b20\d\d\b.*\d+/);
      expect(p.location, p.id).toMatch(/^(Table \d+|Figure \d+|abstract)/);
    }
  });
});

describe("bandsFor: only bands that describe the patient", () => {
  it("stride-time CV: the older-controls band 1.94 ± 0.36 % (1.58–2.30, Frenkel-Toledo 2005 Table 2) at 70, not at 35", () => {
    const [band] = bandsFor("strideTimeCvPct", { age: 70, condition: "stroke" });
    expect(band?.low).toBeCloseTo(1.58, 9);
    expect(band?.high).toBeCloseTo(2.3, 9);
    expect(band?.label).toMatch(/older adults/);
    expect(bandsFor("strideTimeCvPct", { age: 35, condition: "stroke" })).toEqual([]);
  });

  it("adds the PD band 2.24 ± 0.74 % (1.50–2.98) only for Parkinson's disease", () => {
    expect(labelsOf("strideTimeCvPct", 70, "parkinsons")).toEqual(["stride-cv-older-controls-frenkel-toledo-2005", "stride-cv-pd-frenkel-toledo-2005"]);
    const pd = bandsFor("strideTimeCvPct", { age: 70, condition: "parkinsons" })[1]!;
    expect(pd.low).toBeCloseTo(1.5, 9);
    expect(pd.high).toBeCloseTo(2.98, 9);
  });

  it("PCI: Zadik 2022 3.16 ± 1.11 % at 40–74 y, 5.68 ± 2.01 % from 75 y, none under 40 without stroke", () => {
    expect(labelsOf("phaseCoordinationIndexPct", 50, "other")).toEqual(["pci-40-74-zadik-2022"]);
    expect(labelsOf("phaseCoordinationIndexPct", 74, "other")).toEqual(["pci-40-74-zadik-2022"]);
    expect(labelsOf("phaseCoordinationIndexPct", 75, "other")).toEqual(["pci-75plus-zadik-2022"]);
    expect(labelsOf("phaseCoordinationIndexPct", 30, "incomplete_sci")).toEqual([]);
    const old = bandsFor("phaseCoordinationIndexPct", { age: 80, condition: "other" })[0]!;
    expect([old.low, old.high]).toEqual([3.67, 7.69]);
    expect(old.note).toMatch(/walking speed/);
  });

  it("PCI, gait asymmetry and speed after stroke: Meijer 2011 stroke and its controls, for stroke patients only", () => {
    expect(labelsOf("phaseCoordinationIndexPct", 30, "stroke")).toEqual(["pci-stroke-meijer-2011", "pci-stroke-controls-meijer-2011"]);
    const ga = bandsFor("gaitAsymmetryPct", { age: 60, condition: "stroke" });
    expect(ga.map((b) => [b.low, b.high])).toEqual([
      [20.7, 31.9],
      [4.3, 6.7],
    ]);
    expect(bandsFor("gaitAsymmetryPct", { age: 60, condition: "parkinsons" })).toEqual([]);
    expect(labelsOf("walkingSpeedMPerS", 60, "stroke")).toEqual(["speed-stroke-meijer-2011", "speed-stroke-controls-meijer-2011"]);
  });

  it("cadence: the adult laboratory range 81–138 steps/min (Tudor-Locke & Rowe 2012) at any adult age, with no under-70 band", () => {
    for (const age of [25, 69, 70, 85]) expect(labelsOf("cadenceStepsPerMin", age, "other"), String(age)).toEqual(["cadence-adults-tudor-locke-rowe-2012"]);
    expect(labelsOf("cadenceStepsPerMin", 16, "other")).toEqual([]);
  });

  it("applies per-side keys to stance and swing bands (Frenkel-Toledo 2005 Table 2; stance = 100 − swing)", () => {
    const [stance] = bandsFor("stancePctLeft", { age: 65, condition: "stroke" });
    expect(stance?.low).toBeCloseTo(62.76, 9);
    expect(stance?.high).toBeCloseTo(66.7, 9);
    const [swing] = bandsFor("swingPctRight", { age: 65, condition: "stroke" });
    expect(swing?.low).toBeCloseTo(33.3, 9);
    // Only the stored spelling is a metric key: a dotted variant gets no band rather than a guess.
    expect(bandsFor("swingPct.right", { age: 65, condition: "stroke" })).toEqual([]);
  });

  it("DFA α: Hausdorff 1997 young 0.87 ± 0.15 and elderly 0.68 ± 0.14 by age, nothing in between", () => {
    expect(labelsOf("dfaAlpha", 25, "other")).toEqual(["dfa-young-hausdorff-1997"]);
    expect(labelsOf("dfaAlpha", 72, "other")).toEqual(["dfa-elderly-hausdorff-1997"]);
    expect(labelsOf("dfaAlpha", 50, "other")).toEqual([]);
  });

  it("leaves age-limited bands out when the age is unknown", () => {
    expect(bandsFor("dfaAlpha", { age: null, condition: "other" })).toEqual([]);
    expect(labelsOf("phaseCoordinationIndexPct", null, "stroke")).toEqual(["pci-stroke-meijer-2011", "pci-stroke-controls-meijer-2011"]);
  });

  it("has no band where no source fits: step time, double support, arm–leg and arm-swing metrics, stride count", () => {
    for (const key of [
      "stepTimeMeanSLeft",
      "doubleSupportPct",
      "armLegLeftArmRightLegFrequencyRatio",
      "armLegRightArmLeftLegMeanRelativePhaseDeg",
      "steadyStrideCount",
      "strideLengthM",
      "armSwingAmplitudeDegLeft",
      "stepTimeAsymmetryPct",
    ]) {
      expect(bandsFor(key, { age: 60, condition: "parkinsons" }), key).toEqual([]);
      expect(bandNote(key, { age: 60, condition: "parkinsons" }), key).toBe(NO_BAND_FOR_MEASURE);
    }
  });

  it("says 'no published band for this patient' when bands exist for the measure but not for this patient", () => {
    expect(bandNote("strideTimeCvPct", { age: 35, condition: "incomplete_sci" })).toBe(NO_BAND_FOR_PATIENT);
    expect(bandNote("strideTimeCvPct", { age: 70, condition: "incomplete_sci" })).toBeNull();
    expect(bandNote("dfaAlpha", { age: null, condition: "other" })).toMatch(/age is unknown/);
  });

});
