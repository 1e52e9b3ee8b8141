import { beforeAll, describe, expect, it } from "vitest";
import { saveScreenshot, settle } from "./support/browser";
import { useSignedInPage } from "./support/signed-in-page";
import { tabTo } from "./support/keyboard";
import { apiGet, apiToken } from "./support/sign-in";

const t = useSignedInPage("admin");

interface Assignment {
  patientId: string;
  patientLabel: string;
  placement: string;
  from: string;
  to: string | null;
}
interface Device {
  id: string;
  serial: string;
  status: string;
  assignment: Assignment | null;
}
interface Patient {
  id: string;
  displayName: string;
}

// Placements the seed does not use for the weekly four-sensor test, so spares can go there.
const EXTRA_PLACEMENTS = [
  { value: "lower_back", label: "Lower back" },
  { value: "left_foot", label: "Left foot" },
  { value: "right_foot", label: "Right foot" },
];

const MINUTE = 60_000;
/** `<input type="datetime-local">` value in the browser's zone (the context runs in UTC). */
function localInput(date: Date): string {
  return date.toISOString().slice(0, 16);
}

let spares: Device[];
let patient: Patient;
let placement: { value: string; label: string };
let swapTo: { value: string; label: string };
// The scenario starts ten minutes ago, or just after the spare's own last assignment when an earlier
// run used it more recently (one device, one body at a time), and runs assign → swap → end a
// minute apart. A re-run against the same database then still finds room.
const t0 = Date.now();
let assignedAt: Date;
let swappedAt: Date;
let endedAt: Date;

beforeAll(async () => {
  const token = await apiToken("admin");
  const devices = await apiGet<Device[]>("/api/devices", token);
  const patients = (await apiGet<{ items: Patient[] }>("/api/patients", token)).items;
  spares = devices.filter((d) => d.status === "in_stock" && d.assignment === null).sort((a, b) => a.serial.localeCompare(b.serial));
  // Earlier runs used spare devices on the extra placements; read their histories to stay clear.
  const busy = new Set<string>();
  const extra = new Set(EXTRA_PLACEMENTS.map((p) => p.value));
  for (const d of devices) {
    if (d.status !== "in_stock" && !(d.assignment && extra.has(d.assignment.placement))) continue;
    for (const a of await apiGet<Assignment[]>(`/api/devices/${d.id}/assignments`, token)) {
      if (a.to === null || Date.parse(a.to) > t0 - 20 * MINUTE) busy.add(`${a.patientId}|${a.placement}`);
    }
  }
  const found = patients
    .map((p) => ({ p, free: EXTRA_PLACEMENTS.filter((pl) => !busy.has(`${p.id}|${pl.value}`)) }))
    .find((c) => c.free.length >= 2);
  if (!found) throw new Error("no patient with two free extra placements left for the assignment test");
  const ownHistory = await apiGet<Assignment[]>(`/api/devices/${spares[0]!.id}/assignments`, token);
  const lastEnd = Math.max(0, ...ownHistory.map((a) => Date.parse(a.to ?? new Date(t0).toISOString())));
  const base = Math.ceil(Math.max(t0 - 10 * MINUTE, lastEnd + MINUTE) / MINUTE) * MINUTE;
  assignedAt = new Date(base);
  swappedAt = new Date(base + MINUTE);
  endedAt = new Date(base + 2 * MINUTE);
  patient = found.p;
  placement = found.free[0]!;
  swapTo = found.free[1]!;
});

