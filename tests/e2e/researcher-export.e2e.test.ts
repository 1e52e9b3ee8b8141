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
    const table = page.getByRole("table");
    await table.waitFor();
    // The seed clusters ages so some cells reach k = 5 and leaves a few below it (db/seeds/demo-scenario.ts).
    expect(await table.getByText("suppressed (< 5 subjects)").count()).toBeGreaterThan(0);
    const published = table.locator("tbody tr").filter({ hasNotText: "suppressed" });
    expect(await published.count()).toBeGreaterThan(0);
    await saveScreenshot(page, "researcher-cohort-preview");
  });

  it("downloads a CSV with pseudonymous ids and weeks, and no names, e-mails or serials", async () => {
    const { page } = t;
    const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("button", { name: "Download CSV" }).click()]);
    expect(download.suggestedFilename()).toMatch(/\.csv$/);
    const path = await download.path();
    const csv = await readFile(path, "utf8");
    const [header, ...rows] = csv.trim().split(/\r?\n/);
    expect(header).toBeDefined();
    expect(rows.length).toBeGreaterThan(0);
    expect(header!.toLowerCase()).toContain("week");
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
