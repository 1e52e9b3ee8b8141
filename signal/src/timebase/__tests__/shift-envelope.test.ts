import { describe, expect, it } from "vitest";
import { shiftImpactEnvelope } from "../shift-envelope";

describe("shiftImpactEnvelope", () => {
  const rateHz = 100;
  const m = 400;
  const envelope = new Float32Array(m);
  envelope[100] = 4; // one strike at 1.00 s
  envelope[300] = 2; // another at 3.00 s
  const valid = new Uint8Array(m).fill(1);
  valid[50] = 0;

  it("moves the signal later by a sub-bin shift, splitting a peak between its two neighbours", () => {
    const out = shiftImpactEnvelope({ envelope, valid, rateHz, factor: 2 }, () => 0.025);
    expect(out.envelope[102]).toBeCloseTo(2, 6);
    expect(out.envelope[103]).toBeCloseTo(2, 6);
    expect(out.envelope[100]).toBe(0);
    // A bin that would read the invalid bin 50 (or the start of the data) is invalid.
    expect(out.valid[52]).toBe(0);
    expect(out.valid[53]).toBe(0);
    expect(out.valid[1]).toBe(0);
    expect(out.valid[60]).toBe(1);
  });

  it("follows a shift that changes along the session (drift)", () => {
    const out = shiftImpactEnvelope({ envelope, valid, rateHz, factor: 2 }, (t) => (t < 2 ? -0.05 : 0.1));
    expect(out.envelope[95]).toBeCloseTo(4, 6);
    expect(out.envelope[310]).toBeCloseTo(2, 6);
  });
});
