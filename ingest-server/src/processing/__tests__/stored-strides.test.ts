import { describe, expect, it } from "vitest";
import { seedDevices, synthFor, upload } from "../../testing/session-fixtures";
import { uploadingPatientSuite } from "../../testing/upload-suite";
import { processSession } from "../process-session";

// The strides table must hold, column by column, the strides of the analysis the worker stored
// beside them (walk_sessions.analysis): one array per column in one statement must not shift,
// reorder or round any value (float8 round trip: PostgreSQL 15 docs, 8.1.3, shortest exact output).
const suite = uploadingPatientSuite();

describe("stored strides", () => {
  it("match the stored analysis' strides in every column, in order", async () => {
    const { ctx, patient, token } = suite;
    const serials = await seedDevices(ctx, patient.patientId!, "STR");
    const synth = synthFor(serials, { seed: 23, durationS: 150, strideTimeS: 1.05, turns: [{ startS: 60, durationS: 3, angleDeg: 180 }] });
    const res = await upload(ctx, token, synth.files);
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    const id = res.body.id as string;
    expect(await processSession(ctx.deps, id)).toBe("done");

    const session = await ctx.db("walk_sessions").where({ id }).first("analysis");
    const analysis = (typeof session.analysis === "string" ? JSON.parse(session.analysis) : session.analysis) as {
      strides: Array<{ side: string; icS: number; nextIcS: number; fcS: number | null; strideTimeS: number; stancePct: number | null; swingPct: number | null; doubleSupportPct: number | null; steady: boolean; excludedReason?: string }>;
    };
    const rows = await ctx.db("strides").where({ session_id: id }).orderBy("ordinal").select("*");
    expect(rows.length).toBe(analysis.strides.length);
    expect(rows.length).toBeGreaterThan(100);
    expect(rows.map((r) => r.ordinal)).toEqual(rows.map((_, i) => i));
    expect(
      rows.map((r) => ({
        side: r.side,
        icS: r.ic_s,
        nextIcS: r.next_ic_s,
        fcS: r.fc_s,
        strideTimeS: r.stride_time_s,
        stancePct: r.stance_pct,
        swingPct: r.swing_pct,
        doubleSupportPct: r.double_support_pct,
        steady: r.steady,
        excludedReason: r.excluded_reason,
      })),
    ).toEqual(
      analysis.strides.map((s) => ({
        side: s.side,
        icS: s.icS,
        nextIcS: s.nextIcS,
        fcS: s.fcS ?? null,
        strideTimeS: s.strideTimeS,
        stancePct: s.stancePct ?? null,
        swingPct: s.swingPct ?? null,
        doubleSupportPct: s.doubleSupportPct ?? null,
        steady: s.steady,
        excludedReason: s.excludedReason ?? null,
      })),
    );
    // Both kinds present, so a column holding only one value cannot pass by accident.
    expect(new Set(rows.map((r) => r.side))).toEqual(new Set(["left", "right"]));
    expect(rows.some((r) => r.steady) && rows.some((r) => !r.steady)).toBe(true);
    expect(rows.some((r) => r.excluded_reason === null) && rows.some((r) => r.excluded_reason !== null)).toBe(true);

    // A reprocess replaces the set instead of adding to it.
    expect(await processSession(ctx.deps, id)).toBe("done");
    expect(await ctx.db("strides").where({ session_id: id }).count<{ n: string }[]>({ n: "*" })).toEqual([{ n: String(rows.length) }]);
  });
});
