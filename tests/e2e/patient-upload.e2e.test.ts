import { mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { synthesizeSession, type SynthPlacement } from "@pendula/signal";
import { saveScreenshot, settle } from "./support/browser";
import { useSignedInPage } from "./support/signed-in-page";
import { apiGet, apiToken } from "./support/sign-in";

const t = useSignedInPage("patient");

interface Device {
  serial: string;
  assignment: { patientLabel: string; placement: string; to: string | null } | null;
}

const WEEKLY: SynthPlacement[] = ["left_shank", "right_shank", "left_wrist", "right_wrist"];
// The demo patient of patient@demo.pendula.test (db/seeds/demo-scenario.ts).
const DEMO_PATIENT_NAME = "Wren Halloway";

let folder: string;
let filePaths: string[];

beforeAll(async () => {
  // The files name the devices the seed put on this patient; the admin API is where serials live.
  const devices = await apiGet<Device[]>("/api/devices", await apiToken("admin"));
  const serials: Partial<Record<SynthPlacement, string>> = {};
  for (const d of devices) {
    const a = d.assignment;
    if (a && a.patientLabel === DEMO_PATIENT_NAME && WEEKLY.includes(a.placement as SynthPlacement)) {
      serials[a.placement as SynthPlacement] = d.serial;
    }
  }
  expect(Object.keys(serials).sort()).toEqual([...WEEKLY].sort());
  // Two hours ago: inside the running assignments, and a seed unique to this run so the
  // upload is a new session rather than a duplicate of an earlier run's.
  const session = synthesizeSession({
    seed: Date.now() % 2_147_483_647,
    durationS: 90,
    startUtc: new Date(Date.now() - 2 * 3600_000).toISOString(),
    placements: WEEKLY,
    deviceSerials: serials,
  });
  folder = await mkdtemp(join(tmpdir(), "pendula-e2e-walk-"));
  filePaths = [];
  for (const f of session.files) {
    const p = join(folder, f.fileName);
    await writeFile(p, f.text, "utf8");
    filePaths.push(p);
  }
});
afterAll(async () => {
  if (folder) await rm(folder, { recursive: true, force: true });
});

describe("a patient does this week's walking test at home", () => {
  it("must tick the safety checklist before adding files", async () => {
    const { page } = t;
    await page.goto("/patient");
    await page.getByRole("button", { name: /I'm ready/ }).click();
    await page.getByText(/not ticked yet/).waitFor();
    await saveScreenshot(page, "patient-safety-checklist");
    for (const box of await page.getByRole("checkbox").all()) await box.check();
    await page.getByRole("button", { name: /I'm ready/ }).click();
    await page.getByRole("heading", { name: /Add your sensor files/ }).waitFor();
  });

  it("sees the in-browser check of the files before sending", async () => {
    const { page } = t;
    await page.locator('input[type="file"]').setInputFiles(filePaths);
    const summary = page.locator("section", { has: page.getByRole("heading", { name: /check|recording/i }) }).first();
    await page.getByText("Files recognised").waitFor({ timeout: 60_000 });
    expect(await page.getByText(`4 of 4`).count()).toBeGreaterThan(0);
    await summary.waitFor();
    await saveScreenshot(page, "patient-precheck");
  });

  it("sends the files and sees the session processed", async () => {
    const { page } = t;
    await page.getByRole("button", { name: /Send to my care team|Send anyway/ }).click();
    await page.getByText(/This week's walk has been measured|already sent these same files/).waitFor({ timeout: 90_000 });
    await page.getByText(/has been measured/).waitFor({ timeout: 90_000 });
    await saveScreenshot(page, "patient-upload-processed");
  });

  it("sees plain-language progress over the weeks", async () => {
    const { page } = t;
    await page.getByRole("link", { name: /See your progress/ }).click();
    await page.waitForURL(/\/patient\/progress/);
    await page.getByRole("heading", { level: 1 }).waitFor();
    await settle(page);
    await saveScreenshot(page, "patient-progress");
  });
});
