import type { Page } from "playwright-core";

interface FocusInfo {
  text: string;
  outlineStyle: string;
  outlineWidth: string;
}

/**
 * Presses Tab until the focused element's accessible text matches, as a keyboard user would, and
 * returns its focus outline so a test can check the focus is visible. Fails after `maxTabs`.
 */
export async function tabTo(page: Page, name: RegExp, maxTabs = 120): Promise<FocusInfo> {
  for (let i = 0; i < maxTabs; i++) {
    await page.keyboard.press("Tab");
    const info = await page.evaluate(() => {
      const el = document.activeElement as HTMLElement | null;
      if (!el || el === document.body) return null;
      const style = getComputedStyle(el);
      const text = (el.getAttribute("aria-label") ?? el.textContent ?? "").trim();
      return { text, outlineStyle: style.outlineStyle, outlineWidth: style.outlineWidth };
    });
    if (info && name.test(info.text)) return info;
  }
  throw new Error(`no element matching ${name} reached within ${maxTabs} Tab presses`);
}
