import { describe, expect, it } from "vitest";
import { openPage, saveScreenshot, settle } from "./support/browser";
import { useSignedInPage } from "./support/signed-in-page";
import { signIn } from "./support/sign-in";

const t = useSignedInPage("admin");

// A patient on the first clinician's caseload only (db/seeds/demo-scenario.ts); the test ends the
// access it gives, so the demo caseloads are as seeded afterwards (the ended link stays as history).
const PATIENT = "Sabeen Marwick";
const CLINICIAN = /clinician2@demo\.pendula\.test/;

describe("admin caseloads and the patient's care team", () => {
  it("gives a clinician access with a reason, lists it, and ends it with a reason", async () => {
    const { page } = t;
    await page.goto("/admin/caseloads");
    await page.getByRole("table").waitFor();
    await settle(page);
    const form = page.getByRole("form", { name: "Give a clinician access to a patient" });
    const clinicianValue = await form
      .getByLabel("Clinician")
      .locator("option")
      .filter({ hasText: CLINICIAN })
      .getAttribute("value");
    await form.getByLabel("Clinician").selectOption(clinicianValue!);
    await form.getByLabel("Patient").selectOption({ label: PATIENT });
    await form.getByLabel("Reason").fill("covering the Thursday gait clinic");
    await form.getByRole("button", { name: "Give access" }).click();
    await page.getByText(`can now read ${PATIENT}'s data`).waitFor();
    const row = page.getByRole("row").filter({ hasText: PATIENT }).filter({ hasText: "covering the Thursday gait clinic" });
    await row.waitFor();
    await saveScreenshot(page, "admin-caseloads");

    await row.getByRole("button", { name: /^End .* access to/ }).click();
    await row.getByLabel("Reason for ending").fill("cover finished");
    await row.getByRole("button", { name: "End access" }).click();
    await row.waitFor({ state: "detached" });

    await page.getByLabel("Show").selectOption("ended");
    const ended = page.getByRole("row").filter({ hasText: "cover finished" }).first();
    await ended.waitFor();
    expect(await ended.textContent()).toContain("covering the Thursday gait clinic");
  });

  it("the patient reads who can see their walks on My progress", async () => {
    const patient = await openPage(t.browser);
    try {
      await signIn(patient.page, "patient");
      await patient.page.goto("/patient/progress");
      const panel = patient.page.getByRole("region", { name: "Who can see your walks" });
      await panel.getByText(/can see your weekly walks/).waitFor();
      await settle(patient.page);
      expect(await panel.textContent()).toMatch(/Researchers never see your name/);
      await saveScreenshot(patient.page, "patient-care-team");
    } catch (err) {
      await saveScreenshot(patient.page, "failed-patient-care-team").catch(() => undefined);
      throw err;
    } finally {
      await patient.context.close();
    }
  });
});
