import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { METRIC_KEYS } from "../../contracts/metric-catalog";
import { COUNT_STEP, EXPORT_PRECISION, exportCount, exportValue, roundToStep } from "../export-precision";

const fixture = JSON.parse(readFileSync(path.join(__dirname, "fixtures", "export-rounding.json"), "utf8")) as {
  source: string;
  cases: Array<{ value: number; step: number; expected: number }>;
};

describe("export precision table", () => {
  it("has an entry for every metric the catalogue stores, and no stray ones", () => {
    expect(Object.keys(EXPORT_PRECISION).sort()).toEqual([...METRIC_KEYS].sort());
  });

  it("gives each step a reason, and names a source or says common practice", () => {
    for (const [key, p] of Object.entries(EXPORT_PRECISION)) {
      expect(p.step, key).toBeGreaterThan(0);
      expect(p.why.length, key).toBeGreaterThan(10);
      expect(/\d{4}|common practice/.test(p.why), `${key}: ${p.why}`).toBe(true);
    }
  });

  it("uses the steps stated for cadence, CV, PCI and speed", () => {
    expect(EXPORT_PRECISION.cadenceStepsPerMin!.step).toBe(1);
    expect(EXPORT_PRECISION.strideTimeCvPct!.step).toBe(0.1);
    expect(EXPORT_PRECISION.phaseCoordinationIndexPct!.step).toBe(1);
    expect(EXPORT_PRECISION.walkingSpeedMPerS).toMatchObject({ step: 0.05, decimals: 2 });
  });
});

describe(`roundToStep against ${fixture.source} (fixtures/export-rounding.py)`, () => {
  it.each(fixture.cases.map((c) => [c.value, c.step, c.expected]))("%d to a step of %d → %d", (value, step, expected) => {
    expect(roundToStep(value, step)).toBe(expected);
  });

  it("never prints binary noise", () => {
    for (let i = 0; i < 400; i++) {
      const text = String(roundToStep(i * 0.0137, 0.05));
      expect(text.split(".")[1]?.length ?? 0).toBeLessThanOrEqual(2);
    }
  });

  it("refuses a non-finite value or a non-positive step", () => {
    expect(() => roundToStep(Number.NaN, 1)).toThrow(RangeError);
    expect(() => roundToStep(1, 0)).toThrow(RangeError);
  });
});

describe("exportValue / exportCount", () => {
  it("rounds by the metric's own step and keeps null as null", () => {
    expect(exportValue("cadenceStepsPerMin", 97.3846)).toBe(97);
    expect(exportValue("walkingSpeedMPerS", 0.8234)).toBe(0.8);
    expect(exportValue("strideTimeCvPct", 2.349)).toBe(2.3);
    expect(exportValue("cadenceStepsPerMin", null)).toBeNull();
  });

  it("throws for a metric without a precision entry, so nothing leaves unrounded", () => {
    expect(() => exportValue("somethingNew", 1)).toThrow(/no export precision/);
  });

  it(`publishes counts to the nearest ${COUNT_STEP}`, () => {
    expect(exportCount(36)).toBe(35);
    expect(exportCount(38)).toBe(40);
    expect(exportCount(null)).toBeNull();
  });
});
