import { describe, expect, it } from "vitest";
import { annotateTrends } from "../annotate-trends";
import { CAUTION_LOCAL_PROTOCOL, CAUTION_MDC, CAUTION_PROMPT_NOT_DIAGNOSIS } from "../cautions";
import { weekly } from "./helpers";

// Invented scenario: a patient of the (fictional) Larchfield outpatient clinic, PD, born 1956.
const patient = { birthYear: 1956, condition: "parkinsons", enrolledOn: "2026-09-01" };

describe("annotateTrends", () => {
  const result = annotateTrends({
    patient,
    metrics: [
      { key: "strideTimeCvPct", unit: "%", points: weekly([2.1, 2.3, 2.2, 2.25, 3.5]) },
      { key: "armLegLeftArmRightLegFrequencyRatio", unit: "1", points: weekly([2, 2, 2, 1, 1]) },
      { key: "gaitAsymmetryPct", unit: "%", points: weekly([5, 6]) },
    ],
  });

  it("flags the new sessions and keeps the input points", () => {
    const cv = result.metrics[0]!;
    expect(cv.points.map((p) => p.flag)).toEqual([undefined, undefined, undefined, "within-error", "worsened"]);
    expect(cv.points[4]).toMatchObject({ sessionId: "s5", value: 3.5 });
    expect(cv.mdc?.source).toBe("patient-baseline");
    expect(cv.baseline?.n).toBe(3);
  });

  it("attaches the older-controls and PD stride-CV bands with citation and table (Frenkel-Toledo 2005, Table 2); none for asymmetry in PD", () => {
    const bands = result.metrics[0]!.bands;
    expect(bands.map((b) => b.citation)).toEqual([
      "Frenkel-Toledo et al. 2005, J NeuroEng Rehabil 2:23, Table 2",
      "Frenkel-Toledo et al. 2005, J NeuroEng Rehabil 2:23, Table 2",
    ]);
    expect(bands[1]!.population.conditions).toEqual(["parkinsons"]);
    expect(result.metrics[0]!.bandNote).toBeNull();
    expect(result.metrics[2]!.bands).toEqual([]);
    expect(result.metrics[2]!.bandNote).toMatch(/No published band for this patient/);
    expect(result.metrics[2]!.baseline).toBeNull();
  });

  it("reports the 2:1 → 1:1 change as an event", () => {
    expect(result.events).toHaveLength(1);
    expect(result.events[0]).toMatchObject({ kind: "arm-leg-mode-change", sessionId: "s5", from: 2, to: 1 });
  });

  it("returns the cautions: MDC meaning, prompt not diagnosis, local protocols", () => {
    expect(result.cautions).toEqual(expect.arrayContaining([CAUTION_MDC, CAUTION_PROMPT_NOT_DIAGNOSIS, CAUTION_LOCAL_PROTOCOL]));
  });

  it("passes options through: a 4-session baseline leaves only one flagged session", () => {
    const r = annotateTrends({
      patient,
      metrics: [{ key: "strideTimeCvPct", unit: "%", points: weekly([2.1, 2.3, 2.2, 2.25, 3.5]) }],
      options: { baselineSessions: 4 },
    });
    expect(r.metrics[0]!.points.filter((p) => p.flag)).toHaveLength(1);
  });

  it("picks age-limited bands from the age at the latest session (born 1956, 2026 → 70: older-adult stride-CV band; born 1990 → none)", () => {
    const cv = [{ key: "strideTimeCvPct", unit: "%", points: weekly([2.0]) }];
    const r = annotateTrends({ patient: { ...patient, condition: "stroke" }, metrics: cv });
    expect(r.metrics[0]!.bands.map((b) => b.id)).toEqual(["stride-cv-older-controls-frenkel-toledo-2005"]);
    const younger = annotateTrends({ patient: { ...patient, condition: "stroke", birthYear: 1990 }, metrics: cv });
    expect(younger.metrics[0]!.bands).toEqual([]);
    expect(younger.metrics[0]!.bandNote).toMatch(/No published band for this patient/);
  });

  it("puts the session's walking speed beside PCI and stride-time CV (speed-dependent: Gimmon 2018; Frenkel-Toledo 2005), not beside cadence", () => {
    const r = annotateTrends({
      patient,
      metrics: [
        { key: "phaseCoordinationIndexPct", unit: "%", points: weekly([4, 5]) },
        { key: "cadenceStepsPerMin", unit: "/min", points: weekly([100, 101]) },
        { key: "walkingSpeedMPerS", unit: "m/s", points: weekly([0.9, 1.1]) },
      ],
    });
    expect(r.metrics[0]!.points.map((p) => p.walkingSpeedMPerS)).toEqual([0.9, 1.1]);
    expect(r.metrics[0]!.speedNote).toMatch(/Gimmon et al\. 2018/);
    expect(r.metrics[1]!.points.map((p) => p.walkingSpeedMPerS)).toEqual([undefined, undefined]);
    expect(r.metrics[1]!.speedNote).toBeUndefined();
  });

  it("filters the visible range without moving the baseline", () => {
    const points = weekly([2.1, 2.3, 2.2, 2.25, 3.5]);
    const r = annotateTrends({
      patient,
      metrics: [
        { key: "strideTimeCvPct", unit: "%", points },
        { key: "armLegLeftArmRightLegFrequencyRatio", unit: "1", points: weekly([2, 2, 2, 1, 1]) },
      ],
      options: { visibleFrom: points[3]!.recordedAt },
    });
    const cv = r.metrics[0]!;
    expect(cv.points.map((p) => p.sessionId)).toEqual(["s4", "s5"]);
    expect(cv.baseline?.mean).toBeCloseTo(2.2, 12); // still the first three sessions
    expect(cv.points.map((p) => p.flag)).toEqual(["within-error", "worsened"]);
    expect(r.events.map((e) => e.sessionId)).toEqual(["s5"]);
    const none = annotateTrends({ patient, metrics: [{ key: "strideTimeCvPct", unit: "%", points }], options: { visibleTo: points[0]!.recordedAt } });
    expect(none.metrics[0]!.points).toHaveLength(1);
    expect(() => annotateTrends({ patient, metrics: [], options: { visibleFrom: "soon" } })).toThrow(RangeError);
  });
});
