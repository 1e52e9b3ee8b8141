import { describe, expect, it } from "vitest";
import { saveScreenshot, settle } from "./support/browser";
import { useSignedInPage } from "./support/signed-in-page";

const t = useSignedInPage("clinician");

// A patient on clinician@'s caseload with weeks of processed sessions (db/seeds/demo-scenario.ts).
const PATIENT = "Osric Delacourt";
// On clinician2@'s caseload only: clinician@ must not see them.
const OTHER_CASELOAD = "Hollis Brackenridge";


describe("a clinician reviews a patient's trends and a session", () => {
  it("sees their own caseload only", async () => {
    const { page } = t;
    await page.goto("/clinician");
    await page.getByRole("link", { name: PATIENT }).waitFor();
    expect(await page.getByText(OTHER_CASELOAD).count()).toBe(0);
    await settle(page);
    await saveScreenshot(page, "clinician-caseload");
  });

  it("opens the patient's trends with charts and the session list", async () => {
    const { page } = t;
    await page.getByRole("link", { name: PATIENT }).click();
    await page.waitForURL(/\/clinician\/patients\//);
    await page.getByRole("heading", { name: "Sessions" }).waitFor();
    // One chart per metric family; each is an SVG figure.
    await page.locator("svg").first().waitFor();
    expect(await page.locator("svg").count()).toBeGreaterThan(3);
    expect(await page.getByText("Processed").count()).toBeGreaterThan(0);
    await settle(page);
    await saveScreenshot(page, "clinician-patient-trends");
  });

  it("opens a session with the raw signal, detected events and the stride table", async () => {
    const { page } = t;
    const sessions = page.locator("section", { has: page.getByRole("heading", { name: "Sessions" }) });
    await sessions.getByRole("link").first().click();
    await page.waitForURL(/\/clinician\/sessions\//);
    await page.getByRole("heading", { name: "Raw signal and detected events" }).waitFor({ timeout: 30_000 });
    await page.getByRole("heading", { name: /^Strides \(\d+\)$/ }).waitFor();
    const strides = Number(/\((\d+)\)/.exec((await page.getByRole("heading", { name: /^Strides \(/ }).textContent()) ?? "")?.[1]);
    expect(strides).toBeGreaterThan(10);
    await settle(page);
    await saveScreenshot(page, "clinician-session-review");
  });
});
