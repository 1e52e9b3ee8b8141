import { screen, waitFor } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, describe, expect, it, vi } from "vitest";
import { createRoutes } from "@/app/router";
import { setAccessToken } from "@/lib/api-client";
import { meFixture, testUuid, tokenFixture } from "@/testing/contract-fixtures";
import { mockApi } from "@/testing/mock-api";
import { createTestQueryClient, renderRoutes } from "@/testing/render";

type Role = "patient" | "clinician" | "researcher" | "admin";

const PATIENT_ID = testUuid(1, "7d1c2a3b");
const meOf = (role: Role) => meFixture({ role, id: testUuid(["patient", "clinician", "researcher", "admin"].indexOf(role) + 1, "0000aaaa"), ...(role === "patient" ? { patientId: PATIENT_ID } : {}) });

function signedOutServer(role: Role) {
  return mockApi({
    "POST /api/auth/refresh": { status: 401, body: { error: { code: "no_session", message: "No session" } } },
    "POST /api/auth/login": ({ body }) => {
      const { password } = body as { password: string };
      if (password !== "correct horse") return { status: 401, body: { error: { code: "bad_credentials", message: "Wrong e-mail or password" } } };
      return { body: tokenFixture(meOf(role)) };
    },
    "GET /api/me": ({ headers }) =>
      headers.get("Authorization") === `Bearer token-${role}`
        ? { body: meOf(role) }
        : { status: 401, body: { error: { code: "unauthenticated", message: "Sign in" } } },
  });
}

async function signIn(password = "correct horse") {
  const user = userEvent.setup();
  await user.type(await screen.findByLabelText("E-mail"), "someone@ferngate-clinic.test");
  await user.type(screen.getByLabelText("Password"), password);
  await user.click(screen.getByRole("button", { name: "Sign in" }));
}

/** The router's loaders and the screens must share one QueryClient, as in the app. */
function renderApp(path: string) {
  const queryClient = createTestQueryClient();
  return renderRoutes(createRoutes(queryClient), path, queryClient);
}

afterEach(() => {
  setAccessToken(null);
  vi.unstubAllGlobals();
});

describe("sign-in routes each role to its home", () => {
  // The homes are written out here rather than read from ROLE_HOME so a wrong mapping fails.
  it.each([
    ["patient", "/patient"],
    ["clinician", "/clinician"],
    ["researcher", "/research"],
    ["admin", "/admin"],
  ] as const)("%s lands on %s", async (role, home) => {
    const server = signedOutServer(role);
    const { router } = renderApp("/sign-in");
    await signIn();
    // An area may forward its index to a first screen (e.g. /admin → /admin/devices).
    // The first visit of an area transforms its lazy chunk, which takes a moment under test.
    await waitFor(() => expect(router.state.location.pathname).toMatch(new RegExp(`^${home}(/|$)`)), { timeout: 8000 });
    expect(server.calls.some((c) => c.method === "POST" && c.path === "/api/auth/login")).toBe(true);
    // The shell shows who is signed in (GET /api/me's display name) and in which role.
    expect(await screen.findByText(meOf(role).displayName)).toBeTruthy();
  });

  it("shows a plain message and stays on sign-in for wrong credentials", async () => {
    signedOutServer("clinician");
    const { router } = renderApp("/sign-in");
    await signIn("wrong");
    expect(await screen.findByText("That e-mail and password do not match an active account.")).toBeTruthy();
    expect(router.state.location.pathname).toBe("/sign-in");
  });

  it("validates the form before calling the server", async () => {
    const server = signedOutServer("clinician");
    renderApp("/sign-in");
    const user = userEvent.setup();
    await user.click(await screen.findByRole("button", { name: "Sign in" }));
    expect(await screen.findByText("Enter your password.")).toBeTruthy();
    expect(server.calls.some((c) => c.path === "/api/auth/login")).toBe(false);
  });

  it("honours ?next= only inside the role's own area", async () => {
    signedOutServer("clinician");
    const { router } = renderApp("/sign-in?next=%2Fadmin%2Fusers");
    await signIn();
    await waitFor(() => expect(router.state.location.pathname).toBe("/clinician"));
  });
});

describe("role guards", () => {
  it("sends a signed-out visitor to sign-in with the page to return to", async () => {
    signedOutServer("clinician");
    const { router } = renderApp("/clinician");
    await waitFor(() => expect(router.state.location.pathname).toBe("/sign-in"));
    expect(router.state.location.search).toBe("?next=%2Fclinician");
  });

  it("sends a patient who opens a clinician address back to the patient home", async () => {
    signedOutServer("patient");
    setAccessToken("token-patient");
    const { router } = renderApp("/clinician");
    await waitFor(() => expect(router.state.location.pathname).toBe("/patient"));
  });
});

describe("session check on page load", () => {
  it("a visitor who never signed in is not sent to the refresh endpoint (no 401 in the console)", async () => {
    window.localStorage.clear();
    const server = signedOutServer("clinician");
    const { router } = renderApp("/clinician");
    await waitFor(() => expect(router.state.location.pathname).toBe("/sign-in"));
    expect(server.calls.some((c) => c.path === "/api/auth/refresh")).toBe(false);
    // The caseload screen's own loader waits for the guard, so it asks for nothing either.
    expect(server.calls.some((c) => c.path === "/api/patients")).toBe(false);
  });

  it("a signed-out visitor at an admin screen triggers no data request", async () => {
    window.localStorage.clear();
    const server = signedOutServer("admin");
    const { router } = renderApp("/admin/devices");
    await waitFor(() => expect(router.state.location.pathname).toBe("/sign-in"));
    expect(server.calls.filter((c) => c.path !== "/api/auth/refresh").map((c) => c.path)).toEqual([]);
  });

  it("a browser that signed in before restores the session from the refresh cookie after a reload", async () => {
    setAccessToken("token-clinician");
    setAccessToken(null);
    // Only the in-memory token is gone, as after a reload; the hint stays until sign-out.
    window.localStorage.setItem("pendula.signed-in", "1");
    const server = mockApi({
      "POST /api/auth/refresh": { body: { accessToken: "token-clinician" } },
      "GET /api/me": ({ headers }) =>
        headers.get("Authorization") === "Bearer token-clinician"
          ? { body: meOf("clinician") }
          : { status: 401, body: { error: { code: "unauthenticated", message: "Sign in" } } },
    });
    renderApp("/sign-in");
    await waitFor(() => expect(server.calls.some((c) => c.path === "/api/auth/refresh")).toBe(true));
  });

  it("a refused refresh forgets the hint, so the next load asks nothing", async () => {
    window.localStorage.setItem("pendula.signed-in", "1");
    signedOutServer("clinician");
    const { router } = renderApp("/clinician");
    await waitFor(() => expect(router.state.location.pathname).toBe("/sign-in"));
    expect(window.localStorage.getItem("pendula.signed-in")).toBeNull();
  });
});
