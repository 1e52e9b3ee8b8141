import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { screen, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { apiError, json, mockApi, renderWithQuery } from "@/testing/feature-test-kit";
import { ResearchPage } from "../components/research-page";
import { cohortDefinitionSchema, DEFAULT_COHORT } from "../api/cohort-definition";
import { cohortPreviewSchema } from "../api/preview-cohort";
import { exportQuery } from "../api/download-cohort-export";

const totals = { subjects: 12, sessions: 101, suppressedCells: 1 };
const preview = {
  k: 5,
  definition: DEFAULT_COHORT,
  metrics: DEFAULT_COHORT.metrics,
  totals,
  cells: [
    { condition: "stroke", ageBand: "60-64", suppressed: false, subjects: 7, sessions: 61 },
    { condition: "stroke", ageBand: "90+", suppressed: true, subjects: null, sessions: null },
    { condition: "incomplete_sci", ageBand: "30-34", suppressed: false, subjects: 5, sessions: 40 },
  ],
};

beforeEach(() => {
  vi.stubGlobal("URL", Object.assign(URL, { createObjectURL: vi.fn(() => "blob:cohort"), revokeObjectURL: vi.fn() }));
});
afterEach(() => vi.unstubAllGlobals());

describe("cohortDefinitionSchema", () => {
  it("rejects a week range that ends before it starts", () => {
    const result = cohortDefinitionSchema.safeParse({ ...DEFAULT_COHORT, weeksSinceEnrolment: { from: 10, to: 4 } });
    expect(result.success).toBe(false);
  });
  it("offers the server's band form, with 90+ as the last band", () => {
    expect(DEFAULT_COHORT.ageBands[0]).toBe("15-19");
    expect(DEFAULT_COHORT.ageBands.at(-1)).toBe("90+");
    expect(DEFAULT_COHORT.ageBands.at(-2)).toBe("85-89");
  });
  it("rejects an age band that is not a 5-year band", () => {
    expect(cohortDefinitionSchema.safeParse({ ...DEFAULT_COHORT, ageBands: ["61-63"] }).success).toBe(false);
  });
});

describe("ResearchPage", () => {
  it("previews the submitted cohort and spells out suppressed cells in words", async () => {
    const { calls } = mockApi({ "POST /api/research/cohorts": preview });
    renderWithQuery(<ResearchPage />);
    expect(screen.getByText(/HIPAA Safe Harbor/)).toBeTruthy();
    await userEvent.click(screen.getByRole("button", { name: "Preview cohort" }));

    const table = await screen.findByRole("table");
    const rows = within(table).getAllByRole("row");
    expect(rows).toHaveLength(4);
    expect(within(rows[2]!).getByText("suppressed (< 5 subjects)")).toBeTruthy();
    // A suppressed cell shows no number at all.
    expect(within(rows[2]!).queryByText(/^\d+$/)).toBeNull();
    expect(within(rows[1]!).getByText("61")).toBeTruthy();
    expect(screen.getByText(/groups? withheld/).textContent).toContain("1 group withheld");

    expect(calls[0]?.body).toEqual(DEFAULT_COHORT);
  });

  it("shows a field error and sends nothing when no condition is chosen", async () => {
    const { calls } = mockApi({ "POST /api/research/cohorts": preview });
    renderWithQuery(<ResearchPage />);
    const conditions = screen.getByRole("group", { name: "Condition" });
    for (const box of within(conditions).getAllByRole("checkbox")) if ((box as HTMLInputElement).checked) await userEvent.click(box);
    await userEvent.click(screen.getByRole("button", { name: "Preview cohort" }));
    expect(await screen.findByText("choose at least one condition")).toBeTruthy();
    expect(calls).toHaveLength(0);
  });

  it("shows the server's message when the preview fails", async () => {
    mockApi({ "POST /api/research/cohorts": apiError(400, "validation", "metrics: unknown metric key") });
    renderWithQuery(<ResearchPage />);
    await userEvent.click(screen.getByRole("button", { name: "Preview cohort" }));
    expect((await screen.findByRole("alert")).textContent).toContain("metrics: unknown metric key");
  });

  it("says so when no subject matches", async () => {
    mockApi({ "POST /api/research/cohorts": { ...preview, cells: [], totals: { subjects: 0, sessions: 0, suppressedCells: 0 } } });
    renderWithQuery(<ResearchPage />);
    await userEvent.click(screen.getByRole("button", { name: "Preview cohort" }));
    expect(await screen.findByText(/No consenting subjects match/)).toBeTruthy();
  });

  it("downloads the CSV export of the previewed definition", async () => {
    const { calls } = mockApi({
      "POST /api/research/cohorts": preview,
      "GET /api/research/cohort-metrics": () =>
        new Response("subject_id,week\nsub-1,0\n", {
          status: 200,
          headers: { "content-type": "text/csv", "content-disposition": 'attachment; filename="cohort-2026.csv"' },
        }),
    });
    renderWithQuery(<ResearchPage />);
    expect((screen.getByRole("button", { name: "Download CSV" }) as HTMLButtonElement).disabled).toBe(true);
    await userEvent.click(screen.getByRole("button", { name: "Preview cohort" }));
    await screen.findByRole("table");
    await userEvent.click(screen.getByRole("button", { name: "Download CSV" }));
    expect(await screen.findByText(/Saved cohort-2026.csv/)).toBeTruthy();
    const exportCall = calls.find((c) => c.path === "/api/research/cohort-metrics");
    expect(exportCall?.search.get("format")).toBe("csv");
    expect(exportCall?.search.get("conditions")).toBe(DEFAULT_COHORT.conditions.join(","));
    expect(URL.createObjectURL).toHaveBeenCalledTimes(1);
  });

  it("reports a failed FHIR export instead of saving anything", async () => {
    mockApi({
      "POST /api/research/cohorts": preview,
      "GET /api/research/cohort-metrics": json(403, { error: { code: "forbidden", message: "no research scope" } }),
    });
    renderWithQuery(<ResearchPage />);
    await userEvent.click(screen.getByRole("button", { name: "Preview cohort" }));
    await screen.findByRole("table");
    await userEvent.click(screen.getByRole("button", { name: "Download FHIR bundle" }));
    expect(await screen.findByText(/The export failed/)).toBeTruthy();
    expect(URL.createObjectURL).not.toHaveBeenCalled();
  });
});

describe("cohortPreviewSchema", () => {
  it("refuses a preview whose cells are missing their counts field", () => {
    const broken = { ...preview, cells: [{ condition: "stroke", ageBand: "60-64", suppressed: false }] };
    expect(cohortPreviewSchema.safeParse(broken).success).toBe(false);
  });
});

describe("exportQuery", () => {
  it("carries every part of the definition", () => {
    expect(exportQuery(DEFAULT_COHORT, "fhir")).toMatchObject({ format: "fhir", weeksFrom: "0", weeksTo: "52" });
  });
});
