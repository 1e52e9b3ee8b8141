import { describe, expect, it } from "vitest";
import { saveScreenshot } from "./support/browser";
import { useSignedInPage } from "./support/signed-in-page";
import { apiGet, apiToken } from "./support/sign-in";

const t = useSignedInPage("patient");

describe("a patient manages research use of their walks", () => {
  it("sees their choice in plain words, withdraws in two steps, and says yes again", async () => {
    const { page } = t;
    await page.goto("/patient/progress");
    await page.getByRole("heading", { name: "Research use of your walks" }).waitFor();
    await page.getByText(/Saying no, or changing your mind later, does not change your care/).waitFor();
    // The demo patient confirmed consent at enrolment (ingest-server/src/dev/seed-demo.ts).
    await page.getByText(/You said yes on/).waitFor();
    await saveScreenshot(page, "patient-research-consent");

    await page.getByRole("button", { name: "Stop research use of my walks" }).click();
    await page.getByText(/your new walks will not be used for research/).waitFor();
    await page.getByRole("button", { name: "Yes, stop research use" }).click();
    await page.getByText("Your walks are not used for research.").waitFor();

    // The history the staff see records both changes, by the patient.
    const token = await apiToken("patient");
    const me = (await apiGet("/api/me", token)) as { patientId: string };
    const state = (await apiGet(`/api/consent/patients/${me.patientId}`, token)) as { inForce: boolean; events: Array<{ kind: string; recorderRole: string }> };
    expect(state.inForce).toBe(false);
    expect(state.events[0]).toMatchObject({ kind: "withdrawn", recorderRole: "patient" });

    await page.getByRole("button", { name: "Yes, my walks may be used for research" }).click();
    await page.getByText(/You said yes on/).waitFor();
  });
});
