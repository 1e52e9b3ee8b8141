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
    { condition: "stroke", ageBand: "60-64", label: "stroke, 60-64", suppressed: false, subjects: 7, sessions: 61 },
    { condition: "incomplete_sci", ageBand: "30-34", label: "incomplete_sci, 30-34", suppressed: false, subjects: 5, sessions: 40 },
    { condition: null, ageBand: null, label: "suppressed group (n < 5)", suppressed: true, subjects: null, sessions: null },
  ],
};
const PROJECT = "6f1c2a4e-7b1d-4c3e-9a55-0d2f8e6b1a77";
const projects = {
  items: [{ id: PROJECT, name: "Cadence after stroke", purpose: "Weekly cadence recovery", owner: { id: "0b0e8a52-1c3d-4e5f-8a9b-7c6d5e4f3a2b", displayName: "Iona Pell" }, createdAt: "2026-11-02T09:00:00.000Z" }],
};
const exportRules = {
  k: 5,
  countStep: 5,
  studyClock: { blockWeeks: 4, capWeeks: 52, releaseLagDays: 28 },
  metrics: [
    { key: "walkingSpeedMPerS", unit: "m/s", label: "Walking speed", step: 0.05, decimals: 2, why: "0.05 m/s, the smallest published MDC" },
    { key: "cadenceStepsPerMin", unit: "/min", label: "Cadence (steps/min)", step: 1, decimals: 0, why: "whole steps per minute (common practice)" },
  ],
};
const base = { "GET /api/research/projects": projects, "GET /api/research/export-rules": exportRules };

// The page renders every cohort checkbox; on a loaded shared machine the first render alone can take seconds.
vi.setConfig({ testTimeout: 20_000 });

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
    const { calls } = mockApi({ ...base, "POST /api/research/cohorts": preview });
    renderWithQuery(<ResearchPage />);
    expect(screen.getByText(/HIPAA Safe Harbor/)).toBeTruthy();
    await userEvent.click(screen.getByRole("button", { name: "Preview cohort" }));

    const table = await screen.findByRole("table", { name: /Subjects and sessions/ });
    const rows = within(table).getAllByRole("row");
    expect(rows).toHaveLength(4);
    expect(within(rows[3]!).getByText("suppressed group (n < 5)")).toBeTruthy();
    // A suppressed group shows no number and no condition or age band.
    expect(within(rows[3]!).queryByText(/^\d+$/)).toBeNull();
    expect(rows[3]!.textContent).not.toMatch(/Stroke|90\+|—/);
    expect(within(rows[1]!).getByText("61")).toBeTruthy();
    expect(screen.getByText(/groups? withheld/).textContent).toContain("1 group withheld");

    expect(calls.find((c) => c.path === "/api/research/cohorts")?.body).toEqual(DEFAULT_COHORT);
  });

  it("shows a field error and sends nothing when no condition is chosen", async () => {
    const { calls } = mockApi({ ...base, "POST /api/research/cohorts": preview });
    renderWithQuery(<ResearchPage />);
    const conditions = screen.getByRole("group", { name: "Condition" });
    for (const box of within(conditions).getAllByRole("checkbox")) if ((box as HTMLInputElement).checked) await userEvent.click(box);
    await userEvent.click(screen.getByRole("button", { name: "Preview cohort" }));
    expect(await screen.findByText("choose at least one condition")).toBeTruthy();
    expect(calls.filter((c) => c.path === "/api/research/cohorts")).toHaveLength(0);
  });

  it("shows the server's message when the preview fails", async () => {
    mockApi({ ...base, "POST /api/research/cohorts": apiError(400, "validation", "metrics: unknown metric key") });
    renderWithQuery(<ResearchPage />);
    await userEvent.click(screen.getByRole("button", { name: "Preview cohort" }));
    expect((await screen.findByRole("alert")).textContent).toContain("metrics: unknown metric key");
  });

  it("says so when no subject matches", async () => {
    mockApi({ ...base, "POST /api/research/cohorts": { ...preview, cells: [], totals: { subjects: 0, sessions: 0, suppressedCells: 0 } } });
    renderWithQuery(<ResearchPage />);
    await userEvent.click(screen.getByRole("button", { name: "Preview cohort" }));
    expect(await screen.findByText(/No consenting subjects match/)).toBeTruthy();
  });

  it("downloads the CSV export of the previewed definition", async () => {
    const { calls } = mockApi({
      ...base,
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
    await screen.findByRole("table", { name: /Subjects and sessions/ });
    // Still disabled: no project chosen yet.
    expect((screen.getByRole("button", { name: "Download CSV" }) as HTMLButtonElement).disabled).toBe(true);
    await userEvent.selectOptions(await screen.findByLabelText("Export under project"), PROJECT);
    await userEvent.click(screen.getByRole("button", { name: "Download CSV" }));
    expect(await screen.findByText(/Saved cohort-2026.csv/)).toBeTruthy();
    const exportCall = calls.find((c) => c.path === "/api/research/cohort-metrics");
    expect(exportCall?.search.get("format")).toBe("csv");
    expect(exportCall?.search.get("projectId")).toBe(PROJECT);
    expect(exportCall?.search.get("conditions")).toBe(DEFAULT_COHORT.conditions.join(","));
    expect(URL.createObjectURL).toHaveBeenCalledTimes(1);
  });

  it("reports a failed FHIR export instead of saving anything", async () => {
    mockApi({
      ...base,
      "POST /api/research/cohorts": preview,
      "GET /api/research/cohort-metrics": json(403, { error: { code: "forbidden", message: "no research scope" } }),
    });
    renderWithQuery(<ResearchPage />);
    await userEvent.click(screen.getByRole("button", { name: "Preview cohort" }));
    await screen.findByRole("table", { name: /Subjects and sessions/ });
    await userEvent.selectOptions(await screen.findByLabelText("Export under project"), PROJECT);
    await userEvent.click(screen.getByRole("button", { name: "Download FHIR bundle" }));
    expect(await screen.findByText(/The export failed/)).toBeTruthy();
    expect(URL.createObjectURL).not.toHaveBeenCalled();
  });
});

