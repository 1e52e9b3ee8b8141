import { describe, expect, it } from "vitest";
import fixtures from "./fixtures/reliability-fixtures.json";
import {
  MDC95_FACTOR,
  importantChangeFor,
  PATIENT_BASELINE_CITATION,
  iccBand,
  minimalDetectableChange95,
  resolveMdc,
  standardErrorOfMeasurement,
} from "../reliability";
import { mean, standardDeviation } from "@pendula/signal";
import { olsFit } from "../statistics";

describe("standardErrorOfMeasurement and minimalDetectableChange95", () => {
  it("reproduces the worked example SD 0.20, ICC 0.90 → SEM 0.06325, MDC95 0.1753 (Weir 2005 formula; docs/methods.md#measurement-error-and-important-change)", () => {
    const sem = standardErrorOfMeasurement(0.2, 0.9);
    expect(sem).toBeCloseTo(0.06325, 4);
    expect(minimalDetectableChange95(sem)).toBeCloseTo(0.1753, 4);
  });

  it("uses the factor 1.96·√2 = 2.7719 (Weir 2005; docs/methods.md#measurement-error-and-important-change)", () => {
    expect(MDC95_FACTOR).toBeCloseTo(2.7719, 4);
    expect(MDC95_FACTOR).toBeCloseTo(fixtures.mdc95_factor, 12);
  });

  it.each(fixtures.sem_mdc)("matches the NumPy-generated fixture SD $sd, ICC $icc (generate-reliability-fixtures.py)", (f) => {
    const sem = standardErrorOfMeasurement(f.sd, f.icc);
    expect(sem).toBeCloseTo(f.sem, 10);
    expect(minimalDetectableChange95(sem)).toBeCloseTo(f.mdc95, 10);
  });

  it("rejects an ICC outside [0, 1] and a negative SD", () => {
    expect(() => standardErrorOfMeasurement(0.2, 1.2)).toThrow(RangeError);
    expect(() => standardErrorOfMeasurement(-1, 0.5)).toThrow(RangeError);
    expect(() => minimalDetectableChange95(Number.NaN)).toThrow(RangeError);
  });
});

describe("iccBand (Koo & Li 2016 cut-offs, docs/methods.md#measurement-error-and-important-change)", () => {
  it("places values on both sides of each cut-off", () => {
    expect(iccBand(0.49)).toBe("poor");
    expect(iccBand(0.5)).toBe("moderate");
    expect(iccBand(0.566)).toBe("moderate"); // PCI ICC, Richmond 2025
    expect(iccBand(0.75)).toBe("good");
    expect(iccBand(0.9)).toBe("good");
    expect(iccBand(0.91)).toBe("excellent");
  });
});

describe("sample statistics against NumPy/SciPy fixtures", () => {
  it.each(Object.entries(fixtures.sd))("mean and SD (ddof 1) of %s match numpy", (_name, f) => {
    expect(mean(f.values)).toBeCloseTo(f.mean, 12);
    expect(standardDeviation(f.values, 1)).toBeCloseTo(f.sd, 12);
  });

  it("stride CV of [1.10, 1.12, 1.08, 1.11, 1.09, 1.10] s is 1.2856 % (docs/methods.md#worked-examples, ddof 1)", () => {
    const v = fixtures.sd.stride.values;
    expect((100 * standardDeviation(v, 1)!) / mean(v)!).toBeCloseTo(1.2856, 4);
  });

  it("OLS slope and intercept match scipy.stats.linregress", () => {
    const fit = olsFit(fixtures.ols.x, fixtures.ols.y);
    expect(fit.slope).toBeCloseTo(fixtures.ols.slope, 12);
    expect(fit.intercept).toBeCloseTo(fixtures.ols.intercept, 12);
  });

  it("gives no mean or SD where none is defined (null: no values, one value for the sample SD)", () => {
    expect(mean([])).toBeNull();
    expect(standardDeviation([1], 1)).toBeNull();
  });

  it("refuses a single point, constant x and non-finite values in the line fit", () => {
    expect(() => olsFit([1], [2])).toThrow(RangeError);
    expect(() => olsFit([1, 1], [2, 3])).toThrow(RangeError);
    expect(() => olsFit([1, 2], [2, Number.NaN])).toThrow(RangeError);
  });
});

