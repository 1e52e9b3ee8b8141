import { screen, waitFor, within } from "@testing-library/react";
import { Suspense } from "react";
import { afterEach, describe, expect, it, vi } from "vitest";
import type { Analysis } from "@pendula/signal";
import { signalResponse, type WalkingAid } from "@pendula/ingest-server/contracts";
import { storedAnalysis } from "@/testing/analysis-fixtures";
import { conforming, sessionDetailFixture } from "@/testing/contract-fixtures";
import { mockApi } from "@/testing/mock-api";
import { renderWithProviders } from "@/testing/render";
import { SessionPage } from "../components/session-page";

const SID = "2f6b8a1e-4c3d-4e5f-8a9b-0c1d2e3f4a5b";
const PID = "5a0c7f0e-2b9d-4b59-9d7e-6a1f3c2b9e01";

// The worked-example walk as the worker stores it: speed 1.21 m / 1.1 s = 1.10 m/s (a kinematic
// identity on the stride-time check value of docs/methods.md#worked-examples), swing-time CV 3.1 % /
// 3.9 %, left arm swing 31.46°, a left arm–leg phase of −20° at R 0.80 and a withheld right one;
// with two quality items of the kinds the page names.
function analysis(): Analysis {
  return storedAnalysis({
    quality: [
      { code: "speed-unavailable", severity: "info", message: "no height entered for the stride-length scaling" },
      { code: "placement-swap", severity: "warning", placement: "left_wrist", message: "left and right wrist signals look exchanged" },
    ],
  });
}

function detailBody(walkingAid: WalkingAid | null = null) {
  return sessionDetailFixture({
    id: SID,
    patientId: PID,
    status: "done",
    recordedAt: "2026-10-06T09:00:00.000Z",
    durationS: 100,
    algorithmVersion: "1.1.0",
    walkingAid,
    analysis: analysis(),
    metricCounts: { walkingSpeedMPerS: { n: 36, countNoun: "strides" }, strideLengthM: { n: 36, countNoun: "strides" }, armSwingAmplitudeDegLeft: { n: 30, countNoun: "arm cycles" } },
  });
}

function server(extra: Parameters<typeof mockApi>[0] = {}) {
  return mockApi({
    [`GET /api/sessions/${SID}`]: { body: detailBody() },
    [`GET /api/sessions/${SID}/signal`]: { body: conforming(signalResponse, { sessionId: SID, unit: "deg/s", quantity: "sagittal angular velocity", fromS: 0, toS: 100, traces: [] }) },
    ...extra,
  });
}

const renderPage = (onSaved?: (id: string) => void) =>
  renderWithProviders(
    <Suspense fallback={<p>loading</p>}>
      <SessionPage sessionId={SID} onWalkingAidSaved={onSaved} />
    </Suspense>,
  );

afterEach(() => vi.unstubAllGlobals());

