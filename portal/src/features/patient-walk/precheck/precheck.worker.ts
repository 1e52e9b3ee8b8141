/// <reference lib="webworker" />
import { runPrecheck } from "./run-precheck";
import type { PrecheckInputFile } from "./precheck-types";

// The analysis of a few minutes of four 100–200 Hz sensors takes long enough to freeze a phone's
// screen, so it runs here, off the main thread.
self.onmessage = (event: MessageEvent<PrecheckInputFile[]>) => {
  try {
    self.postMessage({ ok: true, summary: runPrecheck(event.data) });
  } catch (error) {
    self.postMessage({ ok: false, message: error instanceof Error ? error.message : String(error) });
  }
};
