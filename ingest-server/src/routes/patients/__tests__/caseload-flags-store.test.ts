import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { CASELOAD_FLAG_KEYS, CASELOAD_FLAG_RULES_VERSION } from "../../../clinical/caseload-flags";
import { handleProcessSessionJob } from "../../../processing/session-job";
import { QUEUES } from "../../../queue/queue";
import { createTestContext, type SeededUser, type TestContext } from "../../../testing/harness";
import { insertDoneSession, seedDevices, synthFor, upload } from "../../../testing/session-fixtures";
import { refreshStaleCaseloadFlags } from "../../../trends/caseload-flags.repository";

/**
 * Stored caseload flags against the trend page's own answer, computed on the fly from the same
 * sessions: for each patient, the flags of the latest processed session must be the same.
 * Invented caseload of a community gait service; no real people.
 */
let ctx: TestContext;
let clinician: SeededUser;
let token: string;
const patients: Record<string, string> = {};
const users: Record<string, SeededUser> = {};

type Flag = { metricKey: string; flag: string };
const byKey = (a: Flag, b: Flag) => `${a.metricKey}|${a.flag}`.localeCompare(`${b.metricKey}|${b.flag}`);
const week = (w: number) => new Date(Date.UTC(2026, 8, 7 + 7 * w, 9, 30)).toISOString();

async function caseloadFlags(): Promise<Map<string, Flag[]>> {
  const res = await request(ctx.app).get("/api/patients").set("Authorization", `Bearer ${token}`);
  expect(res.status).toBe(200);
  return new Map(
    res.body.items.map((r: { id: string; flags: Array<Flag & { label: string }> }) => {
      for (const f of r.flags) expect(f.label).toBeTruthy();
      return [r.id, r.flags.map(({ metricKey, flag }) => ({ metricKey, flag })).sort(byKey)];
    }),
  );
}

/** The same flags read off the trend route: the last point of each summarised metric, if it is the latest session's, and its events. */
async function trendPageFlags(patientId: string): Promise<Flag[]> {
  const res = await request(ctx.app).get(`/api/patients/${patientId}/trends`).set("Authorization", `Bearer ${token}`);
  expect(res.status).toBe(200);
  type Point = { sessionId: string; recordedAt: string; flag?: string; excludedReason?: string };
  const metrics: Array<{ key: string; points: Point[] }> = res.body.metrics;
  const all = metrics.flatMap((m) => m.points);
  if (all.length === 0) return [];
  const latest = all.reduce((a, b) => (b.recordedAt > a.recordedAt ? b : a)).sessionId;
  const out: Flag[] = [];
  for (const m of metrics) {
    if (!CASELOAD_FLAG_KEYS.includes(m.key)) continue;
    const last = m.points.at(-1);
    if (last?.sessionId !== latest) continue;
    if (last.flag === "improved" || last.flag === "worsened") out.push({ metricKey: m.key, flag: last.flag });
    else if (last.excludedReason === "few-strides") out.push({ metricKey: m.key, flag: "few-strides" });
  }
  for (const e of res.body.events as Array<{ sessionId: string; metricKey: string; kind: string }>) {
    if (e.sessionId === latest) out.push({ metricKey: e.metricKey, flag: e.kind });
  }
  return out.sort(byKey);
}

const storedRows = async () =>
  new Map(
    ((await ctx.db("caseload_flags").select("patient_id", "flags", "rules_version", "latest_session_id", "source_fingerprint", "computed_at")) as Array<{
      patient_id: string;
      flags: Flag[];
      rules_version: string;
      latest_session_id: string | null;
      source_fingerprint: string;
      computed_at: Date;
    }>).map((r) => [r.patient_id, r]),
  );

beforeAll(async () => {
  ctx = await createTestContext();
  clinician = await ctx.seedUser({ role: "clinician" });
  token = await ctx.tokenFor(clinician);
  const seed = async (name: string, condition: "stroke" | "parkinsons" | "incomplete_sci", birthYear: number) => {
    const p = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id], patient: { displayName: name, condition, birthYear, enrolledOn: "2026-09-01" } });
    patients[name] = p.patientId!;
    users[name] = p;
  };
  await seed("Steady Stroke", "stroke", 1962);
  await seed("Slowing Parkinson", "parkinsons", 1957);
  await seed("Faster SCI", "incomplete_sci", 1980);
  await seed("Uncoupled Stroke", "stroke", 1963);
  await seed("New Enrolment", "parkinsons", 1958);
  // Eight weekly walks each. Steady: cadence and speed within their own noise.
  for (let w = 0; w < 8; w++) {
    await insertDoneSession(ctx, patients["Steady Stroke"]!, week(w), { cadenceStepsPerMin: 98 + (w % 2), walkingSpeedMPerS: 0.8 + 0.01 * (w % 2), phaseCoordinationIndexPct: 6 });
    // Cadence 104/105/104 at baseline, then down to 84 in the last walk.
    await insertDoneSession(ctx, patients["Slowing Parkinson"]!, week(w), { cadenceStepsPerMin: w === 7 ? 84 : 104 + (w % 2), strideTimeCvPct: 2.5 + 0.05 * (w % 2) });
    // Walking speed 0.50 → 0.85 m/s over the weeks.
    await insertDoneSession(ctx, patients["Faster SCI"]!, week(w), { walkingSpeedMPerS: 0.5 + 0.05 * w, cadenceStepsPerMin: 80 + w });
    // PCI 5 % at baseline, 14–15 % in the last two walks.
    await insertDoneSession(ctx, patients["Uncoupled Stroke"]!, week(w), { phaseCoordinationIndexPct: w >= 6 ? 14 + (w - 6) : 5 + 0.2 * (w % 2), cadenceStepsPerMin: 96 });
  }
});