describe("session page", () => {
  it("shows walking speed and stride length with the strides behind them", async () => {
    server();
    renderPage();
    const measures = await screen.findByLabelText("Gait measures");
    const speed = within(measures).getByText("Walking speed").parentElement!;
    expect(speed.textContent).toContain("1.10 m/s");
    expect(speed.textContent).toContain("n = 36 strides");
    expect(within(measures).getByText("Stride length").parentElement!.textContent).toContain("1.21 m");
    expect(within(measures).queryByText(/^Note:/)).toBeNull();
    expect(within(measures).getByText("Swing-time CV L / R").parentElement!.textContent).toContain("3.10 % / 3.90 %");
  });

  it("gives the analysis' reason when speed is missing, and its remark beside a speed it computed", async () => {
    const missing = analysis();
    missing.metrics.walkingSpeedMPerS = null;
    missing.metrics.strideLengthM = null;
    missing.metrics.walkingSpeedReason = "no height entered for this patient";
    server({ [`GET /api/sessions/${SID}`]: { body: { ...detailBody(), analysis: missing, metricCounts: {} } } });
    const first = renderPage();
    const measures = await screen.findByLabelText("Gait measures");
    expect(within(measures).getByText("Walking speed").parentElement!.textContent).toBe("Walking speed—no height entered for this patient");
    first.unmount();
    vi.unstubAllGlobals();

    const assumed = analysis();
    assumed.metrics.walkingSpeedReason = "sensor height above the ankle assumed (10 cm)";
    server({ [`GET /api/sessions/${SID}`]: { body: { ...detailBody(), analysis: assumed } } });
    const second = renderPage();
    const again = await screen.findByLabelText("Gait measures");
    expect(within(again).getByText("Walking speed").parentElement!.textContent).toBe("Walking speed1.10 m/sn = 36 stridesNote: sensor height above the ankle assumed (10 cm)");
    second.unmount();
    vi.unstubAllGlobals();

    // A note per shank is long: it folds behind one summary line and opens on demand.
    const perShank = analysis();
    const oneShank = (side: string) =>
      `${side} shank: ankle-to-sensor distance not measurable from this session (fitted pivot not below the sensor); the documented placement, 10 cm above the ankle, was assumed, so its stride lengths are less certain`;
    perShank.metrics.walkingSpeedReason = `${oneShank("left")}; ${oneShank("right")}`;
    server({ [`GET /api/sessions/${SID}`]: { body: { ...detailBody(), analysis: perShank } } });
    renderPage();
    const folded = await screen.findByLabelText("Gait measures");
    const cell = within(folded).getByText("Walking speed").parentElement!;
    const details = cell.querySelector("details")!;
    expect(details.open).toBe(false);
    expect(within(cell).getByText("Note from the analysis: this value rests on an assumption")).toBeTruthy();
    expect(details.textContent).toContain(perShank.metrics.walkingSpeedReason);
  });

  it("shows arm swing per arm and its asymmetry", async () => {
    server();
    renderPage();
    const arms = await screen.findByLabelText("Arm swing");
    expect(within(arms).getByText("Arm swing, left").parentElement!.textContent).toMatch(/31\.5°.*n = 30 arm cycles/);
    expect(within(arms).getByText("Arm swing, right").parentElement!.textContent).toContain("12.0°");
    expect(within(arms).getByText("Arm swing asymmetry").parentElement!.textContent).toContain("89.6 %");
  });

  it("never shows a relative phase without its R; a withheld phase shows the analysis' reason", async () => {
    server();
    renderPage();
    const phases = await screen.findAllByTestId("relative-phase");
    expect(phases).toHaveLength(2);
    expect(phases[0]!.textContent).toBe("-20° (R = 0.80, circular SD 38°)");
    expect(phases[1]!.textContent).toBe("not reported: coupling too weak for a meaningful phase");
    for (const p of phases) if (/\d°/.test(p.textContent ?? "")) expect(p.textContent).toMatch(/R = \d\.\d\d/);
  });

  it("gives the new quality codes readable headings", async () => {
    server();
    renderPage();
    const quality = (await screen.findByText("Recording quality")).closest("section")!;
    expect(within(quality).getByText("Walking speed and stride length not available")).toBeTruthy();
    expect(within(quality).getByText(/Left and right sensors may be swapped/)).toBeTruthy();
    expect(within(quality).getByText("no height entered for the stride-length scaling")).toBeTruthy();
  });

  it("saves the walking aid and tells the route, which refreshes the trends", async () => {
    const { default: userEvent } = await import("@testing-library/user-event");
    const api = server({ [`PATCH /api/sessions/${SID}`]: { body: { id: SID, walkingAid: "cane" } } });
    const onSaved = vi.fn();
    renderPage(onSaved);
    const user = userEvent.setup();
    await user.selectOptions(await screen.findByLabelText("Walking aid in this test"), "cane");
    await user.click(screen.getByRole("button", { name: "Save walking aid" }));
    await waitFor(() => expect(onSaved).toHaveBeenCalledWith(PID));
    expect(api.calls.find((c) => c.method === "PATCH")?.body).toEqual({ walkingAid: "cane" });
  });

  it("after saving, offers to reprocess the session so the analysis is told about the aid", async () => {
    const { default: userEvent } = await import("@testing-library/user-event");
    let aid: WalkingAid | null = null;
    const api = server({
      [`GET /api/sessions/${SID}`]: () => ({ body: detailBody(aid) }),
      [`PATCH /api/sessions/${SID}`]: ({ body }) => {
        aid = (body as { walkingAid: WalkingAid }).walkingAid;
        return { body: { id: SID, walkingAid: aid } };
      },
      [`POST /api/sessions/${SID}/reprocess`]: { status: 202, body: { id: SID, status: "queued" } },
    });
    const onSaved = vi.fn();
    renderPage(onSaved);
    const user = userEvent.setup();
    await user.selectOptions(await screen.findByLabelText("Walking aid in this test"), "crutches");
    await user.click(screen.getByRole("button", { name: "Save walking aid" }));
    await user.click(await screen.findByRole("button", { name: "Reprocess this session" }));
    await waitFor(() => expect(api.calls.some((c) => c.method === "POST" && c.path === `/api/sessions/${SID}/reprocess`)).toBe(true));
    await waitFor(() => expect(onSaved).toHaveBeenCalledTimes(2));
  });

  it("shows the server's reason when the walking aid is refused", async () => {
    const { default: userEvent } = await import("@testing-library/user-event");
    server({
      [`PATCH /api/sessions/${SID}`]: { status: 422, body: { error: { code: "invalid_session_field", message: "walkingAid must be one of none, cane, crutches, rollator, other, or null to clear it" } } },
    });
    renderPage();
    const user = userEvent.setup();
    await user.selectOptions(await screen.findByLabelText("Walking aid in this test"), "rollator");
    await user.click(screen.getByRole("button", { name: "Save walking aid" }));
    expect(await screen.findByText(/walkingAid must be one of none, cane/)).toBeTruthy();
  });
});
