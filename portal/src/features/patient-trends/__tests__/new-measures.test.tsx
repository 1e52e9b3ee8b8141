import { screen, waitFor, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import type { WalkingAid } from "@pendula/ingest-server/contracts";
import { patientDetailFixture, sessionPageFixture, testUuid, trendsFixture } from "@/testing/contract-fixtures";
import { mockApi } from "@/testing/mock-api";
import { createTestQueryClient, renderWithProviders } from "@/testing/render";
import { PatientTrendsPage } from "../components/patient-trends-page";
import { metricDefinition } from "@pendula/ingest-server/contracts";
import { walkingAidMarkers, walkingAidRuns } from "../components/walking-aid-strip";

const PID = "5a0c7f0e-2b9d-4b59-9d7e-6a1f3c2b9e01";
const at = (i: number) => new Date(Date.UTC(2026, 8, 1 + 7 * i, 9)).toISOString();
const AIDS: WalkingAid[] = ["cane", "cane", "none", "none"];
const sid = (i: number) => testUuid(i + 1, "5e550000");
// Invented speeds (m/s) over four weeks; the strides behind each value as the worker stores them.
const speed = [0.62, 0.66, 0.74, 0.81].map((v, i) => ({ sessionId: sid(i), recordedAt: at(i), value: v, n: 30 + i, walkingAid: AIDS[i]! }));
const sessionPage = sessionPageFixture(
  AIDS.map((aid, i) => ({ id: sid(i), patientId: PID, status: "done", recordedAt: at(i), walkingSpeedMPerS: speed[i]!.value, cadenceStepsPerMin: 90 + i, walkingAid: aid })),
);
const sessions = sessionPage.items;

function server(extra: Parameters<typeof mockApi>[0] = {}) {
  return mockApi({
    [`GET /api/patients/${PID}`]: { body: patientDetailFixture({ id: PID, displayName: "Odile Marchetti", condition: "stroke", heightCm: null }) },
    [`GET /api/patients/${PID}/sessions`]: { body: sessionPage },
    [`GET /api/patients/${PID}/trends`]: {
      body: trendsFixture({
        patientId: PID,
        metrics: [
          { key: "walkingSpeedMPerS", unit: "m/s", label: "Walking speed", countNoun: "strides", points: speed },
          { key: "strideLengthM", unit: "m", label: "Stride length", countNoun: "strides", points: speed.map((p) => ({ ...p, value: p.value * 1.2 })) },
          { key: "armSwingAmplitudeDegLeft", unit: "deg", label: "Arm swing amplitude, left", countNoun: "arm cycles", points: speed.map((p) => ({ ...p, value: 20, n: 25 })) },
          { key: "armSwingAmplitudeDegRight", unit: "deg", label: "Arm swing amplitude, right", countNoun: "arm cycles", points: speed.map((p) => ({ ...p, value: 14, n: 25 })) },
        ],
      }),
    },
    ...extra,
  });
}

afterEach(() => vi.unstubAllGlobals());

describe("new measures on the patient's trends", () => {
  it.each([
    ["walkingSpeedMPerS", "speed"],
    ["strideLengthM", "strideLength"],
    ["swingTimeCvPctLeft", "swingVariability"],
    ["swingTimeCvPctRight", "swingVariability"],
    ["stepTimeAsymmetryPct", "stepAsymmetry"],
    ["armSwingAmplitudeDegLeft", "armSwing"],
    ["armSwingAmplitudeDegRight", "armSwing"],
    ["armSwingAsymmetryPct", "armSwingAsymmetry"],
    ["stepTimeMeanSLeft", null],
    // A relative phase has no chart of its own: on its own, without R beside each point, it would be over-read.
    ["armLegLeftArmRightLegMeanRelativePhaseDeg", null],
    ["armLegRightArmLeftLegCircularSdDeg", null],
  ])("%s → %s", (key, family) => expect(metricDefinition(key)?.chart).toBe(family));

  it("draws no relative phase even when the server sends one", async () => {
    server({
      [`GET /api/patients/${PID}/trends`]: {
        body: trendsFixture({
          patientId: PID,
          metrics: [
            { key: "walkingSpeedMPerS", unit: "m/s", points: speed },
            { key: "armLegLeftArmRightLegMeanRelativePhaseDeg", unit: "deg", label: "Left arm–right leg mean relative phase", points: speed.map((p) => ({ ...p, value: -25 })) },
          ],
        }),
      },
    });
    const { container } = renderWithProviders(<PatientTrendsPage patientId={PID} />, { queryClient: createTestQueryClient() });
    await screen.findByRole("region", { name: /Walking speed/ });
    expect(container.textContent).not.toMatch(/relative phase|-25/i);
  });

  it("draws walking speed with the strides behind each point and the latest value", async () => {
    server();
    const { container } = renderWithProviders(<PatientTrendsPage patientId={PID} />, { queryClient: createTestQueryClient() });
    const card = await screen.findByRole("region", { name: /Walking speed/ });
    expect(within(card).getByText("(m/s)")).toBeTruthy();
    const latest = within(card).getByRole("list", { name: "Walking speed, latest values" });
    expect(latest.textContent).toMatch(/Walking speed, latest:\s*0\.81 m\/s.*\(n = 33 strides\)/);
    // The chart draws once its container has been measured, which can come after the card itself.
    await within(card).findByRole("img", { name: /Walking speed over time/ });
    const titles = [...container.querySelectorAll("title")].map((t) => t.textContent ?? "");
    expect(titles.some((t) => /^Walking speed: 0\.8 on .*; n = 33 strides; walking aid: No aid$/.test(t))).toBe(true);
    expect(screen.getByRole("region", { name: /Arm swing amplitude/ }).textContent).toMatch(/20\.0°.*\(n = 25 arm cycles\)/);
  });

  it("shows the walking aid by session under the charts and marks the change on the charts", async () => {
    server();
    renderWithProviders(<PatientTrendsPage patientId={PID} />, { queryClient: createTestQueryClient() });
    const strip = await screen.findByRole("list", { name: "Walking aid by session" });
    expect(within(strip).getAllByRole("listitem").map((li) => li.textContent)).toEqual([expect.stringMatching(/^Cane 2 sessions/), expect.stringMatching(/^No aid 2 sessions/)]);
    expect(walkingAidMarkers(walkingAidRuns(sessions))).toEqual([{ t: new Date(at(2)), glyph: "A", label: "Walking aid: Cane → No aid" }]);
    const table = within(screen.getByRole("heading", { name: "Sessions" }).closest("section")!).getByRole("table");
    expect(within(table).getByText("0.81 m/s")).toBeTruthy();
    expect(within(table).getAllByText("Cane")).toHaveLength(2);
  });

  it("saves the patient's height and offers to reprocess the sessions analysed before", async () => {
    const { default: userEvent } = await import("@testing-library/user-event");
    const reprocessed: string[] = [];
    const api = server({
      [`PATCH /api/patients/${PID}`]: { body: patientDetailFixture({ id: PID, displayName: "Odile Marchetti", condition: "stroke", heightCm: 168.5 }) },
      ...Object.fromEntries(
        sessions.map((s) => [
          `POST /api/sessions/${s.id}/reprocess`,
          () => {
            reprocessed.push(s.id);
            return { status: 202, body: { id: s.id, status: "queued" } };
          },
        ]),
      ),
    });
    renderWithProviders(<PatientTrendsPage patientId={PID} />, { queryClient: createTestQueryClient() });
    const user = userEvent.setup();
    await user.type(await screen.findByLabelText("Height (cm)"), "168,5");
    await user.click(screen.getByRole("button", { name: "Save height" }));
    await waitFor(() => expect(api.calls.find((c) => c.method === "PATCH")?.body).toEqual({ heightCm: 168.5 }));
    expect(await screen.findByText(/Height saved\. The 4 sessions analysed before keep their results until reprocessed\./)).toBeTruthy();
    await user.click(screen.getByRole("button", { name: "Reprocess the 4 sessions with this height" }));
    expect(await screen.findByText("4 sessions queued; the values update when processing ends.")).toBeTruthy();
    expect(reprocessed).toEqual([sid(0), sid(1), sid(2), sid(3)]);
  });

  it("refuses a height outside 100–230 cm or not a number beside the field, before sending it (same contract as the server)", async () => {
    const { default: userEvent } = await import("@testing-library/user-event");
    const api = server();
    renderWithProviders(<PatientTrendsPage patientId={PID} />, { queryClient: createTestQueryClient() });
    const user = userEvent.setup();
    const field = await screen.findByLabelText("Height (cm)");
    await user.type(field, "1.72");
    await user.click(screen.getByRole("button", { name: "Save height" }));
    expect(await screen.findByText("Enter a height from 100 to 230 cm, or leave the field empty.")).toBeTruthy();
    expect(api.calls.some((c) => c.method === "PATCH")).toBe(false);
    await user.clear(field);
    await user.type(field, "abc");
    await user.click(screen.getByRole("button", { name: "Save height" }));
    expect(field.getAttribute("aria-invalid")).toBe("true");
    expect(api.calls.some((c) => c.method === "PATCH")).toBe(false);
  });
});
