import type { Page } from "playwright-core";
import { DEMO_PASSWORD, DEMO_USERS, baseUrl, type DemoUser } from "./env";

/** Signs in through the real form, the way a person does, and waits until the sign-in page is left. */
export async function signIn(page: Page, who: DemoUser): Promise<void> {
  await page.goto("/sign-in");
  await page.getByLabel(/e-?mail/i).fill(DEMO_USERS[who]);
  await page.getByLabel(/password/i).fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: /sign in/i }).click();
  await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"), { timeout: 20_000 });
}

/** Bearer token for API set-up calls the browser would not make itself (e.g. reading device serials). */
export async function apiToken(who: DemoUser): Promise<string> {
  const res = await fetch(`${baseUrl()}/api/auth/login`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify({ email: DEMO_USERS[who], password: DEMO_PASSWORD }),
  });
  if (res.status !== 200) throw new Error(`sign-in for ${who} failed with ${res.status}: ${await res.text()}`);
  const body = (await res.json()) as { accessToken: string };
  return body.accessToken;
}

export async function apiGet<T>(path: string, token: string): Promise<T> {
  const res = await fetch(`${baseUrl()}${path}`, { headers: { authorization: `Bearer ${token}` } });
  if (!res.ok) throw new Error(`GET ${path} → ${res.status}: ${await res.text()}`);
  return (await res.json()) as T;
}
