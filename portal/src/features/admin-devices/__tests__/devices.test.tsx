import { afterEach, describe, expect, it, vi } from "vitest";
import { screen, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { apiError, mockApi, renderAtRoute } from "@/testing/feature-test-kit";
import { assignmentFixture, deviceFixture, patientIdentityFixture } from "@/testing/contract-fixtures";
import { DeviceInventoryPage } from "../components/device-inventory-page";
import { DevicePage } from "../components/device-page";
import { assignDeviceInputSchema } from "../api/assign-device";

const PATIENT = "7d1c2a3b-0000-4000-8000-000000000001";
const WORN_ID = "d0000000-0000-4000-8000-000000000001";
const open = assignmentFixture({
  id: "a0000000-0000-4000-8000-000000000001",
  deviceId: WORN_ID,
  patientId: PATIENT,
  patientLabel: "Wren Halloway",
  placement: "left_shank",
  from: "2026-09-01T08:00:00.000Z",
  to: null,
});
/** The device list carries the running assignment without its device id. */
const current = ({ deviceId: _deviceId, ...a }: typeof open) => a;
const devices = [
  deviceFixture({ id: WORN_ID, serial: "PND-S-0142", kind: "imu6", status: "assigned", firmware: "2.4.1", assignment: current(open) }),
  deviceFixture({ id: "d0000000-0000-4000-8000-000000000002", serial: "PND-S-0007", kind: "imu9", status: "in_stock", firmware: "2.3.0" }),
  deviceFixture({ id: "d0000000-0000-4000-8000-000000000003", serial: "PND-S-0099", kind: "imu6", status: "retired", firmware: "1.9.0" }),
];
const spare = devices[1]!;
const worn = devices[0]!;
const patients = { items: [patientIdentityFixture({ id: PATIENT, displayName: "Wren Halloway", researchId: "r1", enrolledOn: "2026-08-01", researchConsent: true })] };

afterEach(() => vi.unstubAllGlobals());

describe("DeviceInventoryPage", () => {
  it("lists devices by serial with status in words and the current assignment", async () => {
    mockApi({ "GET /api/devices": devices });
    renderAtRoute(<DeviceInventoryPage />);
    const table = await screen.findByRole("table");
    const rows = within(table).getAllByRole("row").slice(1);
    expect(rows.map((r) => within(r).getAllByRole("cell")[0]!.textContent)).toEqual(["PND-S-0007", "PND-S-0099", "PND-S-0142"]);
    expect(within(rows[2]!).getByText("Assigned")).toBeTruthy();
    expect(rows[2]!.textContent).toContain("Wren Halloway");
    expect(rows[2]!.textContent).toContain("Left shank");
    expect(within(rows[0]!).getByText("Not assigned")).toBeTruthy();
    expect(within(rows[0]!).getByRole("link", { name: "PND-S-0007" }).getAttribute("href")).toBe(`/admin/devices/${spare.id}`);
  });

  it("filters by status and search text", async () => {
    mockApi({ "GET /api/devices": devices });
    renderAtRoute(<DeviceInventoryPage />);
    await screen.findByRole("table");
    await userEvent.selectOptions(screen.getByLabelText("Status"), "in_stock");
    expect(screen.getByText("Showing 1 of 3 devices.")).toBeTruthy();
    await userEvent.selectOptions(screen.getByLabelText("Status"), "");
    await userEvent.type(screen.getByLabelText("Search"), "halloway");
    expect(screen.getAllByRole("row")).toHaveLength(2);
    await userEvent.click(screen.getByRole("button", { name: "1 retired" }));
    expect(screen.getByRole("button", { name: "1 retired" }).getAttribute("aria-pressed")).toBe("true");
    expect(screen.getByText("No device matches these filters")).toBeTruthy();
    await userEvent.click(screen.getByRole("button", { name: "1 retired" }));
    await userEvent.type(screen.getByLabelText("Search"), "zzz");
    expect(screen.getByText("No device matches these filters")).toBeTruthy();
  });

  it("shows an empty inventory and a failed load differently", async () => {
    mockApi({ "GET /api/devices": [] });
    const first = renderAtRoute(<DeviceInventoryPage />);
    expect(await screen.findByText("No devices registered yet")).toBeTruthy();
    first.unmount();
    mockApi({ "GET /api/devices": apiError(500, "internal", "database unavailable") });
    renderAtRoute(<DeviceInventoryPage />);
    expect((await screen.findByRole("alert")).textContent).toContain("database unavailable");
  });
});

describe("assignDeviceInputSchema", () => {
  it("turns the local start time into an ISO instant", () => {
    const parsed = assignDeviceInputSchema.parse({ patientId: PATIENT, placement: "right_wrist", from: "2026-11-30T09:15" });
    expect(parsed.from).toBe(new Date("2026-11-30T09:15").toISOString());
  });
  it("rejects an unknown placement", () => {
    expect(assignDeviceInputSchema.safeParse({ patientId: PATIENT, placement: "left_ear", from: "2026-11-30T09:15" }).success).toBe(false);
  });
});

describe("DevicePage", () => {
  const route = { path: "/admin/devices/:deviceId" };

  it("assigns a spare device and sends patient, placement and start", async () => {
    const { calls } = mockApi({
      "GET /api/devices": devices,
      "GET /api/patients": patients,
      [`GET /api/devices/${spare.id}/assignments`]: [],
      [`POST /api/devices/${spare.id}/assignments`]: ({ body }: { body: unknown }) =>
        assignmentFixture({
          ...(body as { patientId: string; placement: "right_wrist"; from: string }),
          id: "a0000000-0000-4000-8000-000000000009",
          deviceId: spare.id,
          patientLabel: "Wren Halloway",
          to: null,
        }),
    });
    renderAtRoute(<DevicePage />, { ...route, url: `/admin/devices/${spare.id}` });
    expect(await screen.findByText("Never assigned")).toBeTruthy();
    await screen.findByRole("option", { name: "Wren Halloway" });
    await userEvent.selectOptions(screen.getByLabelText("Patient"), PATIENT);
    await userEvent.selectOptions(screen.getByLabelText("Placement"), "right_wrist");
    const from = screen.getByLabelText("From");
    await userEvent.clear(from);
    await userEvent.type(from, "2026-11-30T09:15");
    await userEvent.click(screen.getByRole("button", { name: "Assign device" }));
    await vi.waitFor(() => expect(calls.some((c) => c.method === "POST")).toBe(true));
    const post = calls.find((c) => c.method === "POST");
    expect(post?.body).toEqual({ patientId: PATIENT, placement: "right_wrist", from: new Date("2026-11-30T09:15").toISOString() });
  });

  it("shows the server's 409 overlap message word for word", async () => {
    mockApi({
      "GET /api/devices": devices,
      "GET /api/patients": patients,
      [`GET /api/devices/${spare.id}/assignments`]: [],
      [`POST /api/devices/${spare.id}/assignments`]: apiError(
        409,
        "assignment_overlap",
        "Wren Halloway already wears PND-S-0142 on the left shank from 2026-09-01",
      ),
    });
    renderAtRoute(<DevicePage />, { ...route, url: `/admin/devices/${spare.id}` });
    await screen.findByRole("option", { name: "Wren Halloway" });
    await userEvent.selectOptions(screen.getByLabelText("Patient"), PATIENT);
    await userEvent.selectOptions(screen.getByLabelText("Placement"), "left_shank");
    await userEvent.click(screen.getByRole("button", { name: "Assign device" }));
    const alert = await screen.findByRole("alert");
    expect(alert.textContent).toContain("Refused: this would overlap another assignment.");
    expect(alert.textContent).toContain("Wren Halloway already wears PND-S-0142 on the left shank from 2026-09-01");
  });

  it("validates before sending anything", async () => {
    const { calls } = mockApi({ "GET /api/devices": devices, "GET /api/patients": patients, [`GET /api/devices/${spare.id}/assignments`]: [] });
    renderAtRoute(<DevicePage />, { ...route, url: `/admin/devices/${spare.id}` });
    await userEvent.click(await screen.findByRole("button", { name: "Assign device" }));
    expect(screen.getByText("choose a patient")).toBeTruthy();
    expect(screen.getByText("choose a placement")).toBeTruthy();
    expect(calls.filter((c) => c.method !== "GET")).toHaveLength(0);
  });

  it("draws the history and offers swap and end for a running assignment", async () => {
    const history = [
      { ...open, id: "a0000000-0000-4000-8000-000000000000", placement: "right_wrist" as const, from: "2026-06-01T08:00:00.000Z", to: "2026-09-01T08:00:00.000Z" },
      open,
    ];
    const swapped = { ...open, id: "a0000000-0000-4000-8000-000000000005", placement: "right_shank" as const, from: "2026-11-30T09:00:00.000Z" };
    let done = false;
    // After the swap the refetched lists carry the new assignment, so the forms are replaced;
    // the confirmation must survive that.
    const { calls } = mockApi({
      "GET /api/devices": () => (done ? devices.map((d) => (d.id === worn.id ? { ...d, assignment: current(swapped) } : d)) : devices),
      "GET /api/patients": patients,
      [`GET /api/devices/${worn.id}/assignments`]: () => (done ? [...history.slice(0, 1), { ...open, to: swapped.from }, swapped] : history),
      [`POST /api/devices/${worn.id}/assignments/${open.id}/swap`]: () => {
        done = true;
        return { ended: { ...open, to: swapped.from }, started: swapped };
      },
    });
    renderAtRoute(<DevicePage />, { ...route, url: `/admin/devices/${worn.id}` });
    const figure = await screen.findByRole("img", { name: /Assignment timeline/ });
    expect(figure.getAttribute("aria-label")).toContain("Wren Halloway · Right wrist from 2026-06-01 to 2026-09-01");
    expect(figure.textContent).toContain("ongoing");
    const rows = within(screen.getByRole("table")).getAllByRole("row");
    expect(rows).toHaveLength(3);
    expect(rows[2]!.textContent).toContain("ongoing");

    const swap = screen.getByRole("form", { name: "Swap placement" });
    // The current placement is not offered as the new one.
    expect(within(swap).queryByRole("option", { name: "Left shank" })).toBeNull();
    await userEvent.selectOptions(within(swap).getByLabelText("New placement"), "right_shank");
    await userEvent.click(within(swap).getByRole("button", { name: "Swap placement" }));
    expect(await screen.findByText(/Now worn on the right shank from/)).toBeTruthy();
    await vi.waitFor(() => expect(within(screen.getByRole("table")).getAllByRole("row")).toHaveLength(4));
    expect(screen.getByText(/Now worn on the right shank from/)).toBeTruthy();
    expect(calls.find((c) => c.path.endsWith("/swap"))?.body).toMatchObject({ placement: "right_shank" });
    expect(screen.getByRole("form", { name: "End the current assignment" })).toBeTruthy();
  });

  it("says so when the device does not exist", async () => {
    mockApi({ "GET /api/devices": devices, "GET /api/devices/nope/assignments": apiError(404, "not_found", "no device") });
    renderAtRoute(<DevicePage />, { ...route, url: "/admin/devices/nope" });
    expect(await screen.findByText("No such device")).toBeTruthy();
  });
});
