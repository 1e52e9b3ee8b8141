import type { Placement, QualityCode } from "@pendula/signal";
import { describe, expect, it } from "vitest";
import { placementWords } from "@/lib/placement-labels";
import { plainQuality } from "../plain-words";

// Typed as a Record over the analysis' codes, so a code added to the analysis fails the type check
// here until this list (and the wording) has it.
const EVERY_CODE: Record<QualityCode, true> = {
  gap: true,
  "invalid-span": true,
  saturation: true,
  "inverted-sensor": true,
  "rate-mismatch": true,
  "few-strides": true,
  "missing-placement": true,
  "no-walking": true,
  misalignment: true,
  "dfa-unavailable": true,
  "event-order": true,
  "strides-excluded": true,
  "clock-offset": true,
  "clock-unverified": true,
  "speed-unavailable": true,
  "arm-sign-unverified": true,
  "placement-swap": true,
  "no-arm-swing": true,
};
const codes = Object.keys(EVERY_CODE) as QualityCode[];

describe("plainQuality(item): the patient's words for each quality code", () => {
  it("gives every code words of its own, so two different notes never read the same", () => {
    const texts = codes.map((code) => plainQuality({ code }));
    expect(new Set(texts).size).toBe(codes.length);
  });

  it.each(codes)("%s: says which sensor when the note names one", (code) => {
    const placement: Placement = "left_wrist";
    const text = plainQuality({ code, placement });
    // Notes about the whole walk (e.g. how many steps) read the same for any sensor; the rest name it.
    const wholeWalk: QualityCode[] = ["few-strides", "dfa-unavailable", "event-order", "strides-excluded", "speed-unavailable"];
    if (wholeWalk.includes(code)) expect(text).toBe(plainQuality({ code }));
    else expect(text).toContain(`(${placementWords(placement)})`);
  });

  it("keeps analysis jargon out of what a patient reads", () => {
    for (const code of codes) expect(plainQuality({ code, placement: "right_wrist" })).not.toMatch(/sagittal|offset|Hilbert|phase|\d\s?ms\b|°/i);
  });
});
