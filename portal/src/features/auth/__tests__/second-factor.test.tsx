import { screen, waitFor } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, describe, expect, it, vi } from "vitest";
import { createRoutes } from "@/app/router";
import { setAccessToken } from "@/lib/api-client";
import { meFixture, tokenFixture } from "@/testing/contract-fixtures";
import { mockApi } from "@/testing/mock-api";
import { createTestQueryClient, renderRoutes } from "@/testing/render";

const FULL_SCOPES = ["patients:read:caseload", "sessions:read:caseload"];
const CLINICIAN = meFixture({ role: "clinician", email: "rowan.tamsett@ferngate-clinic.test", displayName: "Rowan Tamsett", scopes: FULL_SCOPES });
const session = (accessToken: string, secondFactor: "verified" | "enrolment_required") => tokenFixture(CLINICIAN, { accessToken, secondFactor });

function renderApp(path: string) {
  const queryClient = createTestQueryClient();
  return renderRoutes(createRoutes(queryClient), path, queryClient);
}

async function typePassword() {
  const user = userEvent.setup();
  await user.type(await screen.findByLabelText("E-mail"), CLINICIAN.email);
  await user.type(screen.getByLabelText("Password"), "correct horse");
  await user.click(screen.getByRole("button", { name: "Sign in" }));
  return user;
}

afterEach(() => {
  setAccessToken(null);
  vi.unstubAllGlobals();
  window.localStorage.clear();
});

describe("sign-in with an authenticator app", () => {
  function server() {
    return mockApi({
      "POST /api/auth/refresh": { status: 401, body: { error: { code: "invalid_refresh", message: "session expired" } } },
      "POST /api/auth/login": { body: { secondFactorRequired: true, challenge: "c".repeat(43), expiresIn: 300, methods: ["totp", "recovery_code"] } },
      "POST /api/auth/login/second-factor": ({ body }) => {
        const b = body as { method: string; code: string };
        if (b.method === "totp" && b.code === "287082") return { body: session("token-full", "verified") };
        if (b.method === "recovery_code" && b.code === "7K3M-Q9PA-2XHD") return { body: session("token-full", "verified") };
        if (b.code === "111111") return { status: 401, body: { error: { code: "code_reused", message: "already used" } } };
        return { status: 401, body: { error: { code: "invalid_code", message: "wrong", details: { attemptsLeft: 4 } } } };
      },
      "GET /api/me": ({ headers }) =>
        headers.get("Authorization") === "Bearer token-full"
          ? { body: CLINICIAN }
          : { status: 401, body: { error: { code: "unauthorized", message: "Sign in" } } },
    });
  }

  it("asks for the code after the password, refuses a wrong and a used one with plain words, then lands home", async () => {
    const api = server();
    const { router } = renderApp("/sign-in");
    const user = await typePassword();
    const code = await screen.findByLabelText("6-digit code from your authenticator app");
    await user.type(code, "123 456");
    await user.click(screen.getByRole("button", { name: "Verify and sign in" }));
    expect(await screen.findByText(/That code is not right/)).toBeTruthy();
    // Spaces are dropped before sending.
    expect(api.calls.find((c) => c.path === "/api/auth/login/second-factor")?.body).toEqual({ challenge: "c".repeat(43), method: "totp", code: "123456" });
    await user.clear(code);
    await user.type(code, "111111");
    await user.click(screen.getByRole("button", { name: "Verify and sign in" }));
    expect(await screen.findByText(/already used/)).toBeTruthy();
    await user.clear(code);
    await user.type(code, "287082");
    await user.click(screen.getByRole("button", { name: "Verify and sign in" }));
    await waitFor(() => expect(router.state.location.pathname).toBe("/clinician"), { timeout: 8000 });
  });

  it("checks the code's form before sending it, and offers a recovery code instead", async () => {
    const api = server();
    const { router } = renderApp("/sign-in");
    const user = await typePassword();
    await user.type(await screen.findByLabelText("6-digit code from your authenticator app"), "12a");
    await user.click(screen.getByRole("button", { name: "Verify and sign in" }));
    expect(await screen.findByText("Enter the 6 digits your authenticator app shows now.")).toBeTruthy();
    expect(api.calls.some((c) => c.path === "/api/auth/login/second-factor")).toBe(false);
    await user.click(screen.getByRole("button", { name: /Use a recovery code/ }));
    await user.type(await screen.findByLabelText("Recovery code"), "7K3M-Q9PA-2XHD");
    await user.click(screen.getByRole("button", { name: "Verify and sign in" }));
    await waitFor(() => expect(router.state.location.pathname).toBe("/clinician"), { timeout: 8000 });
    expect(api.calls.find((c) => c.path === "/api/auth/login/second-factor")?.body).toMatchObject({ method: "recovery_code" });
  });

  it("an expired step goes back to the password with a message", async () => {
    mockApi({
      "POST /api/auth/refresh": { status: 401, body: { error: { code: "invalid_refresh", message: "x" } } },
      "POST /api/auth/login": { body: { secondFactorRequired: true, challenge: "c".repeat(43), expiresIn: 300, methods: ["totp"] } },
      "POST /api/auth/login/second-factor": { status: 401, body: { error: { code: "challenge_expired", message: "expired" } } },
    });
    renderApp("/sign-in");
    const user = await typePassword();
    await user.type(await screen.findByLabelText("6-digit code from your authenticator app"), "287082");
    await user.click(screen.getByRole("button", { name: "Verify and sign in" }));
    expect(await screen.findByText(/That sign-in step has expired/)).toBeTruthy();
    expect(screen.getByLabelText("Password")).toBeTruthy();
  });
});

