// Runs one autocannon pass in its own thread, so the load generator never competes with the
// server's event loop, and posts back every response time (exact percentiles, not autocannon's
// p97.5 summary). Plain JavaScript: worker threads do not get the TypeScript loader.
import { parentPort, workerData } from "node:worker_threads";
import autocannon from "autocannon";

const job = workerData;
let i = 0;
const times = [];
const instance = autocannon({
  url: job.url,
  connections: job.connections,
  ...(job.amount ? { amount: job.amount } : { overallRate: job.rate, duration: job.durationS }),
  // A browser always offers gzip; the server answers trends compressed when offered.
  headers: { authorization: `Bearer ${job.token}`, "accept-encoding": "gzip" },
  requests: [{ setupRequest: (req) => ({ ...req, path: job.paths[i++ % job.paths.length] }) }],
});
instance.on("response", (_client, _status, _bytes, responseTimeMs) => times.push(responseTimeMs));
const result = await instance;
parentPort.postMessage({ times, average: result.requests.average, non2xx: result.non2xx, errors: result.errors });
