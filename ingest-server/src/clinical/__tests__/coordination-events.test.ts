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
