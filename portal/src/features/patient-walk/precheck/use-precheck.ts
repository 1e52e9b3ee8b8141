import { useMutation } from "@tanstack/react-query";
import { useCallback, useRef, useState } from "react";
import type { PrecheckProgress, PrecheckSummary, PrecheckWorkerMessage } from "./precheck-types";

/** Raised when a running check is stopped because its files were removed or replaced. */
export class PrecheckCancelled extends Error {
  override readonly name = "PrecheckCancelled";
  constructor() {
    super("The check was stopped.");
  }
}

interface PrecheckRun {
  files: File[];
  onProgress: (p: PrecheckProgress) => void;
  signal: AbortSignal;
}

function inWorker({ files, onProgress, signal }: PrecheckRun): Promise<PrecheckSummary> {
  return new Promise((resolve, reject) => {
    const worker = new Worker(new URL("./precheck.worker.ts", import.meta.url), { type: "module" });
    const stop = () => {
      worker.terminate();
      reject(new PrecheckCancelled());
    };
    signal.addEventListener("abort", stop, { once: true });
    const finish = () => signal.removeEventListener("abort", stop);
    worker.onmessage = (e: MessageEvent<PrecheckWorkerMessage>) => {
      const m = e.data;
      if (m.kind === "progress") return onProgress(m.progress);
      // The worker closes itself after its answer (precheck.worker.ts).
      finish();
      if (m.kind === "done") resolve(m.summary);
      else reject(new Error(m.message));
    };
    worker.onerror = (e) => {
      finish();
      worker.terminate();
      reject(new Error(e.message || "The check could not run in this browser."));
    };
    // File objects are handles: posting them copies no file content on this thread.
    worker.postMessage(files);
  });
}

async function bytesOf(file: File): Promise<Uint8Array> {
  if (typeof file.arrayBuffer === "function") return new Uint8Array(await file.arrayBuffer());
  return new Uint8Array(await new Response(file).arrayBuffer());
}

/** Runs the pre-check in a Web Worker where the browser has one, else (tests, old browsers) here. */
export async function precheckFiles(run: PrecheckRun): Promise<PrecheckSummary> {
  if (typeof Worker !== "undefined") return inWorker(run);
  const inputs = await Promise.all(run.files.map(async (f) => ({ name: f.name, sizeBytes: f.size, bytes: await bytesOf(f) })));
  if (run.signal.aborted) throw new PrecheckCancelled();
  const { runPrecheck } = await import("./run-precheck");
  return runPrecheck(inputs, run.onProgress);
}

/**
 * The pre-check as a mutation with progress. Starting a new check, or `reset()`, stops the one
 * still running (its worker is terminated), so removing or replacing files never leaves an old
 * check working or its answer overwriting the new one.
 */
export function usePrecheck() {
  const [progress, setProgress] = useState<PrecheckProgress | null>(null);
  const running = useRef<AbortController | null>(null);
  const mutation = useMutation({
    mutationFn: (files: File[]) => {
      running.current?.abort();
      const controller = new AbortController();
      running.current = controller;
      setProgress({ stage: "reading", fileNumber: 1, fileCount: files.length, fraction: 0 });
      return precheckFiles({
        files,
        signal: controller.signal,
        onProgress: (p) => {
          if (running.current === controller) setProgress(p);
        },
      });
    },
  });
  const { reset: resetMutation } = mutation;
  const reset = useCallback(() => {
    running.current?.abort();
    running.current = null;
    setProgress(null);
    resetMutation();
  }, [resetMutation]);
  return { ...mutation, reset, progress };
}
