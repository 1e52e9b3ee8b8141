import { describe, expect, it } from "vitest";
import { detectCoordinationEvents, detectModeChanges, lockingMode } from "../coordination-events";
import { MDC95_FACTOR } from "../reliability";
import { weekly } from "./helpers";

const RATIO = "armLegLeftArmRightLegFrequencyRatio";

describe("arm–leg mode changes (2:1 at slow speeds, 1:1 faster: Wagenaar & van Emmerik 2000)", () => {
  it("reads ratios with a dead zone between 1.3 and 1.7", () => {
    expect(lockingMode(2)).toBe(2);
    expect(lockingMode(1.7)).toBe(2);
    expect(lockingMode(1.5)).toBeNull();
    expect(lockingMode(1.3)).toBe(1);
    expect(lockingMode(1)).toBe(1);
  });

  it("detects 2:1 → 1:1 once, on the session that confirms it", () => {
    const events = detectModeChanges(RATIO, weekly([2, 2, 2, 1, 1, 1, 1]));
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({ kind: "arm-leg-mode-change", sessionId: "s5", from: 2, to: 1, metricKey: RATIO });
    expect(events[0]!.message).toMatch(/2:1 to 1:1 \(left arm – right leg\)/);
    // Without cadence or speed series the pace cannot be checked, and the text says so.
    expect(events[0]!.message).toMatch(/could not be checked/);
  });

  it("does not flap when sessions alternate 2, 1, 2, 1", () => {
    expect(detectModeChanges(RATIO, weekly([2, 2, 1, 2, 1, 2, 1, 2]))).toEqual([]);
  });

  it("with confirmSessions 1, still ignores the undecided zone (1.5 neither switches nor resets)", () => {
    expect(detectModeChanges(RATIO, weekly([2, 1.5, 1.45, 2]), 1)).toEqual([]);
    const ev = detectModeChanges(RATIO, weekly([2, 1.5, 1, 1]), 1);
    expect(ev.map((e) => [e.sessionId, e.from, e.to])).toEqual([["s3", 2, 1]]);
  });

  it("reports the return 1:1 → 2:1 as a second event", () => {
    const ev = detectModeChanges(RATIO, weekly([2, 2, 1, 1, 2, 2]));
    expect(ev.map((e) => [e.sessionId, e.from, e.to])).toEqual([
      ["s4", 2, 1],
      ["s6", 1, 2],
    ]);
  });
});

