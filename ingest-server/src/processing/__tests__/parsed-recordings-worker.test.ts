import { describe, expect, it } from "vitest";
import { listObjectKeys, seedDevices, synthFor, upload } from "../../testing/session-fixtures";
import { uploadingPatientSuite } from "../../testing/upload-suite";
import { parsedRecordingsKey } from "../../uploads/parsed-recordings";
import { processSession } from "../process-session";

// Upload → worker through the real route and storage: the session processed from the parse
// thread's recordings and the same session processed again from the uploaded files alone must
// store the same analysis, metrics, strides and traces.
const suite = uploadingPatientSuite();

async function stored(sessionId: string) {
  const { ctx } = suite;
  const session = await ctx.db("walk_sessions").where({ id: sessionId }).first("status", "analysis", "duration_s");
  const metrics = await ctx.db("session_metrics").where({ session_id: sessionId }).orderBy("metric_key").select("metric_key", "value", "unit", "n");
  const strides = await ctx.db("strides").where({ session_id: sessionId }).orderBy("ordinal").select("side", "ic_s", "fc_s", "stride_time_s", "stance_pct", "steady");
  const traces = await ctx.db("session_traces").where({ session_id: sessionId }).orderBy("placement").select("placement", "sample_count", "samples");
  return { session, metrics, strides, traces: traces.map((t) => ({ ...t, samples: Buffer.from(t.samples).toString("base64") })) };
}

describe("processing from the parsed recordings", () => {
  it("stores exactly what processing from the uploaded files stores", async () => {
    const { ctx, patient, token } = suite;
    const serials = await seedDevices(ctx, patient.patientId!, "PRW");
    const res = await upload(ctx, token, synthFor(serials, { seed: 17, durationS: 120, strideTimeS: 1.1 }).files);
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    const id = res.body.id as string;
    // Where the upload's time went (W3C Server Timing), read by `npm run bench:e2e`.
    for (const part of ["parse", "store", "parsed", "record", "total"]) expect(res.headers["server-timing"]).toMatch(new RegExp(`(^|, )${part};dur=\\d+\\.\\d(,|$)`));
    const key = parsedRecordingsKey(patient.patientId!, id);
    expect(await listObjectKeys(ctx)).toContain(key);

    expect(await processSession(ctx.deps, id)).toBe("done");
    const fromParsed = await stored(id);
    expect(fromParsed.session.status).toBe("done");
    expect(fromParsed.strides.length).toBeGreaterThan(50);

    await ctx.deps.storage.delete(key);
    expect(await processSession(ctx.deps, id)).toBe("done");
    const fromText = await stored(id);
    expect(fromText).toEqual(fromParsed);
  });
});
