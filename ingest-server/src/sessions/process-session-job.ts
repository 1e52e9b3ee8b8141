import type { AppDeps } from "../deps";
import { QUEUES } from "../queue/queue";

// The queue contract between the API (which enqueues) and the worker (which processes), kept
// outside both so neither imports the other.

/** Job payload of QUEUES.processSession. */
export interface ProcessSessionJob {
  sessionId: string;
}

export async function enqueueProcessing(deps: Pick<AppDeps, "queue">, sessionId: string): Promise<void> {
  // singletonKey: at most one waiting job per session, so a double click on reprocess queues once.
  await deps.queue.send(QUEUES.processSession, { sessionId } satisfies ProcessSessionJob, { singletonKey: sessionId });
}
