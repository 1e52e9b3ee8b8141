import { screen, waitFor } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { Outlet } from "react-router-dom";
import { NavigationStatus } from "@/app/layout/app-shell";
import { RouteError } from "@/app/layout/route-error";
import { createRoutes } from "@/app/router";
import { setAccessToken } from "@/lib/api-client";
import { mockApi } from "@/testing/mock-api";
import { createTestQueryClient, renderRoutes } from "@/testing/render";

afterEach(() => {
  setAccessToken(null);
  vi.unstubAllGlobals();
});

function renderApp(path: string) {
  const queryClient = createTestQueryClient();
  return renderRoutes(createRoutes(queryClient), path, queryClient);
}

const signedOut = () =>
  mockApi({
    "POST /api/auth/refresh": { status: 401, body: { error: { code: "no_session", message: "No session" } } },
    "GET /api/me": { status: 401, body: { error: { code: "unauthenticated", message: "Sign in" } } },
  });

describe("screens that load with their route", () => {
  it("the reset link without a token asks for the address", async () => {
    signedOut();
    renderApp("/reset-password");
    expect(await screen.findByRole("heading", { name: "Reset your password" }, { timeout: 8000 })).toBeTruthy();
  });

  it("the reset link with a token asks for the new password", async () => {
    signedOut();
    renderApp("/reset-password?token=r1");
    expect(await screen.findByRole("heading", { name: "Choose a new password" }, { timeout: 8000 })).toBeTruthy();
  });

  it("the invitation screen loads on its own address", async () => {
    signedOut();
    renderApp("/accept-invitation?token=t1");
    expect(await screen.findByRole("heading", { name: "Set up your Pendula account" }, { timeout: 8000 })).toBeTruthy();
  });

  it("the account security screen still sits behind the sign-in guard", async () => {
    const server = signedOut();
    const { router } = renderApp("/account/security");
    await waitFor(() => expect(router.state.location.pathname).toBe("/sign-in"), { timeout: 8000 });
    expect(router.state.location.search).toBe(`?next=${encodeURIComponent("/account/security")}`);
    // Nothing of the screen's own was requested for a signed-out visitor.
    expect(server.calls.map((c) => c.path).filter((p) => p.startsWith("/api/auth/second-factor"))).toEqual([]);
  });
});

describe("a screen whose code does not arrive", () => {
  const routesFailingWith = (error: Error) => [{ path: "/", errorElement: <RouteError />, hydrateFallbackElement: <p>Loading…</p>, children: [{ index: true, lazy: () => Promise.reject(error) }] }];

  it.each([
    ["Chromium", "Failed to fetch dynamically imported module: http://127.0.0.1/assets/caseload-C0tS7loq.js"],
    ["Firefox", "error loading dynamically imported module: http://127.0.0.1/assets/caseload-C0tS7loq.js"],
    ["WebKit", "Importing a module script failed."],
  ])("explains it in plain words and offers a reload (%s's message)", async (_browser, message) => {
    renderRoutes(routesFailingWith(new TypeError(message)), "/");
    const alert = await screen.findByRole("alert");
    expect(alert.textContent).toContain("This page could not be loaded");
    expect(alert.textContent).toContain("Reloading the page fetches it again");
    // The hashed file name means nothing to a clinician.
    expect(alert.textContent).not.toContain("caseload-C0tS7loq");
    expect(screen.getByRole("button", { name: "Try again" })).toBeTruthy();
  });

  it("other errors keep the general message and the error's own text", async () => {
    renderRoutes(routesFailingWith(new Error("The caseload answer was malformed")), "/");
    const alert = await screen.findByRole("alert");
    expect(alert.textContent).toContain("Something went wrong on this page");
    expect(alert.textContent).toContain("The caseload answer was malformed");
  });
});

describe("while the next screen loads", () => {
  it("the current screen stays and a status region says Loading…, then clears", async () => {
    let arrive: () => void = () => {};
    const pending = new Promise<void>((resolve) => (arrive = resolve));
    const { router } = renderRoutes(
      [
        {
          path: "/",
          element: (
            <>
              <NavigationStatus />
              <Outlet />
            </>
          ),
          children: [
            { index: true, element: <p>First screen</p> },
            { path: "next", lazy: async () => (await pending, { Component: () => <p>Next screen</p> }) },
          ],
        },
      ],
      "/",
    );
    const status = await screen.findByRole("status");
    expect(status.textContent).toBe("");
    void router.navigate("/next");
    await waitFor(() => expect(screen.getByRole("status").textContent).toBe("Loading…"));
    expect(screen.getByText("First screen")).toBeTruthy();
    arrive();
    expect(await screen.findByText("Next screen")).toBeTruthy();
    expect(screen.getByRole("status").textContent).toBe("");
  });
});
