/// <reference lib="webworker" />
import { runPrecheck } from "./run-precheck";
import type { PrecheckInputFile, PrecheckWorkerMessage } from "./precheck-types";

// Reading and analysing a 30-minute session of four sensors takes seconds, so all of it — the
// file bytes, the parsing and analyze() — happens here, off the page's thread. The page posts the
// File objects themselves (cheap handles) and only ever receives progress and the small summary.
// Everything this file imports lands in the worker's own chunk, not in the page's bundle.
const post = (message: PrecheckWorkerMessage) => self.postMessage(message);

self.onmessage = async (event: MessageEvent<File[]>) => {
  try {
    const files = event.data;
    const total = files.reduce((s, f) => s + f.size, 0) || 1;
    const inputs: PrecheckInputFile[] = [];
    let read = 0;
    for (const [k, file] of files.entries()) {
      post({ kind: "progress", progress: { stage: "reading", fileNumber: k + 1, fileCount: files.length, fraction: (0.4 * read) / total } });
      inputs.push({ name: file.name, sizeBytes: file.size, bytes: new Uint8Array(await file.arrayBuffer()) });
      read += file.size;
    }
    const summary = runPrecheck(inputs, (progress) => post({ kind: "progress", progress }));
    post({ kind: "done", summary });
  } catch (error) {
    post({ kind: "failed", message: error instanceof Error ? error.message : String(error) });
  }
  // The worker ends itself once it has answered, so tearing down its large heap is this thread's
  // work, not the page's.
  self.close();
};