afterAll(async () => {
  await ctx?.close();
});

describe("stored caseload flags", () => {
  it("the worker's start-up pass stores every patient's flags, and they equal the trend page's, computed on the fly", async () => {
    expect((await storedRows()).size).toBe(0);
    expect(await refreshStaleCaseloadFlags(ctx.db, 2)).toBe(5);
    const stored = await storedRows();
    expect(stored.size).toBe(5);
    for (const r of stored.values()) expect(r.rules_version).toBe(CASELOAD_FLAG_RULES_VERSION);
    // Nothing stale left: a second pass recomputes nothing.
    expect(await refreshStaleCaseloadFlags(ctx.db)).toBe(0);

    const flags = await caseloadFlags();
    for (const id of Object.values(patients)) {
      expect(flags.get(id)).toEqual(await trendPageFlags(id));
      expect([...stored.get(id)!.flags].sort(byKey)).toEqual(flags.get(id));
    }
    // Cadence 84 against a 104/105/104 baseline: beyond MDC95 = 1.96·√2·SEM (Weir 2005) however
    // the SEM is taken here → worsened, the case a clinician must not miss.
    expect(flags.get(patients["Slowing Parkinson"]!)).toContainEqual({ metricKey: "cadenceStepsPerMin", flag: "worsened" });
    expect(flags.get(patients["Steady Stroke"]!)).toEqual([]);
    expect(flags.get(patients["New Enrolment"]!)).toEqual([]);
    expect(stored.get(patients["New Enrolment"]!)!.latest_session_id).toBeNull();
    // The reads took the stored rows as they were: nothing was recomputed or rewritten.
    const after = await storedRows();
    for (const [id, r] of stored) {
      expect(after.get(id)!.source_fingerprint).toBe(r.source_fingerprint);
      expect(after.get(id)!.computed_at.getTime()).toBe(r.computed_at.getTime());
    }
  });

  it("a row of another rules version, or of older data, is recomputed on read", async () => {
    const id = patients["Slowing Parkinson"]!;
    await ctx.db("caseload_flags").where({ patient_id: id }).update({ flags: JSON.stringify([]), rules_version: "0.old", source_fingerprint: "0.old|8||" });
    expect((await caseloadFlags()).get(id)).toContainEqual({ metricKey: "cadenceStepsPerMin", flag: "worsened" });
    expect((await storedRows()).get(id)!.rules_version).toBe(CASELOAD_FLAG_RULES_VERSION);

    // The reprocess route sends the latest walk back to the queue: it leaves the processed series,
    // and the caseload follows the trend page at once, without anyone refreshing the row.
    const latest = await ctx.db("walk_sessions").where({ patient_id: id }).orderBy("recorded_at", "desc").first("id");
    await ctx.db("walk_sessions").where({ id: latest.id }).update({ status: "queued", updated_at: ctx.db.fn.now() });
    const flags = (await caseloadFlags()).get(id);
    expect(flags).toEqual(await trendPageFlags(id));
    expect(flags).not.toContainEqual({ metricKey: "cadenceStepsPerMin", flag: "worsened" });
    await ctx.db("walk_sessions").where({ id: latest.id }).update({ status: "done", updated_at: ctx.db.fn.now() });
  });

  it("a processed upload updates the patient's stored flags in the job, before any read", async () => {
    const id = patients["New Enrolment"]!;
    // Three baseline walks far faster than the synthetic walk, so its cadence reads as worse.
    for (let w = 0; w < 3; w++) await insertDoneSession(ctx, id, new Date(Date.UTC(2026, 10, 2 + 7 * w, 9)).toISOString(), { cadenceStepsPerMin: 150 + (w % 2) });
    await refreshStaleCaseloadFlags(ctx.db);
    expect((await storedRows()).get(id)!.flags).toEqual([]);

    const serials = await seedDevices(ctx, id, "FLAG");
    const res = await upload(ctx, await ctx.tokenFor(users["New Enrolment"]!), synthFor(serials, { seed: 23 }).files);
    expect(res.status).toBe(202);
    await handleProcessSessionJob(ctx.deps, { id: "direct", name: QUEUES.processSession, data: { sessionId: res.body.id }, retryCount: 0, retryLimit: 3 });
    const session = await ctx.db("walk_sessions").where({ id: res.body.id }).first("status", "analysis");
    expect(session.status).toBe("done");
    expect(session.analysis.metrics.cadenceStepsPerMin).toBeLessThan(140);

    const row = (await storedRows()).get(id)!;
    expect(row.latest_session_id).toBe(res.body.id);
    expect(row.flags).toContainEqual({ metricKey: "cadenceStepsPerMin", flag: "worsened" });
    expect([...row.flags].sort(byKey)).toEqual(await trendPageFlags(id));
    // The caseload serves that row as stored.
    expect((await caseloadFlags()).get(id)).toEqual([...row.flags].sort(byKey));
    expect((await storedRows()).get(id)!.computed_at.getTime()).toBe(row.computed_at.getTime());
  });
});
