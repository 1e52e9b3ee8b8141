import { afterEach, describe, expect, it, vi } from "vitest";
import { screen } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { apiError, mockApi, renderAtRoute } from "@/testing/feature-test-kit";
import { setAccessToken } from "@/lib/api-client";
import { AccountSecurity } from "../components/account-security";

afterEach(() => {
  vi.unstubAllGlobals();
  setAccessToken(null);
});

const status = (over: Record<string, unknown> = {}) => ({ enrolled: true, required: true, enrolledAt: "2026-11-30T09:00:00.000Z", recoveryCodesLeft: 2, ...over });
const CODES = Array.from({ length: 10 }, (_, i) => `CCCC-DDDD-${String(i).padStart(4, "0")}`);

describe("AccountSecurity", () => {
  it("staff: shows the standing, warns when few codes are left, makes new codes after a current code, offers no way to turn it off", async () => {
    const { calls } = mockApi({
      "GET /api/auth/second-factor": status(),
      "POST /api/auth/second-factor/recovery-codes": (c: { body: unknown }) =>
        (c.body as { code: string }).code === "287082" ? { recoveryCodes: CODES } : apiError(422, "invalid_code", "the code is not right"),
    });
    renderAtRoute(<AccountSecurity />);
    expect(await screen.findByText(/Few recovery codes are left/)).toBeTruthy();
    const standing = screen.getByText((_, el) => el?.tagName === "P" && /Recovery codes left/.test(el.textContent ?? ""));
    expect(standing.textContent).toMatch(/^On since .*2026\. Recovery codes left: 2 of 10\.$/);
    expect(screen.queryByRole("button", { name: /Turn off/ })).toBeNull();
    const u = userEvent.setup();
    await u.type(screen.getByLabelText("Current code from your app"), "111111");
    await u.click(screen.getByRole("button", { name: "Make new recovery codes" }));
    expect(await screen.findByText(/That code is not right, or was already used/)).toBeTruthy();
    await u.clear(screen.getByLabelText("Current code from your app"));
    await u.type(screen.getByLabelText("Current code from your app"), "287082");
    await u.click(screen.getByRole("button", { name: "Make new recovery codes" }));
    const list = await screen.findByRole("list", { name: "Recovery codes" });
    expect(list.querySelectorAll("li")).toHaveLength(10);
    expect(calls.filter((c) => c.path === "/api/auth/second-factor/recovery-codes").map((c) => c.body)).toEqual([{ code: "111111" }, { code: "287082" }]);
  }, 20_000);

  it("patient with an app: may turn it off with a current code", async () => {
    let enrolled = true;
    const { calls } = mockApi({
      "GET /api/auth/second-factor": () => status({ required: false, enrolled, recoveryCodesLeft: enrolled ? 10 : 0, enrolledAt: enrolled ? "2026-11-30T09:00:00.000Z" : null }),
      "POST /api/auth/second-factor/remove": () => {
        enrolled = false;
        return new Response(null, { status: 204 });
      },
    });
    renderAtRoute(<AccountSecurity />);
    const u = userEvent.setup();
    const field = (await screen.findAllByLabelText("Current code from your app"))[1]!;
    await u.type(field, "287082");
    await u.click(screen.getByRole("button", { name: "Turn off the authenticator app" }));
    expect(await screen.findByText(/Your password alone signs you in/)).toBeTruthy();
    expect(calls.some((c) => c.path === "/api/auth/second-factor/remove")).toBe(true);
  }, 20_000);

  it("patient without one: offers the setup", async () => {
    mockApi({ "GET /api/auth/second-factor": status({ enrolled: false, required: false, enrolledAt: null, recoveryCodesLeft: 0 }) });
    renderAtRoute(<AccountSecurity />);
    expect((await screen.findByRole("link", { name: "Set up an authenticator app" })).getAttribute("href")).toBe("/second-factor/setup");
  });
});
