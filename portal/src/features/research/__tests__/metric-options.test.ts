import { describe, expect, it } from "vitest";
import { METRIC_KEYS, METRICS, metricDefinition } from "@pendula/ingest-server/contracts";
import { METRIC_OPTIONS } from "../api/cohort-definition";

describe("research metric options", () => {
  it("are all keys of the server's metric catalogue (a stale key would be refused with 400)", () => {
    for (const o of METRIC_OPTIONS) expect(METRIC_KEYS, o.value).toContain(o.value);
  });

  it("offer every catalogue metric once, in catalogue order, named by its catalogue label", () => {
    expect(METRIC_OPTIONS.map((o) => o.value)).toEqual([...METRIC_KEYS]);
    for (const [i, o] of METRIC_OPTIONS.entries()) expect(o.label.startsWith(METRICS[i]!.label.replace(/\)$/, "")), o.value).toBe(true);
  });

  it("offer walking speed and stride length in the catalogue's units", () => {
    const byValue = Object.fromEntries(METRIC_OPTIONS.map((o) => [o.value, o.label]));
    expect(byValue.walkingSpeedMPerS).toMatch(/\(m\/s\)$/);
    expect(metricDefinition("walkingSpeedMPerS")?.unit).toBe("m/s");
    expect(byValue.strideLengthM).toMatch(/\(m\)$/);
    expect(metricDefinition("strideLengthM")?.unit).toBe("m");
  });
});
