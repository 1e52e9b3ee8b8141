import type { Analysis } from "@pendula/signal";
import { workedExampleMetrics } from "@pendula/signal/fixtures/worked-example-walk";

/**
 * The stored analysis of the worked-example walk (100 s at 100 Hz, four sensors; its measures and
 * where they come from: signal/fixtures/worked-example-walk.ts) without events or strides, which
 * the session summary does not read; `over` replaces top-level parts (quality items, say). A new
 * object on every call, so a test may change its own copy.
 */
export function storedAnalysis(over: Partial<Analysis> = {}): Analysis {
  return {
    session: { startUtc: "2026-10-06T09:00:00.000Z", durationS: 100, sampleRateHz: 100, placements: ["left_shank", "right_shank", "left_wrist", "right_wrist"] },
    events: { left: { initialContacts: [], finalContacts: [] }, right: { initialContacts: [], finalContacts: [] } },
    strides: [],
    bouts: [],
    turns: [],
    invalidSpans: [],
    metrics: workedExampleMetrics(),
    quality: [],
    algorithm: { version: "1.1.0" },
    ...over,
  };
}
