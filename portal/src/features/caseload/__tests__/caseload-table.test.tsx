import { screen, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { describe, expect, it } from "vitest";
import { patientSummaryFixture, testUuid } from "@/testing/contract-fixtures";
import { renderWithProviders } from "@/testing/render";
import type { CaseloadRow } from "../api/get-caseload";
import { CaseloadTable } from "../components/caseload-table";

// An invented caseload of the fictional Ferngate rehabilitation clinic.
const rows: CaseloadRow[] = [
  patientSummaryFixture({ id: testUuid(1), displayName: "Odile Marchetti", researchId: "FG-014", condition: "stroke", lastUploadAt: "2026-11-20T09:00:00Z", adherencePct: 100, latest: { cadenceStepsPerMin: 92.4, phaseCoordinationIndexPct: 6.1 }, flags: [] }),
  patientSummaryFixture({ id: testUuid(2), displayName: "Tamsin Okonkwo-Reyes", researchId: "FG-022", condition: "parkinsons", lastUploadAt: "2026-11-18T09:00:00Z", adherencePct: 40, latest: { cadenceStepsPerMin: 104.9, phaseCoordinationIndexPct: 9.8 }, flags: [
    { metricKey: "cadenceStepsPerMin", flag: "improved", kind: "improved", label: "Cadence better than baseline", severity: 10 },
    { metricKey: "strideTimeCvPct", flag: "worsened", kind: "worsened", label: "Stride-time variability worse than baseline", severity: 50 },
    { metricKey: "armLegLeftArmRightLegFrequencyRatio", flag: "arm-leg-mode-change", kind: "coordination-change", label: "Arm–leg coordination mode changed (left arm – right leg)", severity: 40 },
  ] }),
  patientSummaryFixture({ id: testUuid(3), displayName: "Bartholomew Ianakiev", researchId: "FG-031", condition: "incomplete_sci", lastUploadAt: null, adherencePct: null, latest: { cadenceStepsPerMin: null, phaseCoordinationIndexPct: null } }),
  patientSummaryFixture({ id: testUuid(4), displayName: "Wren Castellanos", researchId: "FG-040", condition: "stroke", lastUploadAt: "2026-11-22T09:00:00Z", adherencePct: 75, latest: { cadenceStepsPerMin: 78.0, phaseCoordinationIndexPct: 12.3 }, flags: [{ metricKey: "cadenceStepsPerMin", flag: "improved" }] }),
];

const bodyNames = () => within(screen.getAllByRole("rowgroup")[1]!).getAllByRole("link").map((a) => a.textContent);

describe("caseload table", () => {
  it("sorts by cadence ascending then descending, with missing values last both ways", async () => {
    const user = userEvent.setup();
    renderWithProviders(<CaseloadTable rows={rows} />);
    const header = screen.getByRole("button", { name: /Cadence/ });
    const th = header.closest("th")!;
    // Numbers start descending in TanStack Table; click until each direction is reached.
    const sortTo = async (want: string) => {
      for (let i = 0; i < 3 && th.getAttribute("aria-sort") !== want; i++) await user.click(header);
      expect(th.getAttribute("aria-sort")).toBe(want);
    };
    await sortTo("ascending");
    expect(bodyNames()).toEqual(["Wren Castellanos", "Odile Marchetti", "Tamsin Okonkwo-Reyes", "Bartholomew Ianakiev"]);
    await sortTo("descending");
    expect(bodyNames()).toEqual(["Tamsin Okonkwo-Reyes", "Odile Marchetti", "Wren Castellanos", "Bartholomew Ianakiev"]);
  }, 20_000);

  it("starts with the most recent upload first", () => {
    renderWithProviders(<CaseloadTable rows={rows} />);
    expect(bodyNames()[0]).toBe("Wren Castellanos");
    expect(bodyNames().at(-1)).toBe("Bartholomew Ianakiev");
  });

  it("filters by condition and searches by name or research id", async () => {
    const user = userEvent.setup();
    renderWithProviders(<CaseloadTable rows={rows} />);
    await user.selectOptions(screen.getByLabelText("Condition"), "stroke");
    expect(bodyNames().sort()).toEqual(["Odile Marchetti", "Wren Castellanos"]);
    expect(screen.getByText("Showing 2 of 4 patients")).toBeTruthy();

    await user.type(screen.getByLabelText("Search patients"), "fg-040");
    expect(bodyNames()).toEqual(["Wren Castellanos"]);

    await user.selectOptions(screen.getByLabelText("Condition"), "");
    await user.clear(screen.getByLabelText("Search patients"));
    await user.type(screen.getByLabelText("Search patients"), "nobody");
    expect(screen.getByText("No patients match")).toBeTruthy();
  }, 20_000);

  it("names each flag in words with an icon, most urgent first, and can keep flagged patients only", async () => {
    const user = userEvent.setup();
    renderWithProviders(<CaseloadTable rows={rows} />);
    const lists = screen.getAllByRole("list", { name: "Flags, most urgent first" });
    const words = lists.map((l) => within(l).getAllByRole("listitem").map((li) => li.textContent));
    expect(words).toContainEqual([
      "Stride-time variability worse than baseline",
      "Arm–leg coordination mode changed (left arm – right leg)",
      "Cadence better than baseline",
    ]);
    // An answer without names still reads as words, never as a count.
    expect(words).toContainEqual(["cadenceStepsPerMin: better than baseline"]);
    expect(screen.queryByText(/\d+ other/)).toBeNull();
    for (const l of lists) expect(l.querySelectorAll("svg").length).toBeGreaterThan(0);
    await user.click(screen.getByLabelText("Flagged only"));
    expect(bodyNames().sort()).toEqual(["Tamsin Okonkwo-Reyes", "Wren Castellanos"]);
  });

  it("sorts patients by their most urgent flag: worse-than-baseline first, improvements after, no data last", async () => {
    const user = userEvent.setup();
    renderWithProviders(<CaseloadTable rows={rows} />);
    const header = screen.getByRole("button", { name: /Flags/ });
    const th = header.closest("th")!;
    for (let i = 0; i < 3 && th.getAttribute("aria-sort") !== "descending"; i++) await user.click(header);
    expect(th.getAttribute("aria-sort")).toBe("descending");
    expect(bodyNames()).toEqual(["Tamsin Okonkwo-Reyes", "Wren Castellanos", "Odile Marchetti", "Bartholomew Ianakiev"]);
  }, 20_000);
});
