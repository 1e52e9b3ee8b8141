import { screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { patientDetailFixture, sessionPageFixture, testUuid, trendMetricFixture, trendsFixture } from "@/testing/contract-fixtures";
import { mockApi } from "@/testing/mock-api";
import { createTestQueryClient, renderWithProviders } from "@/testing/render";
import { PatientTrendsPage, sharedDomain } from "../components/patient-trends-page";
import { metricDefinition } from "@pendula/ingest-server/contracts";

const PID = "5a0c7f0e-2b9d-4b59-9d7e-6a1f3c2b9e01";
const FRENKEL = "Frenkel-Toledo et al. 2005, J NeuroEng Rehabil 2:23, Table 2 (overground, comfortable speed)";
type Flag = "improved" | "worsened" | "within-error";
const sid = (i: number) => testUuid(i + 1, "5e550000");
const pts = (values: number[], flags: Record<number, Flag> = {}) =>
  values.map((v, i) => ({ sessionId: sid(i), recordedAt: new Date(Date.UTC(2026, 8, 1 + 7 * i)).toISOString(), value: v, n: null, walkingAid: null, ...(flags[i] ? { flag: flags[i] } : {}) }));

function server() {
  return mockApi({
    [`GET /api/patients/${PID}`]: { body: patientDetailFixture({ id: PID, displayName: "Odile Marchetti", condition: "parkinsons", enrolledOn: "2026-08-25" }) },
    [`GET /api/patients/${PID}/sessions`]: { body: sessionPageFixture([]) },
    [`GET /api/patients/${PID}/trends`]: {
      body: trendsFixture({
        patientId: PID,
        metrics: [
          { key: "cadenceStepsPerMin", unit: "steps/min", points: pts([98, 99, 97, 104, 106], { 3: "within-error", 4: "improved" }), bands: [] },
          {
            key: "phaseCoordinationIndexPct",
            unit: "%",
            points: pts([4, 5]),
            bands: [],
            bandNote: "No published band for this patient: the published cohorts for this measure differ in age or condition.",
            speedNote: "Read beside walking speed: PCI rises as walking speed falls: Gimmon et al. 2018, J Aging Phys Act 26:382.",
          },
          {
            key: "strideTimeCvPct",
            unit: "%",
            points: pts([2.1, 2.3, 2.2, 3.4], { 3: "worsened" }),
            // Band values as in Frenkel-Toledo 2005 Table 2: controls 1.94 ± 0.36 %, PD 2.24 ± 0.74 %.
            bands: [
              {
                low: 1.58,
                high: 2.3,
                label: "Control group, mean ± 1 SD (1.94 ± 0.36 %)",
                citation: FRENKEL,
                population: { description: "healthy older adults, the age-matched controls of a Parkinson's disease study (n = 30)" },
                walkingCondition: "overground, comfortable walking speed",
              },
              { low: 1.5, high: 2.98, label: "Parkinson's disease group, mean ± 1 SD (2.24 ± 0.74 %)", citation: FRENKEL },
            ],
            mdc: { value: 0.9, source: "patient-baseline", citation: "" },
          },
          { key: "stancePctLeft", unit: "%", points: pts([62, 63, 61]) },
          { key: "armLegLeftArmRightLegFrequencyRatio", unit: "1", points: pts([2, 2, 1, 1]) },
        ],
        events: [{ kind: "arm-leg-mode-change", sessionId: sid(2), recordedAt: pts([0, 0, 0])[2]!.recordedAt, metricKey: "armLegLeftArmRightLegFrequencyRatio", from: 2, to: 1, message: "Left arm–right leg locking changed from 2:1 to 1:1" }],
        cautions: ["A flag or event is a prompt to look at the recording and the patient, not a diagnosis."],
      }),
    },
  });
}

afterEach(() => vi.unstubAllGlobals());

describe("patient trend charts", () => {
  it("draws one chart per metric family with band sources and flag labels", async () => {
    server();
    renderWithProviders(<PatientTrendsPage patientId={PID} />, { queryClient: createTestQueryClient() });

    const cv = await screen.findByRole("region", { name: /Stride-time variability/ });
    // The chart draws once its container has been measured, which can come after the card itself.
    expect(await within(cv).findByRole("img", { name: "Stride-time variability over time" })).toBeTruthy();
    expect(within(cv).getAllByText(new RegExp(`Source: ${FRENKEL.replace(/[()]/g, "\\$&")}`))).toHaveLength(2);
    expect(within(cv).getByText("Worsened beyond MDC")).toBeTruthy();
    // A short caution beside the flags in the card, the server's full cautions once above the charts.
    expect(within(cv).getByText(/A flag is a prompt to look, not a diagnosis\. MDC95/)).toBeTruthy();
    expect(screen.getByText("A flag or event is a prompt to look at the recording and the patient, not a diagnosis.")).toBeTruthy();
    expect(within(cv).getByText(/from this patient's own first sessions/)).toBeTruthy();
    // The flagged point is drawn with the worsened shape (a downward triangle), not only a colour.
    expect(cv.querySelectorAll('[data-flag="worsened"]')).toHaveLength(1);

    const cad = screen.getByRole("region", { name: /Cadence/ });
    expect(within(cad).getByText("Improved beyond MDC")).toBeTruthy();
    expect(within(cad).getByText(/No published band fits this measure/)).toBeTruthy();
    // Who a band describes is shown with it; a patient outside every cohort reads why no band is drawn.
    expect(within(cv).getByText(/Who: healthy older adults, the age-matched controls/)).toBeTruthy();
    const pci = screen.getByRole("region", { name: /Phase Coordination Index/ });
    expect(within(pci).getByText(/No published band for this patient/)).toBeTruthy();
    expect(within(pci).getByText(/Read beside walking speed/)).toBeTruthy();

    expect(screen.getByRole("region", { name: /Stance and double support/ })).toBeTruthy();
    const ratio = screen.getByRole("region", { name: /Arm–leg frequency ratio/ });
    const eventItem = within(ratio).getAllByRole("listitem").find((li) => /locking changed from 2:1 to 1:1/.test(li.textContent ?? ""));
    expect(eventItem?.textContent).toMatch(/Coordination event/);

  });

  it("shows an empty state when nothing has been measured", async () => {
    mockApi({
      [`GET /api/patients/${PID}`]: { body: patientDetailFixture({ id: PID, displayName: "Wren Castellanos" }) },
      [`GET /api/patients/${PID}/sessions`]: { body: sessionPageFixture([]) },
      [`GET /api/patients/${PID}/trends`]: { body: trendsFixture({ patientId: PID, metrics: [] }) },
    });
    renderWithProviders(<PatientTrendsPage patientId={PID} />);
    expect(await screen.findByText("No measured sessions yet")).toBeTruthy();
  });
});

describe("metric families and the shared time axis", () => {
  it.each([
    ["cadenceStepsPerMin", "cadence"],
    ["strideTimeCvPct", "variability"],
    ["stancePctLeft", "phases"],
    ["doubleSupportPct", "phases"],
    ["phaseCoordinationIndexPct", "pci"],
    ["armLegLeftArmRightLegCouplingStrength", "armLegCoupling"],
    ["armLegRightArmLeftLegFrequencyRatio", "armLegRatio"],
    ["gaitAsymmetryPct", null],
  ])("%s → %s", (key, family) => expect(metricDefinition(key)?.chart).toBe(family));

  // Only the stored spelling is a metric: a dotted or unprefixed variant is drawn on no chart rather than guessed at.
  it.each(["leftArmRightLegCouplingStrength", "armLeg.rightArmLeftLeg.frequencyRatio", "stancePct.left"])("%s → no chart", (key) =>
    expect(metricDefinition(key)?.chart ?? null).toBeNull(),
  );

  it("spans every point and marker", () => {
    const d = sharedDomain([trendMetricFixture({ key: "k", unit: "", points: pts([1, 2]) })], [{ t: new Date(Date.UTC(2026, 9, 1)), glyph: "N", label: "n" }])!;
    expect(d[0].getTime()).toBeLessThan(Date.UTC(2026, 8, 1));
    expect(d[1].getTime()).toBeGreaterThan(Date.UTC(2026, 9, 1));
  });
});
