import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { launchBrowser, openPage, saveScreenshot, settle } from "./support/browser";
import type { DemoUser } from "./support/env";
import { signIn } from "./support/sign-in";

// Each role's home, as routed by the portal after sign-in (portal/src/features/auth ROLE_HOME).
const HOMES: Array<{ who: DemoUser; path: RegExp; screen: string }> = [
  { who: "admin", path: /^\/admin\/devices$/, screen: "admin-home" },
  { who: "researcher", path: /^\/research\/?$/, screen: "researcher-home" },
  { who: "clinician", path: /^\/clinician(\/|$)/, screen: "clinician-home" },
  { who: "clinician2", path: /^\/clinician(\/|$)/, screen: "clinician2-home" },
  { who: "patient", path: /^\/patient(\/|$)/, screen: "patient-home" },
  { who: "patient2", path: /^\/patient(\/|$)/, screen: "patient2-home" },
];

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("sign-in routes every demo role to its own home", () => {
  it("shows the sign-in page to someone not signed in", async () => {
    const { page, context, offHostRequests } = await openPage(browser);
    await page.goto("/");
    await page.waitForURL(/\/sign-in/);
    await page.getByRole("button", { name: /sign in/i }).waitFor();
    await saveScreenshot(page, "sign-in");
    expect(offHostRequests).toEqual([]);
    await context.close();
  });

  for (const { who, path, screen } of HOMES) {
    it(`${who} lands on ${path}`, async () => {
      const { page, context, offHostRequests, pageErrors } = await openPage(browser);
      await signIn(page, who);
      await page.waitForURL((url) => path.test(url.pathname));
      await page.getByRole("heading", { level: 1 }).first().waitFor();
      // Let the first queries settle so the screenshot shows the screen, not its spinner.
      await settle(page);
      await saveScreenshot(page, screen);
      expect(path.test(new URL(page.url()).pathname)).toBe(true);
      // The persistent notice that Pendula supports, and does not replace, clinical judgement.
      expect(await page.getByText(/clinical judgement/i).count()).toBeGreaterThan(0);
      expect(offHostRequests).toEqual([]);
      expect(pageErrors).toEqual([]);
      await context.close();
    });
  }

  it("rejects a wrong password with a message and stays on sign-in", async () => {
    const { page, context } = await openPage(browser);
    await page.goto("/sign-in");
    await page.getByLabel(/e-?mail/i).fill("admin@demo.pendula.test");
    await page.getByLabel(/password/i).fill("not-the-password");
    await page.getByRole("button", { name: /sign in/i }).click();
    await page.getByRole("alert").first().waitFor();
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    await context.close();
  });

  it("sends a researcher who opens an admin page back to their own home", async () => {
    const { page, context } = await openPage(browser);
    await signIn(page, "researcher");
    await page.goto("/admin/devices");
    await page.waitForURL((url) => url.pathname.startsWith("/research"));
    expect(new URL(page.url()).pathname).toMatch(/^\/research/);
    await context.close();
  });
});
