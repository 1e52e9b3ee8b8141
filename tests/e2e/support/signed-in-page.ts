import type { Browser, Page } from "playwright-core";
import { afterAll, afterEach, beforeAll } from "vitest";
import { launchBrowser, openPage, screenshotIfFailed, type TestPage } from "./browser";
import type { DemoUser } from "./env";
import { signIn } from "./sign-in";

export interface SignedInPage {
  readonly browser: Browser;
  readonly page: Page;
}

/**
 * One Chromium and one page signed in as a demo user for the whole file: launched before the
 * file's tests, a screenshot saved for every failed test, everything closed afterwards. Call it at
 * the top level of a test file; read `page`/`browser` inside tests (they exist once beforeAll ran).
 */
export function useSignedInPage(who: DemoUser): SignedInPage {
  let browser: Browser | undefined;
  let t: TestPage | undefined;
  beforeAll(async () => {
    browser = await launchBrowser();
    t = await openPage(browser);
    await signIn(t.page, who);
  });
  afterEach(async (ctx) => {
    await screenshotIfFailed(t?.page, ctx);
  });
  afterAll(async () => {
    await t?.context.close();
    await browser?.close();
  });
  const ready = <T>(value: T | undefined, name: string): T => {
    if (value === undefined) throw new Error(`${name} is used before the browser started (read it inside a test)`);
    return value;
  };
  return {
    get browser() {
      return ready(browser, "browser");
    },
    get page() {
      return ready(t, "page").page;
    },
  };
}
