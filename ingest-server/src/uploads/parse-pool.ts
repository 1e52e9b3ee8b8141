import { existsSync } from "node:fs";
import { availableParallelism } from "node:os";
import { fileURLToPath } from "node:url";
import { Worker } from "node:worker_threads";
import { httpErrorFrom, type ParseJob, type ParseReply, type UploadSummary } from "./parse-job";

/**
 * A small, bounded pool of parse threads, so decoding and validating up to 8 × 50 MiB of sensor text
 * never runs on the event loop that answers everyone else. Size min(2, cores − 1), at least 1:
 * parsing is CPU-bound, so one core is left to the event loop (on a 2-core machine, one thread),
 * and two at most keep parse memory bounded (each thread holds one upload at a time). Jobs beyond
 * that wait in order. A thread that crashes (or runs out of memory) fails only its own job and is replaced.
 * Idle threads are stopped after IDLE_MS so a burst's parse heaps do not stay resident.
 *
 * No pool package: this is the whole need (one job type, FIFO, restart on crash), and it keeps the
 * thread entry under our control for both the TypeScript sources and the bundled build.
 */
const IDLE_MS = 30_000;

interface Task {
  id: number;
  job: ParseJob;
  resolve: (summary: UploadSummary) => void;
  reject: (err: Error) => void;
}

interface Slot {
  worker: Worker;
  task?: Task;
  idleTimer?: NodeJS.Timeout;
}

/**
 * The thread entry, first that exists: a bundle's own `parse-worker.js` beside the bundled server,
 * the sources' bootstrap beside this file, or the sources' bootstrap seen from a bundle in `dist/`.
 */
function workerEntry(): URL {
  const candidates = [
    new URL("./parse-worker.js", import.meta.url),
    new URL("./parse-worker-bootstrap.mjs", import.meta.url),
    new URL("../src/uploads/parse-worker-bootstrap.mjs", import.meta.url),
  ];
  const found = candidates.find((u) => existsSync(fileURLToPath(u)));
  if (!found) throw new Error(`parse thread entry not found (looked for ${candidates.map((u) => fileURLToPath(u)).join(", ")})`);
  return found;
}

export class ParsePool {
  private readonly slots: Slot[] = [];
  private readonly queue: Task[] = [];
  private nextId = 1;
  private closed = false;

  constructor(readonly size = Math.max(1, Math.min(2, availableParallelism() - 1))) {}

  run(job: ParseJob): Promise<UploadSummary> {
    if (this.closed) return Promise.reject(new Error("parse pool closed"));
    return new Promise((resolve, reject) => {
      this.queue.push({ id: this.nextId++, job, resolve, reject });
      this.dispatch();
    });
  }

  /** Jobs being parsed right now. */
  get running(): number {
    return this.slots.filter((s) => s.task).length;
  }

  /** Jobs waiting for a thread (not counting those running). */
  get waiting(): number {
    return this.queue.length;
  }

  async close(): Promise<void> {
    this.closed = true;
    for (const t of this.queue.splice(0)) t.reject(new Error("parse pool closed"));
    await Promise.all(this.slots.splice(0).map((s) => s.worker.terminate()));
  }

  private dispatch(): void {
    while (this.queue.length > 0) {
      let slot = this.slots.find((s) => !s.task);
      if (!slot && this.slots.length < this.size) slot = this.spawn();
      if (!slot) return;
      const task = this.queue.shift()!;
      clearTimeout(slot.idleTimer);
      slot.task = task;
      slot.worker.ref();
      slot.worker.postMessage({ id: task.id, job: task.job });
    }
  }

  private spawn(): Slot {
    const worker = new Worker(workerEntry(), { name: "pendula-upload-parse" });
    const slot: Slot = { worker };
    this.slots.push(slot);
    worker.on("message", (message: { id: number; reply: ParseReply }) => {
      const task = slot.task;
      if (!task || task.id !== message.id) return;
      slot.task = undefined;
      const { reply } = message;
      if (reply.ok) task.resolve(reply.summary);
      else if ("httpError" in reply) task.reject(httpErrorFrom(reply.httpError));
      else task.reject(new Error(`upload parse failed: ${reply.error}`));
      this.idle(slot);
      this.dispatch();
    });
    const lost = (why: string) => {
      const index = this.slots.indexOf(slot);
      if (index < 0) return;
      this.slots.splice(index, 1);
      clearTimeout(slot.idleTimer);
      slot.task?.reject(new Error(`upload parse thread stopped: ${why}`));
      slot.task = undefined;
      if (!this.closed) this.dispatch();
    };
    worker.on("error", (err) => lost(err.message));
    worker.on("exit", (code) => lost(`exit code ${code}`));
    return slot;
  }

  private idle(slot: Slot): void {
    // An idle thread must not keep the process alive (tests, scripts, shutdown).
    slot.worker.unref();
    slot.idleTimer = setTimeout(() => {
      if (slot.task) return;
      const index = this.slots.indexOf(slot);
      if (index >= 0) this.slots.splice(index, 1);
      void slot.worker.terminate();
    }, IDLE_MS);
    slot.idleTimer.unref();
  }
}

let shared: ParsePool | undefined;

/** The process's one parse pool (created on first upload). */
export function uploadParsePool(): ParsePool {
  shared ??= new ParsePool();
  return shared;
}
