import { useMutation } from "@tanstack/react-query";
import type { PrecheckInputFile, PrecheckSummary } from "./precheck-types";

async function readInputs(files: File[]): Promise<PrecheckInputFile[]> {
  return Promise.all(files.map(async (f) => ({ name: f.name, sizeBytes: f.size, text: await f.text() })));
}

function inWorker(inputs: PrecheckInputFile[]): Promise<PrecheckSummary> {
  return new Promise((resolve, reject) => {
    const worker = new Worker(new URL("./precheck.worker.ts", import.meta.url), { type: "module" });
    worker.onmessage = (e: MessageEvent<{ ok: true; summary: PrecheckSummary } | { ok: false; message: string }>) => {
      worker.terminate();
      if (e.data.ok) resolve(e.data.summary);
      else reject(new Error(e.data.message));
    };
    worker.onerror = (e) => {
      worker.terminate();
      reject(new Error(e.message || "The check could not run in this browser."));
    };
    worker.postMessage(inputs);
  });
}

/** Runs the pre-check in a Web Worker where the browser has one, else on the main thread. */
export async function precheckFiles(files: File[]): Promise<PrecheckSummary> {
  const inputs = await readInputs(files);
  if (typeof Worker !== "undefined") return inWorker(inputs);
  const { runPrecheck } = await import("./run-precheck");
  return runPrecheck(inputs);
}

export function usePrecheck() {
  return useMutation({ mutationFn: precheckFiles });
}
