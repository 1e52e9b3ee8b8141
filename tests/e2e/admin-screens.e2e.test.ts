import { describe, expect, it } from "vitest";
import { openPage, saveScreenshot, settle } from "./support/browser";
import { useSignedInPage } from "./support/signed-in-page";
import { baseUrl } from "./support/env";

const t = useSignedInPage("admin");


describe("admin users, invitations, audit log and mailbox", () => {
  it("lists users with roles and statuses", async () => {
    const { page } = t;
    await page.goto("/admin/users");
    const table = page.getByRole("table");
    await table.waitFor();
    await table.getByText("researcher@demo.pendula.test").waitFor();
    expect(await table.getByText("Administrator").count()).toBeGreaterThan(0);
    await saveScreenshot(page, "admin-users");
  });

  it("invites a researcher and the e-mail's link can be followed from the mailbox", async () => {
    const { page } = t;
    const email = `e2e.invitee.${Date.now()}@demo.pendula.test`;
    await page.goto("/admin/invitations");
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Display name").fill("Corvin Ashdale (visiting analyst)");
    await page.getByLabel("Role").selectOption("researcher");
    await page.getByRole("button", { name: "Send invitation" }).click();
    await page.getByText(`Invitation created for ${email}`).waitFor();
    await page.getByRole("table").getByText(email).waitFor();
    await saveScreenshot(page, "admin-invitations");

    await page.goto("/admin/mailbox");
    const message = page.getByRole("listitem").filter({ hasText: email }).first();
    await message.waitFor({ timeout: 30_000 });
    const link = message.getByRole("link").filter({ hasText: /accept|invit|token/i }).first();
    await link.waitFor();
    await saveScreenshot(page, "admin-mailbox");
    const href = await link.getAttribute("href");
    expect(href).toMatch(/\/accept-invitation\?token=/);

    // The invitee opens the link in their own browser, not in the admin's signed-in one.
    const invitee = await openPage(t.browser);
    try {
      const p = invitee.page;
      await p.goto(href!);
      await p.getByRole("button", { name: "Set password" }).waitFor();
      await settle(p);
      await saveScreenshot(p, "accept-invitation");
      const password = "e2e-walk-along-2026";
      await p.getByLabel("New password").fill(password);
      await p.getByLabel("Type it again").fill(password);
      await p.getByRole("button", { name: "Set password" }).click();
      await expect
        .poll(async () => {
          const res = await fetch(`${baseUrl()}/api/auth/login`, {
            method: "POST",
            headers: { "content-type": "application/json" },
            body: JSON.stringify({ email, password }),
          });
          return res.status;
        }, { timeout: 20_000 })
        .toBe(200);
    } finally {
      await invitee.context.close();
    }
  });
  it("filters the audit log by an action prefix", async () => {
    const { page } = t;
    await page.goto("/admin/audit");
    await page.getByRole("table").waitFor();
    await page.getByLabel("Action").fill("auth.");
    await Promise.all([
      page.waitForResponse((r) => r.url().includes("/api/audit") && r.url().includes("action=auth.") && r.ok()),
      page.getByRole("button", { name: "Apply filters" }).click(),
    ]);
    await page.waitForFunction(() => document.querySelector("table[aria-busy]") === null);
    const actions = await page.getByRole("table").locator("tbody tr td:nth-child(3)").allTextContents();
    expect(actions.length).toBeGreaterThan(0);
    for (const a of actions) expect(a.startsWith("auth.")).toBe(true);
    await saveScreenshot(page, "admin-audit");
  });
});
