import { mkdirSync } from "node:fs";
import { join } from "node:path";
import { chromium, type Browser, type BrowserContext, type Page } from "playwright-core";
import { CHROMIUM_PATH, SCREENSHOT_DIR, baseUrl } from "./env";

// The flags keep Debian's Chromium from reaching the network on its own (updates, sync, QUIC probes):
// the product must work with nothing downloaded at run time, and a stray request would hide that.
const CHROMIUM_ARGS = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
];

export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({ executablePath: CHROMIUM_PATH, headless: true, args: CHROMIUM_ARGS });
}

export interface TestPage {
  context: BrowserContext;
  page: Page;
  /** Requests that left 127.0.0.1 / localhost; a test asserts this stays empty. */
  offHostRequests: string[];
  /** Uncaught page errors (exceptions thrown in the app). */
  pageErrors: string[];
}

export async function openPage(browser: Browser): Promise<TestPage> {
  const context = await browser.newContext({
    baseURL: baseUrl(),
    acceptDownloads: true,
    viewport: { width: 1280, height: 900 },
    locale: "en-GB",
    timezoneId: "UTC",
  });
  const page = await context.newPage();
  page.setDefaultTimeout(15_000);
  const offHostRequests: string[] = [];
  const pageErrors: string[] = [];
  page.on("request", (req) => {
    const url = new URL(req.url());
    if (url.protocol.startsWith("http") && !["127.0.0.1", "localhost"].includes(url.hostname)) {
      offHostRequests.push(req.url());
    }
  });
  page.on("pageerror", (err) => pageErrors.push(err.message));
  return { context, page, offHostRequests, pageErrors };
}

/**
 * Waits until no spinner is on screen (every loading state in the portal shows one), then a moment
 * for charts to lay out. Network idleness is not used: screens that poll (processing status, the
 * mailbox) never go idle.
 */
export async function settle(page: Page, timeoutMs = 30_000): Promise<void> {
  await page.waitForFunction(() => document.querySelector(".animate-spin") === null, undefined, { timeout: timeoutMs });
  await page.waitForTimeout(300);
}

/** Saves a full-page PNG under .screenshots/ so every main screen can be looked at after a run. */
export async function saveScreenshot(page: Page, name: string): Promise<string> {
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  const path = join(SCREENSHOT_DIR, `${name}.png`);
  // Let web fonts and charts settle; a screenshot mid-transition is not what a person sees.
  await page.evaluate(() => document.fonts.ready.then(() => undefined));
  await page.screenshot({ path, fullPage: true });
  return path;
}

/** For an `afterEach`: keeps what the page showed when a test failed, next to the main screens. */
export async function screenshotIfFailed(page: Page | undefined, ctx: { task: { name: string; result?: { state?: string } } }): Promise<void> {
  if (!page || ctx.task.result?.state !== "fail") return;
  const slug = ctx.task.name.toLowerCase().replace(/[^a-z0-9]+/g, "-").slice(0, 60);
  await saveScreenshot(page, `failed-${slug}`).catch(() => undefined);
}