describe("resolveMdc", () => {
  const baseline = { mean: 80, sd: 4, n: 3 };

  it("uses Nair, Hornby & Behrman 2012 MDC% 21 % for cadence in incomplete SCI: 21 % of the baseline mean", () => {
    const mdc = resolveMdc("cadenceStepsPerMin", "incomplete_sci", baseline);
    expect(mdc?.source).toBe("published");
    expect(mdc?.value).toBeCloseTo(16.8, 10); // 0.21 × 80
    expect(mdc?.citation).toMatch(/Nair/);
  });

  it("does not apply Nair 2012's 80 % (double support TIME per limb) to double support as % of the stride", () => {
    const mdc = resolveMdc("doubleSupportPct", "incomplete_sci", { mean: 30, sd: 2, n: 3 });
    expect(mdc?.source).toBe("patient-baseline");
    expect(mdc?.value).toBeCloseTo(2 * MDC95_FACTOR, 10);
  });

  it.each([
    [0.3, 0.05],
    [0.399, 0.05],
    [0.4, 0.11],
    [0.8, 0.11],
    [0.81, 0.21],
  ])("stroke walking speed, baseline %s m/s → Hosoi 2023 MDC %s m/s (speed groups < 0.4, 0.4–0.8, > 0.8)", (speed, expected) => {
    const mdc = resolveMdc("walkingSpeedMPerS", "stroke", { mean: speed, sd: 0.01, n: 3 });
    expect(mdc?.source).toBe("published");
    expect(mdc?.value).toBeCloseTo(expected, 12);
    expect(mdc?.citation).toMatch(/Hosoi.*2023/);
    expect(mdc?.alternative?.source).toBe("patient-baseline");
  });

  it("PD walking speed uses Combs 2014 MDC95 0.09 m/s; iSCI speed has no confirmed published value and uses the baseline", () => {
    expect(resolveMdc("walkingSpeedMPerS", "parkinsons", { mean: 1.0, sd: 0.01, n: 3 })?.value).toBeCloseTo(0.09, 12);
    expect(resolveMdc("walkingSpeedMPerS", "incomplete_sci", { mean: 0.6, sd: 0.05, n: 3 })?.source).toBe("patient-baseline");
  });

  it("uses the larger estimate when the patient's own week-to-week error exceeds the published one", () => {
    // Baseline SD 0.05 m/s → 0.1386 m/s > Hosoi's 0.11 m/s for the 0.4–0.8 group.
    const mdc = resolveMdc("walkingSpeedMPerS", "stroke", { mean: 0.6, sd: 0.05, n: 3 });
    expect(mdc?.source).toBe("patient-baseline");
    expect(mdc?.value).toBeCloseTo(0.05 * MDC95_FACTOR, 12);
    expect(mdc?.alternative).toMatchObject({ source: "published", value: 0.11 });
  });

  it("falls back to the patient's baseline for another condition: MDC95 = 2.7719 × baseline SD", () => {
    const mdc = resolveMdc("cadenceStepsPerMin", "stroke", baseline);
    expect(mdc?.source).toBe("patient-baseline");
    expect(mdc?.value).toBeCloseTo(4 * 2.7718585822512662, 10);
    expect(mdc?.citation).toBe(PATIENT_BASELINE_CITATION);
  });

  it("falls back to the baseline for an iSCI metric with no published value in our notes (stride CV)", () => {
    expect(resolveMdc("strideTimeCvPct", "incomplete_sci", baseline)?.source).toBe("patient-baseline");
  });

  it("gives no MDC without a baseline or with a zero baseline SD", () => {
    expect(resolveMdc("strideTimeCvPct", "stroke", null)).toBeNull();
    expect(resolveMdc("strideTimeCvPct", "stroke", { mean: 2, sd: 0, n: 3 })).toBeNull();
  });
});

describe("importantChangeFor (interpretation only, never a flag threshold)", () => {
  it("gives the subacute-stroke MCID 0.16 m/s (Tilson 2010) and the PD small/moderate/large 0.06/0.14/0.22 m/s (Hass 2014)", () => {
    expect(importantChangeFor("walkingSpeedMPerS", "stroke")?.thresholds.map((t) => t.value)).toEqual([0.16]);
    expect(importantChangeFor("walkingSpeedMPerS", "stroke")?.population).toMatch(/20 to 60 days/);
    expect(importantChangeFor("walkingSpeedMPerS", "parkinsons")?.thresholds.map((t) => t.value)).toEqual([0.06, 0.14, 0.22]);
    expect(importantChangeFor("walkingSpeedMPerS", "incomplete_sci")).toBeNull();
    expect(importantChangeFor("cadenceStepsPerMin", "stroke")).toBeNull();
  });
});