describe("research projects and export rules", () => {
  it("creates a project when the researcher has none, and chooses it for the export", async () => {
    const created = { ...projects.items[0]!, id: "1d2c3b4a-5e6f-4a7b-8c9d-0e1f2a3b4c5d", name: "Arm swing substudy", purpose: null };
    let list: Array<typeof created> = [];
    const { calls } = mockApi({
      ...base,
      "GET /api/research/projects": () => ({ items: list }),
      "POST /api/research/projects": (c: { body: unknown }) => {
        list = [created];
        return json(201, { ...created, name: (c.body as { name: string }).name });
      },
    });
    renderWithQuery(<ResearchPage />);
    expect(await screen.findByText(/no research project yet/)).toBeTruthy();
    await userEvent.click(screen.getByRole("button", { name: "Create project" }));
    expect(await screen.findByText("a project name has at least 3 characters")).toBeTruthy();
    expect(calls.filter((c) => c.method === "POST")).toHaveLength(0);
    await userEvent.type(screen.getByLabelText("Project name"), "Arm swing substudy");
    await userEvent.click(screen.getByRole("button", { name: "Create project" }));
    const select = (await screen.findByLabelText("Export under project")) as HTMLSelectElement;
    expect(select.value).toBe(created.id);
    expect(calls.find((c) => c.method === "POST" && c.path === "/api/research/projects")?.body).toEqual({ name: "Arm swing substudy" });
  });

  it("lists each metric's export precision from the server", async () => {
    mockApi(base);
    renderWithQuery(<ResearchPage />);
    await userEvent.click(await screen.findByText("How precisely each value is exported"));
    const table = await screen.findByRole("table", { name: "Export precision per metric" });
    expect(within(table).getByText("0.05 m/s")).toBeTruthy();
    expect(within(table).getByText(/whole steps per minute/)).toBeTruthy();
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
    expect(exportQuery(DEFAULT_COHORT, "fhir", PROJECT)).toMatchObject({ projectId: PROJECT, format: "fhir", weeksFrom: "0", weeksTo: "52" });
  });
});
