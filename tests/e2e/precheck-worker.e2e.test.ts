import { mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { synthesizeSession } from "@pendula/signal";
import { saveScreenshot } from "./support/browser";
import { useSignedInPage } from "./support/signed-in-page";

const t = useSignedInPage("patient");

/**
 * Longest main-thread task allowed while the pre-check runs. 200 ms is our bound for "the page
 * never freezes" (the RAIL model's 100 ms response budget, doubled for a slow 2-core machine — a
 * common-practice bound, not a standard's number); Chromium reports every task over 50 ms as a
 * long task (W3C Long Tasks API).
 */
const MAX_TASK_MS = 200;

let folder: string;
let filePaths: string[];
let totalBytes = 0;

beforeAll(async () => {
  // A 30-minute weekly walk with the usual four sensors at 100 Hz: the largest session a patient sends.
  const session = synthesizeSession({ seed: 30, durationS: 1800, placements: ["left_shank", "right_shank", "left_wrist", "right_wrist"] });
  folder = await mkdtemp(join(tmpdir(), "pendula-e2e-precheck-"));
  filePaths = [];
  for (const f of session.files) {
    const p = join(folder, f.fileName);
    await writeFile(p, f.text, "utf8");
    filePaths.push(p);
    totalBytes += Buffer.byteLength(f.text);
  }
}, 300_000);
afterAll(async () => {
  if (folder) await rm(folder, { recursive: true, force: true });
});

declare global {
  interface Window {
    __longTasks: { startMs: number; durationMs: number }[];
    __progressSeen: string[];
  }
}

describe("the pre-check of a 30-minute four-sensor session runs off the page's thread", () => {
  it("shows progress, never blocks the page for more than 200 ms, and ends with its table", async () => {
    const { page } = t;
    await page.goto("/patient");
    await page.getByRole("button", { name: /I'm ready/ }).waitFor();
    for (const box of await page.getByRole("checkbox").all()) await box.check();
    await page.getByRole("button", { name: /I'm ready/ }).click();
    await page.getByRole("heading", { name: /Add your sensor files/ }).waitFor();

    // From here on every main-thread task over 50 ms is recorded, and every progress value shown.
    await page.evaluate(() => {
      window.__longTasks = [];
      window.__progressSeen = [];
      new PerformanceObserver((list) => {
        for (const e of list.getEntries()) window.__longTasks.push({ startMs: e.startTime, durationMs: e.duration });
      }).observe({ type: "longtask" });
      new MutationObserver(() => {
        const bar = document.querySelector('[role="progressbar"]');
        const text = bar?.getAttribute("aria-valuetext");
        if (text && window.__progressSeen.at(-1) !== text) window.__progressSeen.push(text);
      }).observe(document.body, { subtree: true, childList: true, attributes: true, attributeFilter: ["aria-valuetext", "aria-valuenow"] });
    });
    // The same observer over a quiet stretch first: what this machine's page shows without a check.
    await page.waitForTimeout(10_000);
    const idle = await page.evaluate(() => window.__longTasks.splice(0));
    const checkFrom = await page.evaluate(() => performance.now());
    const started = Date.now();
    await page.locator('input[type="file"]').setInputFiles(filePaths);
    const bar = page.getByRole("progressbar");
    await bar.waitFor({ timeout: 30_000 });
    expect(Number(await bar.getAttribute("aria-valuenow"))).toBeGreaterThanOrEqual(0);
    await saveScreenshot(page, "patient-precheck-progress");

    await page.getByText("Files recognised").waitFor({ timeout: 240_000 });
    const seconds = (Date.now() - started) / 1000;
    expect(await page.getByText("4 of 4").count()).toBeGreaterThan(0);
    expect(await page.getByRole("progressbar").count()).toBe(0);

    const { longTasks, progressSeen } = await page.evaluate(() => ({ longTasks: window.__longTasks, progressSeen: window.__progressSeen }));
    const longest = Math.max(0, ...longTasks.map((l) => l.durationMs));
    console.log(
      `pre-check of ${(totalBytes / 1e6).toFixed(1)} MB in ${seconds.toFixed(1)} s; ${longTasks.length} long task(s) on the page's thread, ` +
        `longest ${longest.toFixed(0)} ms (${longTasks.map((l) => `${l.durationMs.toFixed(0)} ms at +${((l.startMs - checkFrom) / 1000).toFixed(1)} s`).join(", ")}); ` +
        `in 10 s before it: ${idle.length} long task(s), longest ${Math.max(0, ...idle.map((l) => l.durationMs)).toFixed(0)} ms; progress shown: ${progressSeen.join(" | ")}`,
    );
    expect(longest).toBeLessThanOrEqual(MAX_TASK_MS);
    // The worker said where it was: each file being read, then the analysis.
    expect(progressSeen.some((p) => /Reading file \d of 4/.test(p))).toBe(true);
    expect(progressSeen.some((p) => /Looking for your steps/.test(p))).toBe(true);
    await saveScreenshot(page, "patient-precheck-30min");
  }, 400_000);

  it("stops the check when the files are removed", async () => {
    const { page } = t;
    await page.getByRole("button", { name: /Start again with other files/ }).click();
    await page.locator('input[type="file"]').setInputFiles(filePaths);
    await page.getByRole("progressbar").waitFor({ timeout: 30_000 });
    await page.getByRole("button", { name: /Stop and remove these files/ }).click();
    expect(await page.getByRole("progressbar").count()).toBe(0);
    // Long enough for the stopped check to have finished had it kept running.
    await page.waitForTimeout(1500);
    expect(await page.getByText("Files recognised").count()).toBe(0);
    expect(await page.getByText(/could not run/).count()).toBe(0);
  }, 120_000);
});
