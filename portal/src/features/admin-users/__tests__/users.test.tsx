import { afterEach, describe, expect, it, vi } from "vitest";
import { screen, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { apiError, mockApi, renderAtRoute } from "@/testing/feature-test-kit";
import { UsersPage } from "../components/users-page";
import { InvitationsPage } from "../components/invitations-page";
import { invitationInputSchema } from "../api/create-invitation";

const user = (n: number, over: Record<string, unknown> = {}) => ({
  id: `00000000-0000-4000-8000-00000000000${n}`,
  email: `person${n}@brookfield-rehab.test`,
  displayName: `Person ${n}`,
  role: "clinician",
  status: "active",
  patientId: null,
  createdAt: "2026-10-01T08:00:00.000Z",
  lastLoginAt: null,
  ...over,
});

afterEach(() => vi.unstubAllGlobals());

describe("UsersPage", () => {
  it("lists accounts with role and status in words and pages through them", async () => {
    const { calls } = mockApi({
      "GET /api/users": ({ search }: { search: URLSearchParams }) => ({
        items: search.get("offset") === "25" ? [user(9)] : [user(1), user(2, { role: "patient", patientId: "30000000-0000-4000-8000-000000000002", status: "invited" })],
        total: 26,
        limit: 25,
        offset: Number(search.get("offset")),
      }),
    });
    renderAtRoute(<UsersPage />);
    const table = await screen.findByRole("table");
    const rows = within(table).getAllByRole("row");
    expect(rows[1]!.textContent).toContain("Clinician");
    expect(within(rows[1]!).getAllByRole("cell")[3]!.textContent).toBe("Active");
    expect(within(rows[2]!).getByText("Invited")).toBeTruthy();
    // A patient account's role is fixed; an invited account has no status to change yet.
    expect(within(rows[2]!).queryByLabelText("Role")).toBeNull();
    expect(within(rows[2]!).getByText("Awaiting acceptance")).toBeTruthy();
    expect(screen.getByText("Page 1 of 2")).toBeTruthy();
    await userEvent.click(screen.getByRole("button", { name: "Next →" }));
    expect(await screen.findByText("Person 9")).toBeTruthy();
    expect(calls.at(-1)?.search.get("offset")).toBe("25");
  });

  it("sends only the changed field and shows a refusal from the server", async () => {
    const { calls } = mockApi({
      "GET /api/users": { items: [user(1)], total: 1, limit: 25, offset: 0 },
      [`PATCH /api/users/${user(1).id}`]: apiError(409, "last_admin", "the last active administrator cannot be disabled"),
    });
    renderAtRoute(<UsersPage />);
    const row = within(await screen.findByRole("table")).getAllByRole("row")[1]!;
    await userEvent.selectOptions(within(row).getByLabelText("Status"), "disabled");
    await userEvent.click(within(row).getByRole("button", { name: "Save" }));
    expect((await within(row).findByRole("alert")).textContent).toContain("the last active administrator cannot be disabled");
    expect(calls.find((c) => c.method === "PATCH")?.body).toEqual({ status: "disabled" });
  });

  it("filters by role through the query string", async () => {
    const { calls } = mockApi({ "GET /api/users": { items: [], total: 0, limit: 25, offset: 0 } });
    renderAtRoute(<UsersPage />);
    expect(await screen.findByText("No accounts match")).toBeTruthy();
    await userEvent.selectOptions(screen.getByLabelText("Role"), "researcher");
    await vi.waitFor(() => expect(calls.at(-1)?.search.get("role")).toBe("researcher"));
  });
});

describe("invitationInputSchema", () => {
  it("needs a patient record for a patient invitation", () => {
    const r = invitationInputSchema.safeParse({ email: "a@b.test", displayName: "A", role: "patient", patientMode: "existing", patientId: "" });
    expect(r.success).toBe(false);
  });
  it("drops patient fields from a staff invitation", () => {
    const r = invitationInputSchema.parse({ email: " Ada@B.test ", displayName: "Ada", role: "researcher", patientMode: "new", patient: {} });
    expect(r).toEqual({ email: "ada@b.test", displayName: "Ada", role: "researcher" });
  });
});

describe("InvitationsPage", () => {
  const pending = {
    id: "10000000-0000-4000-8000-000000000001",
    userId: "20000000-0000-4000-8000-000000000001",
    email: "new.physio@brookfield-rehab.test",
    displayName: "Tamsin Oakridge",
    role: "clinician",
    patientId: null,
    invitedBy: null,
    createdAt: "2026-11-30T08:00:00.000Z",
    expiresAt: "2099-12-07T08:00:00.000Z",
    acceptedAt: null,
  };

  it("invites a new patient with a new patient record and refreshes the pending list", async () => {
    let created = false;
    const { calls } = mockApi({
      "GET /api/invitations": () => (created ? [pending] : []),
      "POST /api/invitations": () => {
        created = true;
        return { ...pending, email: "ivo@home.test", role: "patient", emailSent: true };
      },
    });
    renderAtRoute(<InvitationsPage />);
    expect(await screen.findByText("No pending invitations")).toBeTruthy();
    await userEvent.type(screen.getByLabelText("E-mail"), "ivo@home.test");
    await userEvent.type(screen.getByLabelText("Display name"), "Ivo Marchetti");
    await userEvent.selectOptions(screen.getByLabelText("Role"), "patient");
    await userEvent.type(screen.getByLabelText("Year of birth"), "1961");
    await userEvent.selectOptions(screen.getByLabelText("Sex"), "male");
    await userEvent.selectOptions(screen.getByLabelText("Condition"), "stroke");
    await userEvent.click(screen.getByRole("button", { name: "Send invitation" }));
    expect(await screen.findByText(/Invitation created for ivo@home.test/)).toBeTruthy();
    const body = calls.find((c) => c.method === "POST")?.body as { patient: Record<string, unknown> };
    expect(body).toMatchObject({ email: "ivo@home.test", role: "patient", patient: { birthYear: 1961, sex: "male", condition: "stroke", researchConsent: false } });
    expect(await screen.findByText("Tamsin Oakridge")).toBeTruthy();
    expect(within(screen.getByRole("table")).getByText("Pending")).toBeTruthy();
  });

  it("shows field errors instead of sending an incomplete invitation", async () => {
    const { calls } = mockApi({ "GET /api/invitations": [] });
    renderAtRoute(<InvitationsPage />);
    await userEvent.click(screen.getByRole("button", { name: "Send invitation" }));
    expect(screen.getByText("enter a valid e-mail address")).toBeTruthy();
    expect(screen.getByText("choose a role")).toBeTruthy();
    expect(calls.filter((c) => c.method === "POST")).toHaveLength(0);
  });

  it("shows an error state when the list fails", async () => {
    mockApi({ "GET /api/invitations": apiError(403, "forbidden", "nope") });
    renderAtRoute(<InvitationsPage />);
    expect((await screen.findByRole("alert")).textContent).toContain("does not have access");
  });
});
