import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { launchBrowser, openPage, saveScreenshot, settle, type TestPage } from "./support/browser";
import { apiGet, apiToken, signIn } from "./support/sign-in";

interface Device {
  id: string;
  serial: string;
  status: string;
  assignment: { patientId: string; patientLabel: string; placement: string } | null;
}
interface Patient {
  id: string;
  displayName: string;
}

// Placements the seed does not use for the weekly four-sensor test, so a spare can go there.
const EXTRA_PLACEMENTS = [
  { value: "lower_back", label: "Lower back" },
  { value: "left_foot", label: "Left foot" },
  { value: "right_foot", label: "Right foot" },
];

let browser: Browser;
let t: TestPage;
let spares: Device[];
let target: { patient: Patient; placement: { value: string; label: string } };

beforeAll(async () => {
  const token = await apiToken("admin");
  const devices = await apiGet<Device[]>("/api/devices", token);
  const patients = (await apiGet<{ items: Patient[] }>("/api/patients", token)).items;
  spares = devices.filter((d) => d.status === "in_stock" && d.assignment === null).sort((a, b) => a.serial.localeCompare(b.serial));
  // Re-runs against the same database must not trip over their own earlier assignments.
  const taken = new Set(devices.flatMap((d) => (d.assignment ? [`${d.assignment.patientId}|${d.assignment.placement}`] : [])));
  const free = patients
    .flatMap((patient) => EXTRA_PLACEMENTS.map((placement) => ({ patient, placement })))
    .find(({ patient, placement }) => !taken.has(`${patient.id}|${placement.value}`));
  if (!free) throw new Error("no free patient × placement left for the assignment test");
  target = free;
  browser = await launchBrowser();
  t = await openPage(browser);
  await signIn(t.page, "admin");
});
afterAll(async () => {
  await t?.context.close();
  await browser?.close();
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
    await page.getByRole("button", { name: /^\d+ in stock/ }).click();
    await page.getByText(`Showing ${spares.length} of`).waitFor();
    await saveScreenshot(page, "admin-device-spares");
  });

  it("assigns a spare device to a patient's placement and shows it on the timeline", async () => {
    const { page } = t;
    const spare = spares[0]!;
    await page.getByRole("link", { name: spare.serial }).click();
    await page.waitForURL(`**/admin/devices/${spare.id}`);
    await page.getByText("Never assigned").or(page.getByRole("img", { name: /Assignment timeline/ })).first().waitFor();
    await page.getByLabel("Patient").selectOption({ label: target.patient.displayName });
    await page.getByLabel("Placement").selectOption(target.placement.value);
    await page.getByRole("button", { name: "Assign device" }).click();
    await page.getByText(/Worn now by/).waitFor();
    expect(await page.getByText(/Worn now by/).textContent()).toContain(target.patient.displayName);
    await page.getByRole("img", { name: new RegExp(`Assignment timeline: .*${target.placement.label}`) }).waitFor();
    await settle(page);
    await saveScreenshot(page, "admin-device-assigned");

    const token = await apiToken("admin");
    const after = await apiGet<Device[]>("/api/devices", token);
    const assigned = after.find((d) => d.id === spare.id);
    expect(assigned?.assignment).toMatchObject({ patientId: target.patient.id, placement: target.placement.value });
  });

  it("shows the server's overlap refusal when a second device is put on the same placement", async () => {
    const { page } = t;
    const second = spares[1]!;
    await page.goto(`/admin/devices/${second.id}`);
    await page.getByRole("button", { name: "Assign device" }).waitFor();
    await page.getByLabel("Patient").selectOption({ label: target.patient.displayName });
    await page.getByLabel("Placement").selectOption(target.placement.value);
    await page.getByRole("button", { name: "Assign device" }).click();
    const alert = page.getByRole("alert").filter({ hasText: "Refused" });
    await alert.waitFor();
    // The server's own words (assignments.service overlapConflict) name whose placement is taken.
    expect(await alert.textContent()).toContain(target.patient.displayName);
    await saveScreenshot(page, "admin-device-overlap-refused");
  });

  it("swaps the first device to another placement at the same instant", async () => {
    const { page } = t;
    const spare = spares[0]!;
    await page.goto(`/admin/devices/${spare.id}`);
    const swap = page.getByRole("form", { name: "Swap placement" });
    await swap.waitFor();
    const options = await swap.getByLabel("New placement").locator("option").evaluateAll((els) =>
      els.map((e) => (e as unknown as { value: string }).value).filter(Boolean),
    );
    const token = await apiToken("admin");
    const devices = await apiGet<Device[]>("/api/devices", token);
    const taken = new Set(devices.flatMap((d) => (d.assignment?.patientId === target.patient.id ? [d.assignment.placement] : [])));
    const next = options.find((o) => !taken.has(o));
    expect(next).toBeDefined();
    // A swap must be later than the start of the running assignment, which began "now" a moment ago.
    const later = new Date(Date.now() + 2 * 60_000);
    const pad = (n: number) => String(n).padStart(2, "0");
    const local = `${later.getFullYear()}-${pad(later.getMonth() + 1)}-${pad(later.getDate())}T${pad(later.getHours())}:${pad(later.getMinutes())}`;
    await swap.getByLabel("New placement").selectOption(next!);
    await swap.getByLabel("Swap at").fill(local);
    await swap.getByRole("button", { name: "Swap placement" }).click();
    await page.getByRole("table").locator("tbody tr").nth(1).waitFor();
    const history = await apiGet<Array<{ placement: string; to: string | null }>>(`/api/devices/${spare.id}/assignments`, token);
    expect(history).toHaveLength(2);
    expect(history.filter((a) => a.to === null).map((a) => a.placement)).toEqual([next]);
    await saveScreenshot(page, "admin-device-swapped");
  });
});
