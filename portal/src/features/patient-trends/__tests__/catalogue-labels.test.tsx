import { screen } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { METRIC_CHARTS, METRICS } from "@pendula/ingest-server/contracts";
import { patientDetailFixture, sessionPageFixture, testUuid, trendsFixture } from "@/testing/contract-fixtures";
import { mockApi } from "@/testing/mock-api";
import { createTestQueryClient, renderWithProviders } from "@/testing/render";
import { PatientTrendsPage } from "../components/patient-trends-page";

// An invented patient with four invented weekly walks, carrying every metric of the catalogue.
const PID = "5b7c1e93-2a4d-4f60-9e18-c3d2a6b0f475";
const at = (i: number) => new Date(Date.UTC(2026, 9, 6 + 7 * i, 9)).toISOString();
const points = [1, 1.1, 0.9, 1.2].map((value, i) => ({ sessionId: testUuid(i + 1, "5e550000"), recordedAt: at(i), value, ...(i < 3 ? { baseline: true } : {}) }));

function server() {
  return mockApi({
    [`GET /api/patients/${PID}`]: { body: patientDetailFixture({ id: PID, displayName: "Tamsin Okonkwo-Lind", condition: "incomplete_sci" }) },
    [`GET /api/patients/${PID}/sessions`]: { body: sessionPageFixture([]) },
    [`GET /api/patients/${PID}/trends`]: {
      body: trendsFixture({
        patientId: PID,
        // A label the screen must not use: names come from the catalogue, whatever the answer carries.
        metrics: METRICS.map((m) => ({ key: m.key, unit: m.unit, label: `answer label ${m.key}`, countNoun: m.countNoun, points, bands: [] })),
        events: [],
        cautions: ["A flag or event is a prompt to look at the recording and the patient, not a diagnosis."],
      }),
    },
  });
}

afterEach(() => vi.unstubAllGlobals());

describe("every metric is named by the one catalogue on the trends page", () => {
  it("summary rows and chart legends show each drawn metric's catalogue label, and nothing else names a metric", async () => {
    server();
    renderWithProviders(<PatientTrendsPage patientId={PID} />, { queryClient: createTestQueryClient() });
    const table = await screen.findByRole("table", { name: /Latest value of each measure/ });

    const drawn = METRICS.filter((m) => m.chart !== null);
    // The mean relative phase has no chart, but is listed under its pair's coupling strength R.
    const listed = METRICS.filter((m) => m.chart !== null || m.base === "meanRelativePhaseDeg");
    expect(drawn.length).toBeGreaterThanOrEqual(15);

    // Plain selectors: role queries over a dozen charts are slow in jsdom.
    const rowLabels = [...table.querySelectorAll("tbody a")].map((a) => a.textContent);
    expect(rowLabels.sort()).toEqual(listed.map((m) => m.label).sort());

    for (const chart of METRIC_CHARTS) {
      const card = document.getElementById(`trend-card-${chart.id}`);
      expect(card?.querySelector("h3")?.textContent, chart.id).toMatch(new RegExp(`^${chart.title}`));
      const legend = [...card!.querySelectorAll('ul[aria-label="Series"] > li')].map((li) => li.textContent);
      expect(legend, chart.id).toEqual(drawn.filter((m) => m.chart === chart.id).map((m) => m.label));
    }
    expect(document.body.textContent).not.toMatch(/answer label/);
  }, 30_000);
});
