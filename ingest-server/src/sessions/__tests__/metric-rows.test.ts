import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { patientTrendData } from "../../clinical/notifications/repository";
import { METRIC_KEYS } from "../../contracts/metric-catalog";
import { createTestContext, type SeededUser, type TestContext } from "../../testing/harness";
import { insertDoneSession } from "../../testing/session-fixtures";
import { trendRows } from "../../trends/trend-rows.repository";
import { metricsBySession, metricSeries, metricValues, readSessionMetrics } from "../metric-rows";

/*
 * The pivot of session_metrics rows has no published reference: these checks pin it to common
 * practice for a long-to-wide pivot (one entry per (session, key) row, numbers as numbers, a
 * missing count stays missing rather than becoming 0) and to the catalogue's own order.
 */

describe("metricsBySession (pure)", () => {
  it("groups rows per session, keeps row order and turns driver text into numbers", () => {
    const bySession = metricsBySession([
      { session_id: "s1", metric_key: "strideTimeCvPct", value: "2.5", n: "41" },
      { session_id: "s2", metric_key: "cadenceStepsPerMin", value: 98, n: null },
      { session_id: "s1", metric_key: "cadenceStepsPerMin", value: 101.25 },
    ]);
    expect([...bySession.keys()]).toEqual(["s1", "s2"]);
    expect([...bySession.get("s1")!]).toEqual([
      ["strideTimeCvPct", { value: 2.5, n: 41 }],
      ["cadenceStepsPerMin", { value: 101.25, n: null }],
    ]);
    expect(bySession.get("s2")!.get("cadenceStepsPerMin")).toEqual({ value: 98, n: null });
    expect(metricValues(bySession.get("s1"))).toEqual({ strideTimeCvPct: 2.5, cadenceStepsPerMin: 101.25 });
    expect(metricValues(undefined)).toEqual({});
  });
});

describe("metricSeries (pure)", () => {
  it("orders series by the catalogue, unknown keys first, and keeps each series' row order", () => {
    const later = METRIC_KEYS[METRIC_KEYS.length - 1]!;
    const earlier = METRIC_KEYS[0]!;
    const series = metricSeries([
      { session_id: "b", metric_key: later, value: 2, unit: "u", recorded_at: "2026-03-10T09:00:00+02:00", n: 30, walking_aid: "cane" },
      { session_id: "a", metric_key: later, value: 1, unit: "u", recorded_at: new Date("2026-03-03T07:00:00Z") },
      { session_id: "a", metric_key: "notInTheCatalogue", value: 5, unit: "x", recorded_at: "2026-03-03T07:00:00Z" },
      { session_id: "a", metric_key: earlier, value: 3, unit: "v", recorded_at: "2026-03-03T07:00:00Z", n: null },
    ]);
    expect(series.map((s) => s.key)).toEqual(["notInTheCatalogue", earlier, later]);
    const last = series.at(-1)!;
    expect(last.unit).toBe("u");
    // ISO 8601 in UTC: +02:00 09:00 is 07:00Z.
    expect(last.points).toEqual([
      { sessionId: "b", recordedAt: "2026-03-10T07:00:00.000Z", value: 2, n: 30, walkingAid: "cane" },
      { sessionId: "a", recordedAt: "2026-03-03T07:00:00.000Z", value: 1, n: null, walkingAid: null },
    ]);
  });
});

describe("readers over stored rows", () => {
  let ctx: TestContext;
  let clinician: SeededUser;
  let patientId: string;
  const sessions: string[] = [];

  beforeAll(async () => {
    ctx = await createTestContext();
    clinician = await ctx.seedUser({ role: "clinician" });
    patientId = (await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id] })).patientId!;
    for (const [i, day] of ["2026-03-03", "2026-03-10", "2026-03-17"].entries()) {
      const id = await insertDoneSession(ctx, patientId, `${day}T10:00:00Z`, { cadenceStepsPerMin: 100 + i, strideTimeCvPct: 2 + i / 2 });
      await ctx.db("session_metrics").where({ session_id: id, metric_key: "strideTimeCvPct" }).update({ n: 10 + i });
      sessions.push(id);
    }
  });
  afterAll(async () => ctx?.close());

  it("readSessionMetrics reads only the sessions and keys asked for", async () => {
    const all = await readSessionMetrics(ctx.db, sessions);
    expect(all.size).toBe(3);
    expect(all.get(sessions[1]!)!.get("strideTimeCvPct")).toEqual({ value: 2.5, n: 11 });
    expect(all.get(sessions[1]!)!.get("cadenceStepsPerMin")).toEqual({ value: 101, n: null });
    const some = await readSessionMetrics(ctx.db, [sessions[2]!], ["cadenceStepsPerMin"]);
    expect([...some.keys()]).toEqual([sessions[2]]);
    expect([...some.get(sessions[2]!)!.keys()]).toEqual(["cadenceStepsPerMin"]);
    expect((await readSessionMetrics(ctx.db, [])).size).toBe(0);
    expect((await readSessionMetrics(ctx.db, sessions, [])).size).toBe(0);
  });

  it("the e-mail jobs judge the same series, counts included, as the trend page", async () => {
    const mail = await patientTrendData(ctx.db, patientId);
    const page = metricSeries(await trendRows(ctx.db, patientId, null));
    expect(mail!.metrics).toEqual(page);
    const cv = mail!.metrics.find((m) => m.key === "strideTimeCvPct")!;
    expect(cv.points.map((p) => p.n)).toEqual([10, 11, 12]);

    const res = await request(ctx.app).get(`/api/patients/${patientId}/trends?metrics=strideTimeCvPct`).set("Authorization", `Bearer ${await ctx.tokenFor(clinician)}`);
    expect(res.status).toBe(200);
    expect(res.body.metrics[0].points.map((p: { n: number | null }) => p.n)).toEqual([10, 11, 12]);
  });
});
