/**
 * What auditing refused requests costs: latency of allowed trend reads, of refused ones (another
 * clinician's patient, 404 + an audit row) and of refused ones past the per-account window (404,
 * counted in memory), and how many audit rows a flood leaves. Prints figures; asserts nothing.
 *
 *   PENDULA_TEST_PG=postgres://postgres@127.0.0.1:PORT npx tsx tests/load/bench-refusals.ts [requests]
 *
 * Sequential requests over one keep-alive connection on a throwaway database (fsync off in test
 * clusters), so read the numbers as relative, not as production latency.
 */
import type { AddressInfo } from "node:net";
import { performance } from "node:perf_hooks";
import { refusalRecorderFor } from "../../ingest-server/src/audit/refused-access";
import { createTestContext } from "../../ingest-server/src/testing/harness";
import { insertDoneSession } from "../../ingest-server/src/testing/session-fixtures";

const N = Number(process.argv[2] ?? 400);

function quantile(sorted: number[], q: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))]!;
}

const ctx = await createTestContext();
const server = ctx.app.listen(0, "127.0.0.1");
await new Promise((r) => server.once("listening", r));
const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
try {
  const own = await ctx.seedUser({ role: "clinician" });
  const prober = await ctx.seedUser({ role: "clinician" });
  const patient = await ctx.seedUser({ role: "patient", caseloadOf: [own.id] });
  for (let w = 0; w < 12; w++) {
    await insertDoneSession(ctx, patient.patientId!, new Date(Date.UTC(2026, 0, 5 + 7 * w, 9)).toISOString(), { cadenceStepsPerMin: 95 + w, strideTimeCvPct: 3 });
  }
  const url = `${base}/api/patients/${patient.patientId}/trends`;
  const tokens = { own: await ctx.tokenFor(own), prober: await ctx.tokenFor(prober) };

  async function run(label: string, token: string, expected: number, n: number) {
    const ms: number[] = [];
    for (let i = 0; i < n; i++) {
      const t0 = performance.now();
      const res = await fetch(url, { headers: { authorization: `Bearer ${token}` } });
      await res.arrayBuffer();
      ms.push(performance.now() - t0);
      if (res.status !== expected) throw new Error(`${label}: ${res.status}`);
    }
    ms.sort((a, b) => a - b);
    console.log(`${label.padEnd(44)} n=${n}  p50 ${quantile(ms, 0.5).toFixed(2)} ms  p95 ${quantile(ms, 0.95).toFixed(2)} ms  p99 ${quantile(ms, 0.99).toFixed(2)} ms`);
  }

  const recorder = refusalRecorderFor(ctx.deps);
  await run("warm-up (allowed)", tokens.own, 200, 50);
  await run("allowed trend read", tokens.own, 200, N);
  // Every refusal written one by one: the cost of the audit row itself.
  recorder.coalescer.options = { perWindow: 1_000_000, windowMs: 60_000 };
  await run("refused (404), audit row written", tokens.prober, 404, N);
  const written = await ctx.db("audit_events").where({ actor_id: prober.id, action: "access.refused" }).count<{ n: string }[]>({ n: "*" });
  // The default window: after the first 10 rows, refusals are only counted.
  recorder.coalescer.options = { perWindow: 10, windowMs: 60_000 };
  recorder.coalescer.take(true);
  await run("refused (404), past the window (counted)", tokens.prober, 404, N);
  await run("allowed trend read again", tokens.own, 200, N);
  await recorder.flush(true);
  const rows = await ctx.db("audit_events").where({ actor_id: prober.id }).groupBy("action").select("action").count<{ action: string; n: string }[]>({ n: "*" });
  console.log(`audit rows of the prober: ${rows.map((r) => `${r.action} ${r.n}`).join(", ")} (first pass wrote ${written[0]!.n})`);
} finally {
  server.close();
  await ctx.close();
}
