import { screen } from "@testing-library/react";
import { Suspense } from "react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { patientSessions, type SessionSummary } from "@pendula/ingest-server/contracts";
import { conforming, sessionSummaryFixture } from "@/testing/contract-fixtures";
import { mockApi } from "@/testing/mock-api";
import { renderWithProviders } from "@/testing/render";
import { PatientProgress } from "../components/patient-progress";
import { SPEED_CAUTION } from "../components/progress-words";

const PID = "5a0c7f0e-2b9d-4b59-9d7e-6a1f3c2b9e01";
const page = (items: SessionSummary[]) => conforming(patientSessions, { items, total: items.length, limit: 500, offset: 0 });

afterEach(() => vi.unstubAllGlobals());

describe("patient progress", () => {
  it("gives walking speed in words with the caution that it supports, not replaces, the care team's judgement", async () => {
    mockApi({
      [`GET /api/patients/${PID}/sessions`]: {
        body: page([sessionSummaryFixture({ patientId: PID, status: "done", recordedAt: "2026-10-06T09:00:00Z", cadenceStepsPerMin: 96, walkingSpeedMPerS: 0.74 })]),
      },
    });
    renderWithProviders(
      <Suspense fallback={<p>loading</p>}>
        <PatientProgress patientId={PID} />
      </Suspense>,
    );
    expect(await screen.findByText("In your latest walk your walking speed was about 0.7 metres per second (about 2.7 km/h).")).toBeTruthy();
    expect(screen.getByText(SPEED_CAUTION)).toBeTruthy();
    expect(screen.getByText("0.7 m/s")).toBeTruthy();
  });

  it("shows no speed caution when no walk has a speed", async () => {
    mockApi({
      [`GET /api/patients/${PID}/sessions`]: { body: page([sessionSummaryFixture({ patientId: PID, status: "done", recordedAt: "2026-10-06T09:00:00Z", cadenceStepsPerMin: 96 })]) },
    });
    renderWithProviders(
      <Suspense fallback={<p>loading</p>}>
        <PatientProgress patientId={PID} />
      </Suspense>,
    );
    expect(await screen.findByText(/you took about 96 steps per minute/)).toBeTruthy();
    expect(screen.queryByText(SPEED_CAUTION)).toBeNull();
  });
});
