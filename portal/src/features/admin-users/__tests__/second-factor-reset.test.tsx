import { afterEach, describe, expect, it, vi } from "vitest";
import { screen } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { apiError, mockApi, renderWithQuery } from "@/testing/feature-test-kit";
import { SecondFactorReset } from "../components/second-factor-reset";

const ID = "00000000-0000-4000-8000-000000000007";

afterEach(() => vi.unstubAllGlobals());

describe("SecondFactorReset", () => {
  it("asks for a reason before sending, then sends it and says what happened", async () => {
    const { calls } = mockApi({ [`POST /api/auth/second-factor/users/${ID}/reset`]: { userId: ID, enrolled: false, endedSessions: 2 } });
    renderWithQuery(<SecondFactorReset userId={ID} displayName="Ida Marlowe" />);
    const u = userEvent.setup();
    await u.click(screen.getByRole("button", { name: "Reset authenticator app…" }));
    await u.type(screen.getByLabelText("Reason (kept in the audit log)"), "ok");
    await u.click(screen.getByRole("button", { name: "Reset" }));
    expect(await screen.findByText(/at least 5 characters/)).toBeTruthy();
    expect(calls).toHaveLength(0);
    await u.type(screen.getByLabelText("Reason (kept in the audit log)"), " new phone");
    await u.click(screen.getByRole("button", { name: "Reset" }));
    expect(await screen.findByText(/Authenticator removed; 2 session\(s\) ended/)).toBeTruthy();
    expect(calls[0]!.body).toEqual({ reason: "ok new phone" });
  }, 20_000);

  it("shows the server's refusal word for word", async () => {
    mockApi({ [`POST /api/auth/second-factor/users/${ID}/reset`]: apiError(409, "own_second_factor", "ask another administrator to reset your own second factor") });
    renderWithQuery(<SecondFactorReset userId={ID} displayName="Ida Marlowe" />);
    const u = userEvent.setup();
    await u.click(screen.getByRole("button", { name: "Reset authenticator app…" }));
    await u.type(screen.getByLabelText("Reason (kept in the audit log)"), "lost phone on the ward");
    await u.click(screen.getByRole("button", { name: "Reset" }));
    expect((await screen.findByRole("alert")).textContent).toContain("ask another administrator");
  }, 20_000);
});