describe("an admin manages devices and their assignments", () => {
  it("lists the inventory with every device's status in words", async () => {
    expect(spares.length).toBeGreaterThanOrEqual(2);
    const { page } = t;
    await page.goto("/admin/devices");
    const table = page.getByRole("table");
    await table.waitFor();
    await page.getByRole("link", { name: spares[0]!.serial }).waitFor();
    expect(await table.getByText("In stock").count()).toBeGreaterThanOrEqual(2);
    expect(await table.getByText("Assigned").count()).toBeGreaterThan(0);
    await saveScreenshot(page, "admin-device-inventory");
    // The status filter buttons work from the keyboard and show where the focus is.
    const focus = await tabTo(page, /^\d+ in stock/);
    expect(focus.outlineStyle).not.toBe("none");
    await page.keyboard.press("Enter");
    await page.getByText(`Showing ${spares.length} of`).waitFor();
    await saveScreenshot(page, "admin-device-spares");
  });

  it("assigns a spare device to a patient's placement and shows it on the timeline", async () => {
    const { page } = t;
    const spare = spares[0]!;
    await page.getByRole("link", { name: spare.serial }).click();
    await page.waitForURL(`**/admin/devices/${spare.id}`);
    const form = page.getByRole("form", { name: `Assign ${spare.serial}` });
    await form.waitFor();
    await form.getByLabel("Patient").selectOption({ label: patient.displayName });
    await form.getByLabel("Placement").selectOption(placement.value);
    await form.getByLabel("From").fill(localInput(assignedAt));
    await form.getByRole("button", { name: "Assign device" }).click();
    await page.getByText(/Worn now by/).waitFor();
    expect(await page.getByText(/Worn now by/).textContent()).toContain(patient.displayName);
    await page.getByRole("img", { name: new RegExp(`Assignment timeline: .*${placement.label}`) }).waitFor();
    await settle(page);
    await saveScreenshot(page, "admin-device-assigned");

    const after = await apiGet<Device[]>("/api/devices", await apiToken("admin"));
    expect(after.find((d) => d.id === spare.id)?.assignment).toMatchObject({ patientId: patient.id, placement: placement.value });
  });

  it("shows the server's overlap refusal when a second device is put on the same placement", async () => {
    const { page } = t;
    const second = spares[1]!;
    await page.goto(`/admin/devices/${second.id}`);
    const form = page.getByRole("form", { name: `Assign ${second.serial}` });
    await form.waitFor();
    await form.getByLabel("Patient").selectOption({ label: patient.displayName });
    await form.getByLabel("Placement").selectOption(placement.value);
    await form.getByRole("button", { name: "Assign device" }).click();
    const alert = form.getByRole("alert").filter({ hasText: "Refused" });
    await alert.waitFor();
    // The server's own words (assignments.service overlapConflict) name whose placement is taken.
    expect(await alert.textContent()).toContain(patient.displayName);
    await saveScreenshot(page, "admin-device-overlap-refused");
    const still = await apiGet<Device[]>("/api/devices", await apiToken("admin"));
    expect(still.find((d) => d.id === second.id)?.assignment).toBeNull();
  });

  it("swaps the first device to another placement of the same patient at one instant", async () => {
    const { page } = t;
    const spare = spares[0]!;
    await page.goto(`/admin/devices/${spare.id}`);
    const swap = page.getByRole("form", { name: "Swap placement" });
    await swap.waitFor();
    await swap.getByLabel("New placement").selectOption(swapTo.value);
    await swap.getByLabel("Swap at").fill(localInput(swappedAt));
    await swap.getByRole("button", { name: "Swap placement" }).click();
    await page.getByText(`Now worn on the ${swapTo.label.toLowerCase()} from`).waitFor();
    const history = (await apiGet<Assignment[]>(`/api/devices/${spare.id}/assignments`, await apiToken("admin")))
      .filter((a) => a.patientId === patient.id && Date.parse(a.from) >= assignedAt.getTime())
      .sort((a, b) => a.from.localeCompare(b.from));
    expect(history.map((a) => a.placement)).toEqual([placement.value, swapTo.value]);
    const [ended, running] = history as [Assignment, Assignment];
    expect(running.to).toBeNull();
    // No gap and no overlap: the old assignment ends exactly where the new one starts.
    expect(Date.parse(ended.to ?? "")).toBe(Date.parse(running.from));
    expect(Date.parse(running.from)).toBe(swappedAt.getTime());
    await page.getByRole("table").locator("tbody tr").nth(1).waitFor();
    await settle(page);
    await saveScreenshot(page, "admin-device-swapped");
  });

  it("ends the running assignment", async () => {
    const { page } = t;
    const spare = spares[0]!;
    const end = page.getByRole("form", { name: "End the current assignment" });
    await end.getByLabel("Ends at").fill(localInput(endedAt));
    await end.getByRole("button", { name: "End assignment" }).click();
    await page.getByText(/assignment ended at/).waitFor();
    const history = await apiGet<Assignment[]>(`/api/devices/${spare.id}/assignments`, await apiToken("admin"));
    expect(history.every((a) => a.to !== null)).toBe(true);
    expect(history.some((a) => a.placement === swapTo.value && Date.parse(a.to!) === endedAt.getTime())).toBe(true);
    await settle(page);
    await saveScreenshot(page, "admin-device-ended");
  });
});
