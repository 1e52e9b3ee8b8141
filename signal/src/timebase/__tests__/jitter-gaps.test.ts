import { describe, expect, it } from "vitest";
import { analyze } from "../../analyze";
import { readSensorCsv } from "../../io";
import { synthesizeSession } from "../../synth";

// Common practice (no published source): interpolate only across real dropouts, and estimate the
// device clock over the whole file so timestamp jitter neither invents gaps nor a rate mismatch.
describe("gap detection and effective rate under timestamp jitter", () => {
  const run = (gaps: { placement: "left_shank"; startS: number; durationS: number }[]) => {
    const s = synthesizeSession({ seed: 31, durationS: 60, sampleRateHz: 100, timestampJitterS: 0.002, gaps });
    return analyze(s.files.map((f) => readSensorCsv(f.text, f.fileName)));
  };

  it("2 ms jitter at 100 Hz reports no gaps and no rate mismatch", () => {
    const a = run([]);
    expect(a.quality.filter((q) => q.code === "gap" || q.code === "rate-mismatch")).toEqual([]);
  });

  it("a real 60 ms dropout under the same jitter is still reported as one interpolated gap", () => {
    const a = run([{ placement: "left_shank", startS: 30, durationS: 0.06 }]);
    const gaps = a.quality.filter((q) => q.code === "gap");
    expect(gaps).toHaveLength(1);
    expect(gaps[0]!.message).toMatch(/1 short gap/);
    expect(gaps[0]!.startS!).toBeGreaterThan(29.9);
    expect(gaps[0]!.startS!).toBeLessThan(30.1);
  });
});
