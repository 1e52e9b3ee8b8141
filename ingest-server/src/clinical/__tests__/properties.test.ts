import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { flagMetricChanges } from "../change-flags";
import { detectModeChanges } from "../coordination-events";
import { MDC95_FACTOR } from "../reliability";
import { weekly } from "./helpers";

const value = fc.double({ min: 0.5, max: 10, noNaN: true });

describe("change-flag invariants (fast-check)", () => {
  it("baseline sessions are never flagged; later flags follow |value − mean| vs 2.7719·SD and the metric direction", () => {
    fc.assert(
      fc.property(fc.array(value, { minLength: 3, maxLength: 15 }), (values) => {
        const r = flagMetricChanges("phaseCoordinationIndexPct", weekly(values), "stroke");
        const b = r.baseline!;
        for (const [i, p] of r.points.entries()) {
          if (i < 3) {
            expect(p.flag).toBeUndefined();
            continue;
          }
          if (!r.mdc) {
            expect(p.flag).toBeUndefined();
            continue;
          }
          expect(r.mdc.value).toBeCloseTo(MDC95_FACTOR * b.sd, 10);
          const d = p.value - b.mean;
          const expected = Math.abs(d) <= r.mdc.value ? "within-error" : d > 0 ? "worsened" : "improved";
          expect(p.flag).toBe(expected);
        }
      }),
    );
  });

  it("mirroring the series around its baseline mean swaps improved and worsened", () => {
    fc.assert(
      fc.property(fc.array(value, { minLength: 4, maxLength: 12 }), (values) => {
        const a = flagMetricChanges("cadenceStepsPerMin", weekly(values), "stroke");
        if (!a.baseline) return;
        const mirrored = values.map((v) => 2 * a.baseline!.mean - v);
        const b = flagMetricChanges("cadenceStepsPerMin", weekly(mirrored), "stroke");
        const swap = { improved: "worsened", worsened: "improved", "within-error": "within-error", changed: "changed" } as const;
        a.points.forEach((p, i) => {
          const other = b.points[i]!.flag;
          // Values on the MDC edge can round either way after mirroring; skip those.
          if (Math.abs(Math.abs(p.value - a.baseline!.mean) - (a.mdc?.value ?? 0)) < 1e-9) return;
          expect(other).toBe(p.flag ? swap[p.flag] : undefined);
        });
      }),
    );
  });
});

describe("mode-change invariants (fast-check)", () => {
  it("events alternate, and each new mode was held for the confirming sessions", () => {
    fc.assert(
      fc.property(fc.array(fc.constantFrom(1, 2, 1.5), { maxLength: 30 }), fc.integer({ min: 1, max: 3 }), (ratios, confirm) => {
        const pts = weekly(ratios);
        const events = detectModeChanges("armLegLeftArmRightLegFrequencyRatio", pts, confirm);
        for (let i = 1; i < events.length; i++) expect(events[i]!.from).toBe(events[i - 1]!.to);
        for (const e of events) {
          expect(e.from).not.toBe(e.to);
          // The last `confirm` decided sessions up to the event all show the new mode.
          const upTo = pts.slice(0, pts.findIndex((p) => p.sessionId === e.sessionId) + 1).filter((p) => p.value !== 1.5);
          expect(upTo.slice(-confirm).every((p) => p.value === e.to)).toBe(true);
        }
      }),
    );
  });
});
