import { describe, expect, it } from "vitest";
import { sessionSummaryFixture, testUuid } from "@/testing/contract-fixtures";
import { progressWords, speedInWords } from "../components/progress-words";

const walk = (i: number, walkingSpeedMPerS: number | null) =>
  sessionSummaryFixture({ id: testUuid(i + 1, "5e550000"), status: "done", recordedAt: new Date(Date.UTC(2026, 8, 1 + 7 * i)).toISOString(), walkingSpeedMPerS });

describe("walking speed in the patient's own words", () => {
  it("converts m/s to km/h by 3.6 (3600 s per hour / 1000 m per km)", () => {
    expect(speedInWords(1)).toBe("about 1.0 metres per second (about 3.6 km/h)");
    expect(speedInWords(0.8)).toBe("about 0.8 metres per second (about 2.9 km/h)");
  });

  it("says the latest speed and, after the first three walks, their mean", () => {
    // First three walks 0.5, 0.6, 0.7 m/s → mean 0.6; latest 0.9.
    const words = progressWords([walk(0, 0.5), walk(1, 0.6), walk(2, 0.7), walk(3, null), walk(4, 0.9)]);
    expect(words.speed).toBe(
      "In your latest walk your walking speed was about 0.9 metres per second (about 3.2 km/h). In your first walks it was about 0.6 metres per second (about 2.2 km/h).",
    );
  });

  it("says nothing about speed when no walk has one", () => {
    expect(progressWords([walk(0, null)]).speed).toBeNull();
    expect(progressWords([walk(0, 0.7)]).speed).toBe("In your latest walk your walking speed was about 0.7 metres per second (about 2.5 km/h).");
  });
});