describe("speed-aware mode changes (Wagenaar & van Emmerik 2000: the arm–leg mode follows walking speed)", () => {
  const ratio = weekly([2, 2, 2, 1, 1]);

  it("raises a 2:1 → 1:1 change when cadence and speed stay within their MDC95, and says at what pace", () => {
    // Stroke, baseline speed 0.74–0.76 m/s → Hosoi 2023 moderate group MDC 0.11 m/s; cadence baseline SD 1 → MDC 2.77.
    const ev = detectCoordinationEvents(
      [
        { key: RATIO, points: ratio },
        { key: "cadenceStepsPerMin", points: weekly([100, 101, 99, 100, 100]) },
        { key: "walkingSpeedMPerS", points: weekly([0.75, 0.74, 0.76, 0.76, 0.76]) },
      ],
      { condition: "stroke" },
    );
    expect(ev).toHaveLength(1);
    expect(ev[0]!.message).toMatch(/at 0\.76 m\/s and 100 steps\/min \(before: 0\.75 m\/s, 100 steps\/min\)/);
    expect(ev[0]!.message).toMatch(/does not explain it/);
    expect(ev[0]!.pace?.walkingSpeedMPerS).toMatchObject({ beyondMdc: false, mdc: 0.11 });
    expect(ev[0]!.pace?.cadenceStepsPerMin.beyondMdc).toBe(false);
  });

  it("raises nothing when walking speed rose beyond its MDC95 (0.51 → 0.90 m/s, MDC 0.11 m/s)", () => {
    const ev = detectCoordinationEvents(
      [
        { key: RATIO, points: ratio },
        { key: "cadenceStepsPerMin", points: weekly([90, 91, 89, 90, 91]) },
        { key: "walkingSpeedMPerS", points: weekly([0.5, 0.52, 0.5, 0.9, 0.9]) },
      ],
      { condition: "stroke" },
    );
    expect(ev).toEqual([]);
  });

  it("raises nothing when cadence alone rose beyond its MDC95 (no speed series)", () => {
    // iSCI cadence: Nair 2012 MDC% 21 % of the baseline mean 80 = 16.8 steps/min; 80 → 100 exceeds it.
    const ev = detectCoordinationEvents(
      [
        { key: RATIO, points: ratio },
        { key: "cadenceStepsPerMin", points: weekly([79, 80, 81, 100, 100]) },
      ],
      { condition: "incomplete_sci" },
    );
    expect(ev).toEqual([]);
    // The same switch with cadence steady is raised, and names cadence only.
    const steady = detectCoordinationEvents(
      [
        { key: RATIO, points: ratio },
        { key: "cadenceStepsPerMin", points: weekly([79, 80, 81, 82, 82]) },
      ],
      { condition: "incomplete_sci" },
    );
    expect(steady).toHaveLength(1);
    expect(steady[0]!.message).toMatch(/at 82 steps\/min \(before: 81 steps\/min\)\. Cadence changed less than its MDC95/);
  });

  it("compares the confirming sessions with the sessions held in the old mode just before, not the whole baseline", () => {
    // Speed drifts up slowly in 2:1 (0.50 → 0.78), then 1:1 at 0.80: only +0.03 against the last 2:1 sessions.
    const ev = detectCoordinationEvents(
      [
        { key: RATIO, points: weekly([2, 2, 2, 2, 2, 2, 1, 1]) },
        { key: "cadenceStepsPerMin", points: weekly([90, 91, 89, 90, 90, 90, 90, 90]) },
        { key: "walkingSpeedMPerS", points: weekly([0.5, 0.52, 0.5, 0.6, 0.7, 0.78, 0.8, 0.8]) },
      ],
      { condition: "stroke" },
    );
    expect(ev.map((e) => e.sessionId)).toEqual(["s8"]);
    expect(ev[0]!.pace?.walkingSpeedMPerS?.before).toBeCloseTo(0.74, 12);
  });

  it("keeps tracking the mode through a suppressed switch: the later return is judged on its own pace", () => {
    const ev = detectCoordinationEvents(
      [
        { key: RATIO, points: weekly([2, 2, 2, 1, 1, 2, 2]) },
        { key: "cadenceStepsPerMin", points: weekly([90, 91, 89, 110, 110, 110, 110]) },
      ],
      { condition: "other" },
    );
    // 2:1 → 1:1 explained by +20 steps/min; 1:1 → 2:1 at the same cadence is not.
    expect(ev.map((e) => [e.sessionId, e.from, e.to])).toEqual([["s7", 1, 2]]);
  });
});

describe("coupling strength below its baseline band; PCI beyond MDC", () => {
  // Baseline R [0.80, 0.84, 0.82]: mean 0.82, SD 0.02 → MDC95 0.05544, lower edge 0.76456.
  const mdcR = 0.02 * MDC95_FACTOR;

  it("emits one coupling-drop when R leaves the band and re-arms only after recovery above mean − MDC/2", () => {
    const key = "armLegRightArmLeftLegCouplingStrength";
    const values = [0.8, 0.84, 0.82, 0.82 - mdcR - 0.001, 0.7, 0.77, 0.6, 0.81, 0.5];
    const ev = detectCoordinationEvents([{ key, points: weekly(values) }]);
    expect(ev.map((e) => e.sessionId)).toEqual(["s4", "s9"]);
    expect(ev[0]!.kind).toBe("coupling-drop");
    expect(ev[0]!.from).toBeCloseTo(0.82, 12);
  });

  it("emits pci-rise when PCI exceeds baseline + MDC, not for a fall", () => {
    const key = "phaseCoordinationIndexPct";
    // Baseline [4, 5, 6]: mean 5, SD 1 → MDC95 2.7719.
    const ev = detectCoordinationEvents([{ key, points: weekly([4, 5, 6, 7.7, 8, 1]) }], { condition: "parkinsons" });
    expect(ev.map((e) => [e.kind, e.sessionId])).toEqual([["pci-rise", "s5"]]);
  });

  it("merges events of all metrics in time order", () => {
    const ev = detectCoordinationEvents([
      { key: "phaseCoordinationIndexPct", points: weekly([4, 5, 6, 5, 5, 5, 9]) },
      { key: RATIO, points: weekly([2, 2, 1, 1, 1, 1, 1]) },
    ]);
    expect(ev.map((e) => e.kind)).toEqual(["arm-leg-mode-change", "pci-rise"]);
  });
});
