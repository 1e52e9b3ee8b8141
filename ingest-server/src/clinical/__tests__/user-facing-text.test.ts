import { describe, expect, it } from "vitest";
import { BASE_METRIC_INFO, METRICS } from "../../contracts/metric-catalog";
import { annotateTrends } from "../annotate-trends";
import { CLINICAL_CAUTIONS } from "../cautions";
import { changeAlertMail, digestMail, reminderMail } from "../notifications/messages";
import { REFERENCE_BANDS } from "../reference-bands";
import { PUBLISHED_IMPORTANT_CHANGE, PUBLISHED_MDC } from "../reliability";
import { weekly } from "./helpers";

// Text that would tell a clinician a value is unsourced must never reach them.
const FORBIDDEN = /from memory|unconfirmed|not confirmed|verify against/i;

const NEW_KEYS = [
  "walkingSpeedMPerS",
  "strideLengthM",
  "swingTimeCvPctLeft",
  "swingTimeCvPctRight",
  "stepTimeAsymmetryPct",
  "armSwingAmplitudeDegLeft",
  "armSwingAmplitudeDegRight",
  "armSwingAsymmetryPct",
];

describe("no user-facing text says a value is unconfirmed", () => {
  const keys = [...new Set([...METRICS.map((m) => m.key), ...NEW_KEYS])];
  // Series that give baselines, flags, slopes and a mode change, for every condition and a spread of ages.
  const series = (key: string) =>
    key.endsWith("FrequencyRatio") ? weekly([2, 2, 2, 1, 1, 1, 1, 1]) : weekly([1, 1.1, 0.9, 1.5, 2, 2.5, 3, 3.5]);

  it.each(["stroke", "incomplete_sci", "parkinsons", "other"])("trend API answer for %s at ages 25–85", (condition) => {
    for (const birthYear of [2001, 1976, 1956, 1946, 1941]) {
      const answer = annotateTrends({
        patient: { birthYear, condition, enrolledOn: "2026-09-01" },
        metrics: keys.map((key) => ({ key, unit: "1", points: series(key) })),
      });
      const text = JSON.stringify(answer);
      expect(text).not.toMatch(FORBIDDEN);
      // The check has something to look at: bands, MDCs and events are present in the answer.
      expect(answer.metrics.some((m) => m.bands.length > 0)).toBe(true);
      expect(answer.metrics.some((m) => m.mdc !== null)).toBe(true);
    }
  });

  it("the catalogue, the cautions and the e-mails", () => {
    const texts = [
      JSON.stringify(REFERENCE_BANDS),
      JSON.stringify(PUBLISHED_MDC),
      JSON.stringify(PUBLISHED_IMPORTANT_CHANGE),
      JSON.stringify(BASE_METRIC_INFO),
      ...CLINICAL_CAUTIONS,
      ...Object.values(reminderMail("https://pendula.example")),
      ...Object.values(changeAlertMail("https://pendula.example", "00000000-0000-4000-8000-000000000001")),
      ...Object.values(digestMail("https://pendula.example", { isoWeek: "2026-W40", patients: 3, sessions: 4, sessionsToReview: 1, patientsBehind: 0 })),
    ];
    for (const t of texts) expect(t).not.toMatch(FORBIDDEN);
  });

  it("the check itself catches the phrase", () => {
    expect(JSON.stringify({ label: "about 2–3 % (from memory)" })).toMatch(FORBIDDEN);
  });
});
