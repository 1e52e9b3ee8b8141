import { afterEach, describe, expect, it, vi } from "vitest";
import { screen, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { apiError, json, mockApi, renderAtRoute, type RecordedCall } from "@/testing/feature-test-kit";
import { patientIdentityFixture } from "@/testing/contract-fixtures";
import { CaseloadLinksPage } from "../components/caseload-links-page";

const CLINICIAN = "10000000-0000-4000-8000-000000000001";
const PATIENT = "30000000-0000-4000-8000-000000000001";
const ADMIN = "20000000-0000-4000-8000-000000000001";

const link = (over: object = {}) => ({
  id: "40000000-0000-4000-8000-000000000001",
  clinicianId: CLINICIAN,
  clinicianName: "Ilse Marrowby",
  clinicianEmail: "wren@fernhollow.test",
  patientId: PATIENT,
  patientName: "Orla Penhaligon",
  active: true,
  createdAt: "2026-11-02T09:00:00.000Z",
  createdBy: ADMIN,
  createdByName: "Site Admin",
  reason: "covering the Tuesday clinic",
  endedAt: null,
  endedBy: null,
  endedByName: null,
  endReason: null,
  ...over,
});

const users = {
  items: [
    {
      id: CLINICIAN,
      email: "wren@fernhollow.test",
      displayName: "Ilse Marrowby",
      role: "clinician",
      status: "active",
      patientId: null,
      createdAt: "2026-10-01T09:00:00.000Z",
      lastLoginAt: null,
    },
  ],
  total: 1,
  limit: 500,
  offset: 0,
};
const patients = { items: [patientIdentityFixture({ id: PATIENT, displayName: "Orla Penhaligon" })] };

afterEach(() => vi.unstubAllGlobals());

function routes(extra: Record<string, unknown> = {}) {
  return {
    "GET /api/users": users,
    "GET /api/patients": patients,
    "GET /api/caseload-links": ({ search }: RecordedCall) =>
      search.get("state") === "ended" ? { items: [link({ active: false, endedAt: "2026-11-20T10:00:00.000Z", endedBy: ADMIN, endedByName: "Site Admin", endReason: "discharged" })], total: 1, limit: 25, offset: 0 } : { items: [link()], total: 1, limit: 25, offset: 0 },
    ...extra,
  };
}

describe("CaseloadLinksPage", () => {
  it("lists current access with who gave it and why, and switches to the history", async () => {
    const { calls } = mockApi(routes());
    renderAtRoute(<CaseloadLinksPage />);
    const table = await screen.findByRole("table");
    expect(within(table).getByText("Orla Penhaligon")).toBeTruthy();
    expect(within(table).getByText("by Site Admin")).toBeTruthy();
    expect(within(table).getByText("“covering the Tuesday clinic”")).toBeTruthy();
    await userEvent.selectOptions(screen.getByLabelText("Show"), "ended");
    expect(await screen.findByText("“discharged”")).toBeTruthy();
    expect(calls.filter((c) => c.path === "/api/caseload-links").at(-1)?.search.get("state")).toBe("ended");
  });

  it("gives access only with a clinician, a patient and a reason, and shows the server's refusal", async () => {
    const { calls } = mockApi(routes({ "POST /api/caseload-links": apiError(409, "link_exists", "this clinician already has this patient on their caseload") }));
    renderAtRoute(<CaseloadLinksPage />);
    await screen.findByRole("table");
    await userEvent.click(screen.getByRole("button", { name: "Give access" }));
    expect(screen.getByText("choose a clinician")).toBeTruthy();
    expect(screen.getByText("choose a patient")).toBeTruthy();
    expect(calls.some((c) => c.method === "POST")).toBe(false);

    const form = screen.getByRole("form", { name: "Give a clinician access to a patient" });
    await userEvent.selectOptions(within(form).getByLabelText("Clinician"), CLINICIAN);
    await userEvent.selectOptions(within(form).getByLabelText("Patient"), PATIENT);
    await userEvent.type(within(form).getByLabelText("Reason"), "second opinion");
    await userEvent.click(within(form).getByRole("button", { name: "Give access" }));
    expect((await screen.findByRole("alert")).textContent).toContain("already has this patient");
    expect(calls.find((c) => c.method === "POST")?.body).toEqual({ clinicianId: CLINICIAN, patientId: PATIENT, reason: "second opinion" });
  });

  it("ends access with a reason through DELETE and reloads the list", async () => {
    let ended = false;
    const { calls } = mockApi(
      routes({
        "DELETE /api/caseload-links/40000000-0000-4000-8000-000000000001": () => {
          ended = true;
          return json(200, link({ active: false, endedAt: "2026-12-01T10:00:00.000Z", endedBy: ADMIN, endedByName: "Site Admin", endReason: "moved away" }));
        },
      }),
    );
    renderAtRoute(<CaseloadLinksPage />);
    await userEvent.click(await screen.findByRole("button", { name: "End Ilse Marrowby's access to Orla Penhaligon" }));
    await userEvent.click(screen.getByRole("button", { name: "End access" }));
    expect(screen.getByText("give a reason of at least 3 characters")).toBeTruthy();
    expect(ended).toBe(false);
    await userEvent.type(screen.getByLabelText("Reason for ending"), "moved away");
    await userEvent.click(screen.getByRole("button", { name: "End access" }));
    await vi.waitFor(() => expect(ended).toBe(true));
    expect(calls.find((c) => c.method === "DELETE")?.body).toEqual({ reason: "moved away" });
    await vi.waitFor(() => expect(calls.filter((c) => c.path === "/api/caseload-links" && c.method === "GET").length).toBeGreaterThan(1));
  });
});
