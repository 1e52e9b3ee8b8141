import { screen, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { describe, expect, it } from "vitest";
import { patientSummaryFixture, testUuid } from "@/testing/contract-fixtures";
import { renderWithProviders } from "@/testing/render";
import { CaseloadTable } from "../components/caseload-table";
import type { CaseloadRow } from "../api/get-caseload";

// Invented caseload; speeds in m/s of each patient's latest processed session.
const rows: CaseloadRow[] = [
  patientSummaryFixture({ id: testUuid(1), displayName: "Odile Marchetti", condition: "stroke", lastUploadAt: "2026-11-20T09:00:00Z", latest: { walkingSpeedMPerS: 0.64 }, flags: [] }),
  patientSummaryFixture({ id: testUuid(2), displayName: "Tamsin Okonkwo-Reyes", condition: "parkinsons", lastUploadAt: "2026-11-18T09:00:00Z", latest: { walkingSpeedMPerS: 1.12 }, flags: [] }),
  patientSummaryFixture({ id: testUuid(3), displayName: "Bartholomew Ianakiev", condition: "incomplete_sci", lastUploadAt: null, latest: { walkingSpeedMPerS: null } }),
];

const bodyNames = () => within(screen.getAllByRole("rowgroup")[1]!).getAllByRole("link").map((a) => a.textContent);

describe("caseload walking speed column", () => {
  it("shows the latest walking speed and sorts by it with missing values last", async () => {
    const user = userEvent.setup();
    renderWithProviders(<CaseloadTable rows={rows} />);
    expect(screen.getByText("0.64")).toBeTruthy();
    expect(screen.getByText("1.12")).toBeTruthy();
    const header = screen.getByRole("button", { name: /Walking speed \(m\/s\)/ });
    const th = header.closest("th")!;
    for (let i = 0; i < 3 && th.getAttribute("aria-sort") !== "ascending"; i++) await user.click(header);
    expect(bodyNames()).toEqual(["Odile Marchetti", "Tamsin Okonkwo-Reyes", "Bartholomew Ianakiev"]);
  }, 20_000);
});
