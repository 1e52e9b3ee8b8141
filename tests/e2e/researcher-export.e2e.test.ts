import { readFile } from "node:fs/promises";
import { describe, expect, it } from "vitest";
import { saveScreenshot } from "./support/browser";
import { useSignedInPage } from "./support/signed-in-page";
import { tabTo } from "./support/keyboard";
import { apiGet, apiToken } from "./support/sign-in";

const t = useSignedInPage("researcher");


describe("a researcher previews a cohort and downloads the anonymised export", () => {
  it("previews group sizes with small groups suppressed in words", async () => {
    const { page } = t;
    await page.goto("/research");
    await page.getByRole("heading", { name: "Cohort builder" }).waitFor();
    // All conditions, all bands, the whole study period.
    for (const label of ["Incomplete spinal cord injury", "Stroke", "Parkinson's disease", "Other condition"]) {
      await page.getByRole("checkbox", { name: label }).check();
    }
    await page.getByRole("button", { name: "Select all bands" }).click();
    await page.getByLabel("To week").fill("200");
    // Keyboard only from here: reach the button with Tab, see its focus ring, press Enter.
    await page.getByRole("button", { name: "Select all bands" }).focus();
    const focus = await tabTo(page, /^Preview cohort$/);
    expect(focus.outlineStyle).not.toBe("none");
    expect(parseFloat(focus.outlineWidth)).toBeGreaterThanOrEqual(2);
    await page.keyboard.press("Enter");
    const table = page.getByRole("table", { name: /Subjects and sessions/ });
    await table.waitFor();
    // The seed clusters ages so some cells reach k = 5 and leaves a few below it (db/seeds/demo-scenario.ts).
    const withheld = table.locator("tbody tr").filter({ hasText: "suppressed group (n < 5)" });
    expect(await withheld.count()).toBeGreaterThan(0);
    // A withheld group names neither its condition nor its age band.
    for (const text of await withheld.allTextContents()) expect(text).not.toMatch(/Stroke|Parkinson|spinal|Other|\d+-\d+|90\+/);
    const published = table.locator("tbody tr").filter({ hasNotText: "suppressed" });
    expect(await published.count()).toBeGreaterThan(0);
    await saveScreenshot(page, "researcher-cohort-preview");
  });

  it("creates a research project, and the export waits for one", async () => {
    const { page } = t;
    expect(await page.getByRole("button", { name: "Download CSV" }).isDisabled()).toBe(true);
    const select = page.getByLabel("Export under project");
    if (!(await select.count())) {
      await page.getByLabel("Project name").fill("Fernhollow recovery audit");
    } else {
      await page.getByRole("button", { name: "New project" }).click();
      await page.getByLabel("Project name").fill(`Fernhollow recovery audit ${Date.now()}`);
    }
    await page.getByLabel("Purpose (optional)").fill("Cadence and coordination over the first months of home testing");
    await page.getByRole("button", { name: "Create project" }).click();
    await page.getByLabel("Export under project").waitFor();
    expect(await page.getByLabel("Export under project").inputValue()).not.toBe("");
    await page.getByText("How precisely each value is exported").click();
    await page.getByRole("table", { name: "Export precision per metric" }).getByText("0.05 m/s").first().waitFor();
    await saveScreenshot(page, "researcher-project-and-precision");
  });

  it("downloads a CSV with pseudonymous ids, week blocks and rounded values, and no names, e-mails or serials", async () => {
    const { page } = t;
    const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("button", { name: "Download CSV" }).click()]);
    expect(download.suggestedFilename()).toMatch(/\.csv$/);
    const path = await download.path();
    const csv = await readFile(path, "utf8");
    const [header, ...rows] = csv.trim().split(/\r?\n/);
    expect(header).toBeDefined();
    expect(rows.length).toBeGreaterThan(0);
    expect(header!.split(",")).toContain("weeks_since_enrolment_block");
    const cols = header!.split(",");
    const cadence = cols.indexOf("cadenceStepsPerMin");
    const week = cols.indexOf("weeks_since_enrolment_block");
    for (const row of rows) {
      const cells = row.split(",");
      // Cadence to whole steps/min and weeks in 4-week blocks (research/export-precision.ts, safe-harbor.ts).
      if (cadence >= 0 && cells[cadence]) expect(cells[cadence]).toMatch(/^\d+$/);
      expect(Number(cells[week]) % 4).toBe(0);
    }
    // Direct identifiers the seed holds must not appear (HIPAA Safe Harbor, 45 CFR 164.514(b)(2)).
    expect(csv).not.toMatch(/@demo\.pendula\.test/);
    expect(csv).not.toMatch(/FHG-IMU-\d{4}/);
    for (const name of ["Wren Halloway", "Osric Delacourt", "Hollis Brackenridge"]) expect(csv).not.toContain(name);
    expect(csv).not.toMatch(/\b20\d\d-\d\d-\d\d\b/);
    await page.getByText(/Saved .*\.csv/).waitFor();
    await saveScreenshot(page, "researcher-export-done");
  });

  it("is refused the admin device list by the API itself", async () => {
    const token = await apiToken("researcher");
    await expect(apiGet("/api/devices", token)).rejects.toThrow(/403|404/);
  });
});
