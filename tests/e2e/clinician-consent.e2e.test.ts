import { describe, expect, it } from "vitest";
import { saveScreenshot, settle } from "./support/browser";
import { useSignedInPage } from "./support/signed-in-page";

const t = useSignedInPage("clinician");

// On clinician@'s caseload; declined research consent in the scenario (db/seeds/demo-scenario.ts).
const DECLINED = "Eamon Quarrie";
// On clinician@'s caseload; consent recorded at enrolment from the signed paper form (seed-demo.ts).
const CONSENTED = "Osric Delacourt";

describe("a clinician reads and records research consent", () => {
  it("sees a patient's consent history with who recorded it and why", async () => {
    const { page } = t;
    await page.goto("/clinician");
    await page.getByRole("link", { name: CONSENTED }).click();
    const panel = page.locator("section", { has: page.getByRole("heading", { name: "Research consent" }) });
    await panel.getByText(/In force since/).waitFor();
    expect(await panel.getByText(/Consent given — recorded by .*, administrator$/).count()).toBe(1);
    expect(await panel.getByText("signed paper consent form filed at the enrolment visit").count()).toBe(1);
    await panel.scrollIntoViewIfNeeded();
    await settle(page);
    await saveScreenshot(page, "clinician-consent-history");
  });

  it("records consent for a patient who declined only as a proposal the patient must confirm", async () => {
    const { page } = t;
    await page.goto("/clinician");
    await page.getByRole("link", { name: DECLINED }).click();
    const panel = page.locator("section", { has: page.getByRole("heading", { name: "Research consent" }) });
    await panel.getByText("Not in force").waitFor();
    await panel.getByLabel("Reason").fill("too short");
    await panel.getByRole("button", { name: "Record" }).click();
    await panel.getByText(/at least 10 characters/).waitFor();
    await panel.getByLabel("Reason").fill("patient said at today's visit that they would like to take part");
    await panel.getByRole("button", { name: "Record" }).click();
    await panel.getByText("Waiting for the patient's confirmation").waitFor();
    expect(await panel.getByText(/Consent proposed, waiting for the patient/).count()).toBe(1);
  });
});
