import { createHash } from "node:crypto";
import { readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { generate } from "otplib";
import type { Page } from "playwright-core";
import { DEMO_TOTP_SECRET } from "../../../db/seeds/demo-scenario";
import { DEMO_PASSWORD, DEMO_USERS, baseUrl, type DemoUser } from "./env";

const PERIOD_S = 30;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/*
 * Codes for the demo staff's published secret (db/seeds), made with the library the server uses.
 * The server accepts a code once and nothing older than the last one used, within ±1 step of its
 * clock. Test files run one after another in fresh module scopes, so the last step each account
 * spent is kept in a small file beside the run; each sign-in takes the next unspent step, waiting
 * when both the current and the next step are spent. Demo patients have no second factor.
 */
function ledgerPath(): string {
  return path.join(tmpdir(), `pendula-e2e-totp-${createHash("sha256").update(baseUrl()).digest("hex").slice(0, 12)}.json`);
}

function readLedger(): Record<string, number> {
  try {
    return JSON.parse(readFileSync(ledgerPath(), "utf8")) as Record<string, number>;
  } catch {
    return {};
  }
}

/** A code for a step this account has not spent yet (waiting for one if need be), recorded as spent. */
async function freshCode(email: string): Promise<string> {
  const ledger = readLedger();
  const step = Math.floor(Date.now() / 1000 / PERIOD_S);
  const wanted = Math.max(step, (ledger[email] ?? -1) + 1);
  // A step more than one ahead of the server's clock is refused: wait until it is the next one.
  if (wanted > step + 1) await sleep(((wanted - 1) * PERIOD_S - Date.now() / 1000) * 1000 + 300);
  writeFileSync(ledgerPath(), JSON.stringify({ ...readLedger(), [email]: wanted }));
  return generate({ secret: DEMO_TOTP_SECRET, epoch: wanted * PERIOD_S });
}

const leftSignIn = (url: URL) => !url.pathname.startsWith("/sign-in");

/**
 * Signs in through the real form, the way a person does: the password, then, for a staff account,
 * the code from the authenticator; waits until the sign-in page is left.
 */
export async function signIn(page: Page, who: DemoUser): Promise<void> {
  const email = DEMO_USERS[who];
  for (let attempt = 0; attempt < 2; attempt++) {
    await page.goto("/sign-in");
    await page.getByLabel(/e-?mail/i).fill(email);
    await page.getByLabel(/password/i).fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: /sign in/i }).click();
    const codeField = page.getByLabel(/6-digit code/i);
    const first = await Promise.race([
      page.waitForURL(leftSignIn, { timeout: 20_000 }).then(() => "in" as const),
      codeField.waitFor({ timeout: 20_000 }).then(() => "code" as const),
    ]);
    if (first === "in") return;
    await codeField.fill(await freshCode(email));
    await page.getByRole("button", { name: /verify and sign in/i }).click();
    const outcome = await Promise.race([
      page.waitForURL(leftSignIn, { timeout: 20_000 }).then(() => "in" as const),
      page.getByRole("alert").waitFor({ timeout: 20_000 }).then(() => "refused" as const),
    ]);
    if (outcome === "in") return;
    // Refused: the code was spent by something outside this run's ledger; start over with a later one.
  }
  throw new Error(`no sign-in code was accepted for ${who}`);
}

const tokens = new Map<DemoUser, { token: string; until: number }>();

async function post(url: string, body: unknown): Promise<{ status: number; body: Record<string, unknown> }> {
  const res = await fetch(`${baseUrl()}${url}`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
  return { status: res.status, body: (await res.json()) as Record<string, unknown> };
}

/**
 * Bearer token for API set-up calls the browser would not make itself (e.g. reading device serials).
 * Kept for a few minutes per account within a test file, so set-up calls do not spend a code each.
 */
export async function apiToken(who: DemoUser): Promise<string> {
  const kept = tokens.get(who);
  if (kept && kept.until > Date.now()) return kept.token;
  const email = DEMO_USERS[who];
  for (let attempt = 0; attempt < 2; attempt++) {
    const first = await post("/api/auth/login", { email, password: DEMO_PASSWORD });
    if (first.status !== 200) throw new Error(`sign-in for ${who} failed with ${first.status}: ${JSON.stringify(first.body)}`);
    let token = typeof first.body.accessToken === "string" ? first.body.accessToken : null;
    if (!token) {
      const res = await post("/api/auth/login/second-factor", { challenge: first.body.challenge, method: "totp", code: await freshCode(email) });
      if (res.status === 200) token = res.body.accessToken as string;
      else if ((res.body.error as { code?: string } | undefined)?.code !== "code_reused") {
        throw new Error(`second factor for ${who} failed with ${res.status}: ${JSON.stringify(res.body)}`);
      }
    }
    if (token) {
      tokens.set(who, { token, until: Date.now() + 5 * 60_000 });
      return token;
    }
  }
  throw new Error(`no sign-in code was accepted for ${who}`);
}

export async function apiGet<T>(path: string, token: string): Promise<T> {
  const res = await fetch(`${baseUrl()}${path}`, { headers: { authorization: `Bearer ${token}` } });
  if (!res.ok) throw new Error(`GET ${path} → ${res.status}: ${await res.text()}`);
  return (await res.json()) as T;
}
