import { describe, expect, it } from "vitest";
import type { Side, Stride } from "../../types";
import { sessionPci } from "../session-pci";

// Worked example of docs/methods.md#worked-examples (Plotnik, Giladi & Hausdorff 2007 formula,
// computed with NumPy): reference ICs tL, other leg's ICs tS → PCI 15.3286 % over 4 phases.
const tL = [0, 1.1, 2.2, 3.3, 4.4];
const tS = [0.6, 1.65, 2.8, 3.8];

function strides(side: Side, ics: readonly number[]): Stride[] {
  return ics.slice(0, -1).map((icS, i) => ({
    side,
    icS,
    nextIcS: ics[i + 1]!,
    fcS: null,
    strideTimeS: ics[i + 1]! - icS,
    stanceTimeS: null,
    swingTimeS: null,
    stancePct: null,
    swingPct: null,
    doubleSupportPct: null,
    steady: true,
  }));
}

describe("sessionPci(swingTimeMeanS, steadyStrides, initialContactsS)", () => {
  const steady = [...strides("left", tL), ...strides("right", tS)];

  it("takes the leg with the longer mean swing time as reference (Plotnik 2007): left → 15.3286 % over 4 phases", () => {
    const r = sessionPci({ left: 0.45, right: 0.4 }, steady, { left: tL, right: tS });
    expect(r.referenceSide).toBe("left");
    expect(r.phaseCount).toBe(4);
    expect(Math.abs(r.pciPct! - 15.3286)).toBeLessThan(1e-4);
  });

  it("switches reference when the right swing is longer, and gives the left leg a tie", () => {
    const right = sessionPci({ left: 0.4, right: 0.45 }, steady, { left: tL, right: tS });
    expect(right.referenceSide).toBe("right");
    // Right strides [0.6, 1.65), [1.65, 2.8), [2.8, 3.8) each hold one left IC: three phases.
    expect(right.phaseCount).toBe(3);
    expect(right.pciPct).not.toBeCloseTo(15.3286, 2);
    expect(sessionPci({ left: 0.4, right: 0.4 }, steady, { left: tL, right: tS }).referenceSide).toBe("left");
  });

  it("is null without both legs' swing times or contacts", () => {
    expect(sessionPci({ left: null, right: 0.4 }, steady, { left: tL, right: tS })).toEqual({ pciPct: null, phaseCount: 0, referenceSide: null });
    expect(sessionPci({ left: 0.45, right: 0.4 }, steady, { left: tL, right: null }).pciPct).toBeNull();
  });
});
