import { afterEach, describe, expect, it, vi } from "vitest";
import { screen } from "@testing-library/react";
import { apiError, mockApi, renderAtRoute } from "@/testing/feature-test-kit";
import { CareTeamPanel } from "../components/care-team-panel";

afterEach(() => vi.unstubAllGlobals());

describe("CareTeamPanel", () => {
  it("names who can see the walks now and who no longer can, in plain words", async () => {
    mockApi({
      "GET /api/caseload-links/care-team": [
        { clinicianName: "Ilse Marrowby", active: true, since: "2026-03-02T09:00:00.000Z", until: null },
        { clinicianName: "Petra Quillfeather", active: false, since: "2026-01-05T09:00:00.000Z", until: "2026-02-20T09:00:00.000Z" },
      ],
    });
    renderAtRoute(<CareTeamPanel />);
    expect(await screen.findByText(/This member of your care team can/)).toBeTruthy();
    expect(screen.getByText(/^Ilse Marrowby, since/)).toBeTruthy();
    expect(screen.getByText("No longer able to see them:")).toBeTruthy();
    expect(screen.getByText(/^Petra Quillfeather, from .* to /)).toBeTruthy();
    expect(screen.getByText(/Researchers never see your name/)).toBeTruthy();
  });

  it("says so when nobody can, and shows a failure with a retry", async () => {
    mockApi({ "GET /api/caseload-links/care-team": [] });
    const { unmount } = renderAtRoute(<CareTeamPanel />);
    expect(await screen.findByText("No clinician can see your walks at the moment.")).toBeTruthy();
    unmount();
    mockApi({ "GET /api/caseload-links/care-team": apiError(500, "internal", "down") });
    renderAtRoute(<CareTeamPanel />);
    expect(await screen.findByText("Your care team could not be loaded")).toBeTruthy();
  });
});
