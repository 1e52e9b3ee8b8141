// Runs one load pass in a child process, so the load generator never competes with the server's
// event loop and its CPU time is not counted as the server's. Posts back every response time
// (exact percentiles) and its own CPU time. Plain JavaScript: the child has no TypeScript loader.
//
// Two tools, because they answer different questions:
// - `steady`: loadtest's requestsPerSecond mode is open-loop — a high-resolution timer starts one
//   request every 1000/rate ms whatever the earlier ones are doing, so the latency is that of a
//   steady arrival rate. (autocannon's overallRate is not: each connection fires its quota for the
//   second back to back and then waits for the next second, so "200 req/s" arrives as one burst
//   of 200 requests per second.)
// - `saturate` / `amount`: autocannon's closed loop — N connections, each sending its next request
//   when the last answer arrives — for the throughput ceiling and for a fixed number of requests.
import autocannon from "autocannon";
import { loadTest } from "loadtest";

// A browser always offers gzip; the server answers trends compressed when offered.
const headers = (job) => ({ authorization: `Bearer ${job.token}`, "accept-encoding": "gzip" });

// Requests started in the first seconds are not counted: the load generator's own code is still
// being compiled and each of its clients opens its connection then, which is not the server's doing.
async function steady(job) {
  let i = 0;
  const times = [];
  let non2xx = 0;
  let errors = 0;
  let answered = 0;
  const measureFrom = performance.now() + job.warmupS * 1000;
  await loadTest({
    url: `${job.url}/__PATH__`,
    requestsPerSecond: job.rate,
    maxSeconds: job.warmupS + job.durationS,
    agentKeepAlive: true,
    headers: headers(job),
    indexParam: "/__PATH__",
    indexParamCallback: () => job.paths[i++ % job.paths.length],
    quiet: true,
    // requestElapsed is whole milliseconds, rounded down (so "p95 29" still means below 30 ms).
    statusCallback: (error, result) => {
      answered++;
      if (performance.now() - (result?.requestElapsed ?? 0) < measureFrom) return;
      if (!result) errors++;
      else {
        times.push(result.requestElapsed);
        if (result.statusCode < 200 || result.statusCode > 299) non2xx++;
      }
    },
  });
  return { times, non2xx, errors, answered, measuredS: (performance.now() - measureFrom) / 1000 };
}

async function closedLoop(job) {
  const started = performance.now();
  let i = 0;
  const times = [];
  const result = await autocannon({
    url: job.url,
    connections: job.connections,
    ...(job.amount ? { amount: job.amount } : { duration: job.durationS }),
    headers: headers(job),
    requests: [{ setupRequest: (req) => ({ ...req, path: job.paths[i++ % job.paths.length] }) }],
  }).on("response", (_client, _status, _bytes, responseTimeMs) => times.push(responseTimeMs));
  return { times, non2xx: result.non2xx, errors: result.errors, answered: times.length, measuredS: (performance.now() - started) / 1000 };
}

process.once("message", async (job) => {
  const cpu0 = process.cpuUsage();
  const r = job.mode === "steady" ? await steady(job) : await closedLoop(job);
  const cpu = process.cpuUsage(cpu0);
  process.send({ ...r, cpuMs: (cpu.user + cpu.system) / 1000 }, () => process.exit(0));
});
