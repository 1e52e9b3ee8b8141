import { afterEach, describe, expect, it, vi } from "vitest";
import { screen, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { apiError, mockApi, renderAtRoute } from "@/testing/feature-test-kit";
import { AuditLogPage } from "../components/audit-log-page";
import { auditFilterSchema, toAuditQuery } from "../api/audit-events";

const event = (n: number) => ({
  id: String(n),
  at: "2026-11-30T08:00:00.000Z",
  actorId: null,
  actorRole: "admin",
  actorEmail: "admin@demo.pendula.test",
  action: "auth.login",
  resourceType: "user",
  resourceId: null,
  patientId: null,
  ip: "127.0.0.1",
  userAgent: null,
  details: { outcome: "ok" },
  withheld: [] as string[],
});

afterEach(() => vi.unstubAllGlobals());

describe("toAuditQuery", () => {
  it("makes the last day inclusive by ending at the next local midnight", () => {
    const q = toAuditQuery(auditFilterSchema.parse({ action: "", actorId: "", patientId: "", fromDay: "2026-11-03", toDay: "2026-11-05" }), 0);
    expect(q.from).toBe(new Date("2026-11-03T00:00:00").toISOString());
    expect(q.to).toBe(new Date("2026-11-06T00:00:00").toISOString());
  });
});

describe("AuditLogPage", () => {
  it("filters by action prefix and pages with the server's total", async () => {
    const { calls } = mockApi({
      "GET /api/audit": ({ search }: { search: URLSearchParams }) => ({
        items: [event(Number(search.get("offset")) + 1)],
        total: 120,
        limit: 50,
        offset: Number(search.get("offset")),
      }),
    });
    renderAtRoute(<AuditLogPage />);
    const table = await screen.findByRole("table");
    expect(within(table).getByText("auth.login")).toBeTruthy();
    expect(within(table).getByText("outcome: ok")).toBeTruthy();
    expect(screen.getByText("Page 1 of 3")).toBeTruthy();
    await userEvent.type(screen.getByLabelText("Action"), "auth.");
    await userEvent.click(screen.getByRole("button", { name: "Apply filters" }));
    await vi.waitFor(() => expect(calls.at(-1)?.search.get("action")).toBe("auth."));
    await userEvent.click(screen.getByRole("button", { name: "Older →" }));
    await vi.waitFor(() => expect(calls.at(-1)?.search.get("offset")).toBe("50"));
    expect(calls.at(-1)?.search.get("action")).toBe("auth.");
    expect(await screen.findByText("Page 2 of 3")).toBeTruthy();
  });

  it("rejects a malformed filter without asking the server", async () => {
    const { calls } = mockApi({ "GET /api/audit": { items: [], total: 0, limit: 50, offset: 0 } });
    renderAtRoute(<AuditLogPage />);
    expect(await screen.findByText("No events match these filters")).toBeTruthy();
    await userEvent.type(screen.getByLabelText("Actor id"), "not-a-uuid");
    await userEvent.click(screen.getByRole("button", { name: "Apply filters" }));
    expect(screen.getByText("an actor id is a UUID")).toBeTruthy();
    expect(calls).toHaveLength(1);
  });

  it("says what it leaves out: a patient's address and clinical details", async () => {
    mockApi({
      "GET /api/audit": {
        items: [
          { ...event(1), actorRole: "patient", ip: null, withheld: ["ip", "userAgent"] },
          { ...event(2), actorRole: "clinician", action: "training.create", details: null, withheld: ["details"] },
        ],
        total: 2,
        limit: 50,
        offset: 0,
      },
    });
    renderAtRoute(<AuditLogPage />);
    const table = await screen.findByRole("table");
    expect(within(table).getByText("not shown (patient)")).toBeTruthy();
    expect(within(table).getByText("clinical details not shown")).toBeTruthy();
    const [patientRow, clinicianRow] = within(table).getAllByRole("row").slice(1);
    expect(patientRow!.textContent).not.toContain("127.0.0.1");
    expect(clinicianRow!.textContent).toContain("127.0.0.1");
  });

  it("refuses an answer that carries a patient's address instead of showing it", async () => {
    mockApi({ "GET /api/audit": { items: [{ ...event(1), actorRole: "patient", ip: "198.51.100.7" }], total: 1, limit: 50, offset: 0 } });
    renderAtRoute(<AuditLogPage />);
    expect(await screen.findByText("The audit log could not be loaded")).toBeTruthy();
    expect(screen.queryByText("198.51.100.7")).toBeNull();
  });

  it("shows the error state", async () => {
    mockApi({ "GET /api/audit": apiError(500, "internal", "audit store offline") });
    renderAtRoute(<AuditLogPage />);
    expect((await screen.findByRole("alert")).textContent).toContain("audit store offline");
  });
});
