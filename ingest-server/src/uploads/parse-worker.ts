import { parentPort } from "node:worker_threads";
import { parseReply, type ParseJob } from "./parse-job";

/** Thread entry of the parse pool: one job at a time, answered with its id. */
if (!parentPort) throw new Error("parse-worker runs as a worker thread (see uploads/parse-pool.ts)");
const port = parentPort;
port.on("message", (message: { id: number; job: ParseJob }) => {
  void parseReply(message.job).then((reply) => port.postMessage({ id: message.id, reply }));
});
