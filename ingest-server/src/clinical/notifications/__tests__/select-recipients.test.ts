import { describe, expect, it } from "vitest";
import { annotateTrends } from "../../annotate-trends";
import { weekly } from "../../__tests__/helpers";
import { alertReasons, digestCounts, selectChangeAlerts, selectDigest, selectReminders } from "../select-recipients";
import { patientPageUrl } from "../messages";

// Invented people and clinic; example.test addresses never resolve.
const URL = "https://pendula.example.test";

describe("selectReminders", () => {
  const base = { userStatus: "active", expectedPerWeek: 1, sessionsThisWeek: 0 };
  it("reminds active patients below their weekly expectation, keyed by user and ISO week", () => {
    const planned = selectReminders(
      [
        { ...base, userId: "u1", email: "ada.q@example.test" },
        { ...base, userId: "u2", email: "bo.k@example.test", sessionsThisWeek: 1 },
        { ...base, userId: "u3", email: "cy.m@example.test", expectedPerWeek: 2, sessionsThisWeek: 1 },
        { ...base, userId: "u4", email: "di.w@example.test", userStatus: "invited" },
        { ...base, userId: "u5", email: "ed.r@example.test", expectedPerWeek: 0 },
      ],
      "2026-W41",
      URL,
    );
    expect(planned.map((p) => [p.to, p.idempotencyKey])).toEqual([
      ["ada.q@example.test", "reminder:u1:2026-W41"],
      ["cy.m@example.test", "reminder:u3:2026-W41"],
    ]);
    expect(planned[0]!.kind).toBe("clinical_reminder");
  });
});

describe("alerts", () => {
  const patient = { birthYear: 1961, condition: "stroke", enrolledOn: "2026-09-01" };
  const trends = annotateTrends({
    patient,
    metrics: [
      // Baseline [2.1, 2.3, 2.2] → MDC 0.277; s4 is worsened, s5 within error.
      { key: "strideTimeCvPct", unit: "%", points: weekly([2.1, 2.3, 2.2, 3.0, 2.3, 2.2]) },
      // Cadence steady through the 2:1 → 1:1 switch, so the pace does not explain it and it is an event.
      { key: "cadenceStepsPerMin", unit: "/min", points: weekly([90, 92, 91, 91, 91, 91]) },
      { key: "armLegRightArmLeftLegFrequencyRatio", unit: "1", points: weekly([2, 2, 2, 2, 1, 1]) },
    ],
  });
  const clinicians = [
    { userId: "c1", email: "r.okafor@example.test", userStatus: "active" },
    { userId: "c2", email: "l.varga@example.test", userStatus: "disabled" },
    { userId: "c3", email: "m.ito@example.test", userStatus: "active" },
  ];

  it("finds worsened metrics and events of exactly this session", () => {
    expect(alertReasons(trends, "s4")).toEqual({ worsenedMetrics: ["strideTimeCvPct"], eventKinds: [] });
    expect(alertReasons(trends, "s5")).toEqual({ worsenedMetrics: [], eventKinds: [] });
    expect(alertReasons(trends, "s6")).toEqual({ worsenedMetrics: [], eventKinds: ["arm-leg-mode-change"] });
  });

  it("does not alert for an improvement alone", () => {
    // s6 cadence 120 is far above baseline (improved) — only the mode change makes s6 alert-worthy.
    const cadenceOnly = annotateTrends({
      patient,
      metrics: [{ key: "cadenceStepsPerMin", unit: "/min", points: weekly([90, 92, 91, 91, 91, 120]) }],
    });
    expect(cadenceOnly.metrics[0]!.points[5]!.flag).toBe("improved");
    expect(alertReasons(cadenceOnly, "s6")).toEqual({ worsenedMetrics: [], eventKinds: [] });
    expect(selectChangeAlerts(alertReasons(cadenceOnly, "s6"), clinicians, { sessionId: "s6", patientId: "p1" }, URL)).toEqual([]);
  });

  it("mails every active clinician of the patient once per session, with only a link in the body", () => {
    const planned = selectChangeAlerts(alertReasons(trends, "s4"), clinicians, { sessionId: "s4", patientId: "p-77" }, URL);
    expect(planned.map((p) => p.idempotencyKey)).toEqual(["alert:s4:c1", "alert:s4:c3"]);
    const body = planned[0]!.text + planned[0]!.subject;
    expect(body).toContain(`${URL}/clinician/patients/p-77`);
    expect(body).not.toMatch(/\d+\.\d|%|stride|cadence|PCI|ratio|2:1|1:1/i);
  });

  it("builds the patient link without a double slash", () => {
    expect(patientPageUrl(`${URL}/`, "abc")).toBe(`${URL}/clinician/patients/abc`);
  });
});

describe("digest", () => {
  const clinician = { userId: "c1", email: "r.okafor@example.test", userStatus: "active" };
  it("counts patients, sessions, sessions to review and patients behind", () => {
    const counts = digestCounts("2026-W40", [
      { expectedPerWeek: 1, sessionIds: ["a"], sessionIdsToReview: ["a"] },
      { expectedPerWeek: 2, sessionIds: ["b"], sessionIdsToReview: [] },
      { expectedPerWeek: 1, sessionIds: [], sessionIdsToReview: [] },
    ]);
    expect(counts).toEqual({ isoWeek: "2026-W40", patients: 3, sessions: 2, sessionsToReview: 1, patientsBehind: 2 });
    const mail = selectDigest(clinician, counts, URL)!;
    expect(mail.idempotencyKey).toBe("digest:c1:2026-W40");
    expect(mail.text).toContain("sessions suggested for review: 1");
  });

  it("sends nothing to a clinician without a caseload or without an active account", () => {
    expect(selectDigest(clinician, digestCounts("2026-W40", []), URL)).toBeNull();
    const one = digestCounts("2026-W40", [{ expectedPerWeek: 1, sessionIds: [], sessionIdsToReview: [] }]);
    expect(selectDigest({ ...clinician, userStatus: "disabled" }, one, URL)).toBeNull();
  });
});
