import { describe, expect, it } from "vitest";
import { annotateTrends } from "../annotate-trends";
import { MIN_STEPS_FOR_VARIABILITY, gateFewStrides, minimumCountFor } from "../few-strides";
import { weekly } from "./helpers";

const withN = (values: number[], ns: (number | null)[]) => weekly(values).map((p, i) => ({ ...p, n: ns[i] }));

describe("variability needs ≥ 30 continuous steps (Galna et al. 2013)", () => {
  it("asks 30 pooled strides for stride-time CV and 15 one-side strides for swing-time CV; nothing for other metrics", () => {
    expect(MIN_STEPS_FOR_VARIABILITY).toBe(30);
    expect(minimumCountFor("strideTimeCvPct")).toBe(30);
    expect(minimumCountFor("swingTimeCvPctLeft")).toBe(15);
    expect(minimumCountFor("cadenceStepsPerMin")).toBeNull();
  });

  it("marks points under the minimum, keeps points at it and points without a count", () => {
    const [m] = gateFewStrides([{ key: "strideTimeCvPct", points: withN([2, 2, 2, 2], [29, 30, null, 12]) }]);
    expect(m!.points.map((p) => p.excludedReason)).toEqual(["few-strides", undefined, undefined, "few-strides"]);
    const [side] = gateFewStrides([{ key: "swingTimeCvPctRight", points: withN([3, 3], [14, 15]) }]);
    expect(side!.points.map((p) => p.excludedReason)).toEqual(["few-strides", undefined]);
  });

  it("a short session neither joins the baseline nor gets a flag, however far it lies", () => {
    const r = annotateTrends({
      patient: { birthYear: 1950, condition: "parkinsons", enrolledOn: "2026-09-01" },
      metrics: [{ key: "strideTimeCvPct", unit: "%", points: withN([2.1, 9.0, 2.3, 2.2, 9.5, 3.4], [40, 10, 40, 40, 8, 40]) }],
    });
    const cv = r.metrics[0]!;
    expect(cv.baseline?.mean).toBeCloseTo(2.2, 12); // [2.1, 2.3, 2.2]
    expect(cv.points.map((p) => p.flag)).toEqual([undefined, undefined, undefined, undefined, undefined, "worsened"]);
    expect(cv.points[4]).toMatchObject({ excludedReason: "few-strides", n: 8 });
  });
});