describe("staff account without a second factor", () => {
  function server() {
    let enrolled = false;
    return mockApi({
      "POST /api/auth/refresh": { status: 401, body: { error: { code: "invalid_refresh", message: "x" } } },
      "POST /api/auth/login": { body: session("token-limited", "enrolment_required") },
      "GET /api/me": ({ headers }) =>
        headers.get("Authorization") === "Bearer token-full"
          ? { body: CLINICIAN }
          : { body: { ...CLINICIAN, scopes: ["second-factor:enrol"] } },
      "GET /api/auth/second-factor": () => ({ body: { enrolled, required: true, enrolledAt: enrolled ? "2026-12-02T08:00:00.000Z" : null, recoveryCodesLeft: enrolled ? 10 : 0 } }),
      "POST /api/auth/second-factor/enrolment": {
        body: {
          secret: "GEZDGNBVGY3TQOJQGEZDGNBVGY3TQOJQ",
          otpauthUri: "otpauth://totp/Pendula:rowan.tamsett%40ferngate-clinic.test?secret=GEZDGNBVGY3TQOJQGEZDGNBVGY3TQOJQ&issuer=Pendula",
          issuer: "Pendula",
          accountLabel: CLINICIAN.email,
          digits: 6,
          periodS: 30,
        },
      },
      "POST /api/auth/second-factor/enrolment/confirm": ({ body }) => {
        if ((body as { code: string }).code !== "287082") return { status: 422, body: { error: { code: "invalid_code", message: "wrong" } } };
        enrolled = true;
        return {
          body: {
            recoveryCodes: Array.from({ length: 10 }, (_, i) => `AAAA-BBBB-${String(i).padStart(4, "0")}`),
            session: session("token-full", "verified"),
          },
        };
      },
      "GET /api/patients": { body: { items: [], total: 0, limit: 50, offset: 0 } },
    });
  }

  it("is held on the setup screen, sees a locally drawn QR code and the key, confirms with a code, stores the recovery codes and goes on", async () => {
    const api = server();
    const { router, container } = renderApp("/sign-in");
    const user = await typePassword();
    await waitFor(() => expect(router.state.location.pathname).toBe("/second-factor/setup"));
    // No navigation to the clinical screens meanwhile.
    expect(screen.queryByRole("link", { name: "Caseload" })).toBeNull();
    await user.click(await screen.findByRole("button", { name: "Show my setup code" }));
    expect(await screen.findByText("GEZD GNBV GY3T QOJQ GEZD GNBV GY3T QOJQ")).toBeTruthy();
    const qr = container.querySelector("svg title");
    expect(qr?.textContent).toBe("Setup code for your authenticator app");
    // The QR code is drawn in the page: no image is fetched from anywhere.
    expect(container.querySelector("img")).toBeNull();

    const code = screen.getByLabelText("6-digit code from the app");
    await user.type(code, "000000");
    await user.click(screen.getByRole("button", { name: "Turn on and show recovery codes" }));
    expect(await screen.findByText(/That code is not right/)).toBeTruthy();
    await user.clear(code);
    await user.type(code, "287082");
    await user.click(screen.getByRole("button", { name: "Turn on and show recovery codes" }));
    const list = await screen.findByRole("list", { name: "Recovery codes" });
    expect(list.querySelectorAll("li")).toHaveLength(10);
    const go = screen.getByRole("button", { name: "Continue to Pendula" });
    expect((go as HTMLButtonElement).disabled).toBe(true);
    await user.click(screen.getByLabelText("I have stored these codes somewhere safe."));
    await user.click(go);
    await waitFor(() => expect(router.state.location.pathname).toBe("/clinician"), { timeout: 8000 });
    expect(api.calls.filter((c) => c.path === "/api/auth/second-factor/enrolment")).toHaveLength(1);
  });

  it("an address inside the staff area sends the limited session back to setup", async () => {
    server();
    setAccessToken("token-limited");
    const { router } = renderApp("/clinician");
    await waitFor(() => expect(router.state.location.pathname).toBe("/second-factor/setup"));
  });
});
