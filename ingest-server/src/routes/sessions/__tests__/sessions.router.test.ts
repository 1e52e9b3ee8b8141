import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { processSession } from "../../../processing/process-session";
import { handleProcessSessionJob } from "../../../processing/session-job";
import { seedAccessCast, type AccessCast } from "../../../testing/access-cast";
import { expectRevalidatedAnswer } from "../../../testing/cached-answer";
import { createTestContext, type TestContext } from "../../../testing/harness";
import { listObjectKeys, seedDevices, storedCounts, synthFor, upload } from "../../../testing/session-fixtures";
import { parsedRecordingsKey } from "../../../uploads/parsed-recordings";

let ctx: TestContext;
let cast: AccessCast;
let serials: Record<string, string>;

beforeAll(async () => {
  // 2 MiB per file keeps the over-limit case small; the synthetic 60 s files are ~0.4 MiB.
  ctx = await createTestContext({ env: { UPLOAD_MAX_FILE_BYTES: String(2 * 1024 * 1024) } });
  cast = await seedAccessCast(ctx);
  serials = await seedDevices(ctx, cast.patient.patientId!, "KES");
});

afterAll(async () => {
  await ctx?.close();
});

const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;

describe("POST /api/sessions → processSession → GET /api/sessions/:id", () => {
  const synth = () => synthFor(serials, { seed: 11, strideTimeS: 1.1 });
  let sessionId = "";

  it("accepts a four-sensor synthetic session as 202 queued and stores files and rows", async () => {
    const before = await storedCounts(ctx);
    const res = await upload(ctx, cast.tokens[cast.patient.id]!, synth().files);
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    expect(res.body).toMatchObject({ status: "queued" });
    sessionId = res.body.id;
    const after = await storedCounts(ctx);
    expect(after.sessions - before.sessions).toBe(1);
    expect(after.files - before.files).toBe(4);
    // The four files and, beside them, the parse thread's recordings (uploads/parsed-recordings.ts).
    expect(after.objects - before.objects).toBe(5);
    const files = await ctx.db("raw_files").where({ session_id: sessionId }).orderBy("placement");
    expect(files.map((f) => [f.placement, f.device_serial])).toEqual(
      ["left_shank", "left_wrist", "right_shank", "right_wrist"].map((p) => [p, serials[p]]),
    );
  });

  it("processes to done with cadence within 3 % of the generator's truth", async () => {
    // Truth: cadence = 60 / mean step time and a stride holds two steps, so 120 / mean stride time
    // of the generator's own events (definition in docs/methods.md#stride-step-and-cadence / signal
    // issue). 3 % is our tolerance.
    const truth = synth().truth;
    const expectedCadence = 120 / mean(truth.strideTimesS);
    expect(await processSession(ctx.deps, sessionId)).toBe("done");
    const res = await request(ctx.app).get(`/api/sessions/${sessionId}`).set("Authorization", `Bearer ${cast.tokens[cast.patient.id]}`);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ id: sessionId, patientId: cast.patient.patientId, status: "done", progressPct: 100 });
    expect(res.body.algorithmVersion).toEqual(expect.any(String));
    expect(res.body.analysis.algorithm.version).toBe(res.body.algorithmVersion);
    expect(res.body.files).toHaveLength(4);
    const cadence = await ctx.db("session_metrics").where({ session_id: sessionId, metric_key: "cadenceStepsPerMin" }).first();
    expect(cadence.unit).toBe("/min");
    expect(Math.abs(cadence.value - expectedCadence) / expectedCadence).toBeLessThan(0.03);
    expect(res.body.analysis.metrics.cadenceStepsPerMin).toBeCloseTo(cadence.value, 9);
    const strides = await ctx.db("strides").where({ session_id: sessionId }).count<{ n: string }[]>({ n: "*" });
    expect(Number(strides[0]?.n)).toBe(res.body.analysis.strides.length);
  });

  it("re-running processSession leaves exactly one set of metrics, strides and traces", async () => {
    const count = async (table: string) => Number((await ctx.db(table).where({ session_id: sessionId }).count<{ n: string }[]>({ n: "*" }))[0]?.n);
    const before = { m: await count("session_metrics"), s: await count("strides"), t: await count("session_traces") };
    await processSession(ctx.deps, sessionId);
    expect({ m: await count("session_metrics"), s: await count("strides"), t: await count("session_traces") }).toEqual(before);
    expect(before.t).toBe(4);
  });

  it("serves a min/max-decimated sagittal trace whose mid-swing peaks fall between the detected contacts", async () => {
    const res = await request(ctx.app)
      .get(`/api/sessions/${sessionId}/signal`)
      .query({ placement: "left_shank", from: 10, to: 20, maxPoints: 400 })
      .set("Authorization", `Bearer ${cast.tokens[cast.clinician.id]}`);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const [trace] = res.body.traces;
    expect(trace.placement).toBe("left_shank");
    expect(trace.value.length).toBeLessThanOrEqual(400);
    expect(trace.decimated).toBe(true);
    expect(Math.min(...trace.timeS)).toBeGreaterThanOrEqual(10);
    expect(Math.max(...trace.timeS)).toBeLessThanOrEqual(20);
    // Forward swing is positive after orientation (signal issue: +z nominal, inversion corrected).
    expect(Math.max(...trace.value)).toBeGreaterThan(100);
    expect(Math.max(...trace.value)).toBeGreaterThan(Math.abs(Math.min(...trace.value)));
  });

  it("answers the same files again with 200 duplicate and stores nothing new", async () => {
    const before = await storedCounts(ctx);
    const res = await upload(ctx, cast.tokens[cast.clinician.id]!, synth().files, { patientId: cast.patient.patientId! });
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ id: sessionId, status: "done", duplicate: true });
    expect(await storedCounts(ctx)).toEqual(before);
  });

  it("reprocess (clinician of the caseload) queues again and processing ends done with the same metrics", async () => {
    const before = await ctx.db("session_metrics").where({ session_id: sessionId }).orderBy("metric_key");
    const res = await request(ctx.app).post(`/api/sessions/${sessionId}/reprocess`).set("Authorization", `Bearer ${cast.tokens[cast.clinician.id]}`);
    expect(res.status).toBe(202);
    expect(res.body).toEqual({ id: sessionId, status: "queued" });
    expect((await ctx.db("walk_sessions").where({ id: sessionId }).first()).status).toBe("queued");
    await processSession(ctx.deps, sessionId);
    const after = await ctx.db("session_metrics").where({ session_id: sessionId }).orderBy("metric_key");
    expect(after.map((m) => [m.metric_key, m.value])).toEqual(before.map((m) => [m.metric_key, m.value]));
  });

  it("a repeated read is the same text with a strong ETag (304 on revalidation), audited every time, and follows reprocessing", async () => {
    const get = () => request(ctx.app).get(`/api/sessions/${sessionId}`).set("Authorization", `Bearer ${cast.tokens[cast.clinician.id]}`);
    const audited = async () => Number((await ctx.db("audit_events").where({ action: "session.read", resource_id: sessionId }).count<{ n: string }[]>({ n: "*" }))[0]?.n);
    const reads0 = await audited();
    const { first, etag } = await expectRevalidatedAnswer(get);
    expect(await audited()).toBe(reads0 + 3);
    // A refused read is not logged as a read.
    const refused = await request(ctx.app).get(`/api/sessions/${sessionId}`).set("Authorization", `Bearer ${cast.tokens[cast.otherClinician.id]}`);
    expect(refused.status).toBe(404);
    expect(await audited()).toBe(reads0 + 3);

    await request(ctx.app).post(`/api/sessions/${sessionId}/reprocess`).set("Authorization", `Bearer ${cast.tokens[cast.clinician.id]}`).expect(202);
    const queued = await get().set("If-None-Match", etag);
    expect(queued.status).toBe(200);
    expect(queued.body).toMatchObject({ status: "queued", progressPct: 0 });
    expect(queued.body.analysis).toBeUndefined();
    await processSession(ctx.deps, sessionId);
    const done = await get();
    expect(done.body).toMatchObject({ status: "done", progressPct: 100 });
    expect(done.body.analysis.metrics.cadenceStepsPerMin).toBeCloseTo(first.body.analysis.metrics.cadenceStepsPerMin, 9);
  });
});

describe("concurrent identical uploads", () => {
  it("end as one session: one 202, the others 200 duplicate with the same id, no orphaned objects", async () => {
    const files = synthFor(serials, { seed: 23, startUtc: "2026-11-30T08:00:00.000Z" }).files;
    const before = await storedCounts(ctx);
    // Three accounts, since one account may have only two uploads in flight: the patient and two
    // clinicians of their caseload send the same walk at the same moment.
    const thirdClinician = await ctx.seedUser({ role: "clinician" });
    await ctx.addToCaseload(thirdClinician.id, cast.patient.patientId!);
    const forPatient = { patientId: cast.patient.patientId! };
    const results = await Promise.all([
      upload(ctx, cast.tokens[cast.patient.id]!, files),
      upload(ctx, cast.tokens[cast.clinician.id]!, files, forPatient),
      upload(ctx, await ctx.tokenFor(thirdClinician), files, forPatient),
    ]);
    const statuses = results.map((r) => r.status).sort();
    expect(statuses).toEqual([200, 200, 202]);
    expect(new Set(results.map((r) => r.body.id)).size).toBe(1);
    const after = await storedCounts(ctx);
    expect(after.sessions - before.sessions).toBe(1);
    expect(after.files - before.files).toBe(4);
    expect(after.objects - before.objects).toBe(5);
    // Every object is a stored file's, or the parsed recordings of a session that has files.
    const keys = await listObjectKeys(ctx);
    const rows: string[] = await ctx.db("raw_files").pluck("storage_key");
    const parsed = (await ctx.db("walk_sessions").whereIn("id", ctx.db("raw_files").select("session_id")).select("id", "patient_id")).map((s) =>
      parsedRecordingsKey(s.patient_id, s.id),
    );
    expect(keys).toEqual([...rows, ...parsed].sort());
  });
});

describe("rejected uploads name the problem and store nothing", () => {
  const base = () => synthFor(serials, { seed: 31, startUtc: "2026-12-01T07:00:00.000Z" }).files;

  async function expectRejected(res: request.Response, status: number, pattern: RegExp, before: Awaited<ReturnType<typeof storedCounts>>) {
    expect(res.status, JSON.stringify(res.body)).toBe(status);
    expect(res.body.error.message).toMatch(pattern);
    expect(await storedCounts(ctx)).toEqual(before);
  }

  it("unknown device → 422 naming the serial and the file", async () => {
    const before = await storedCounts(ctx);
    const files = base();
    files[0]!.text = files[0]!.text.replace(/# device: .*/, "# device: NOPE-0001");
    const res = await upload(ctx, cast.tokens[cast.patient.id]!, files);
    await expectRejected(res, 422, /NOPE-0001/, before);
    expect(res.body.error.code).toBe("unknown_device");
    expect(res.body.error.message).toContain(files[0]!.fileName);
  });

  it("device not assigned to this patient at the file's start → 422 naming it", async () => {
    // Assigned only from 2027: the recording (2026-12) predates the assignment.
    const late = await seedDevices(ctx, cast.patient.patientId!, "LATE", { from: "2027-01-01T00:00:00Z", placements: ["left_foot"] });
    const files = base();
    files[0]!.text = files[0]!.text.replace(/# device: .*/, `# device: ${late.left_foot}`);
    const before = await storedCounts(ctx);
    const res = await upload(ctx, cast.tokens[cast.patient.id]!, files);
    await expectRejected(res, 422, new RegExp(`${late.left_foot}.*not assigned`), before);
    expect(res.body.error.code).toBe("device_not_assigned");
  });

  it("a device worn by another patient reads as not assigned, without naming that patient", async () => {
    const theirs = await seedDevices(ctx, cast.otherPatient.patientId!, "THEIRS", { placements: ["left_shank"] });
    const files = base();
    files[0]!.text = files[0]!.text.replace(/# device: .*/, `# device: ${theirs.left_shank}`);
    const before = await storedCounts(ctx);
    const res = await upload(ctx, cast.tokens[cast.patient.id]!, files);
    await expectRejected(res, 422, /not assigned to this patient/, before);
    expect(JSON.stringify(res.body)).not.toContain(cast.otherPatient.patientId!);
  });

  it("garbage bytes → 422 binary content", async () => {
    const before = await storedCounts(ctx);
    const junk = Buffer.from(Array.from({ length: 4096 }, (_, i) => (i * 7919) % 256));
    const res = await upload(ctx, cast.tokens[cast.patient.id]!, [{ fileName: "left.csv", text: junk }]);
    await expectRejected(res, 422, /left\.csv.*binary/, before);
  });

  it("a zip-like payload named .csv → 422 (content is sniffed, not the extension)", async () => {
    const before = await storedCounts(ctx);
    const zip = Buffer.concat([Buffer.from([0x50, 0x4b, 0x03, 0x04, 0x14, 0x00, 0x00, 0x00]), Buffer.alloc(64, 1)]);
    const res = await upload(ctx, cast.tokens[cast.patient.id]!, [{ fileName: "walk.csv", text: zip }]);
    await expectRejected(res, 422, /walk\.csv/, before);
  });

  it("an empty file → 422 file is empty", async () => {
    const before = await storedCounts(ctx);
    const res = await upload(ctx, cast.tokens[cast.patient.id]!, [...base().slice(1), { fileName: "empty.csv", text: "" }]);
    await expectRejected(res, 422, /empty\.csv.*empty/, before);
  });

  it("a non-numeric cell → 422 with file, line and column", async () => {
    const files = base();
    const lines = files[1]!.text.split("\n");
    const dataStart = lines.findIndex((l) => l.startsWith("t_s,")) + 1;
    const cells = lines[dataStart + 5]!.split(",");
    cells[4] = "abc";
    lines[dataStart + 5] = cells.join(",");
    files[1]!.text = lines.join("\n");
    const before = await storedCounts(ctx);
    const res = await upload(ctx, cast.tokens[cast.patient.id]!, files);
    await expectRejected(res, 422, new RegExp(files[1]!.fileName.replace(/[.]/g, "\\.")), before);
    expect(res.body.error.details).toMatchObject({ file: files[1]!.fileName, line: dataStart + 6 });
    expect(res.body.error.details.column).toBeDefined();
  });

  it("a file over the size limit → 413", async () => {
    const before = await storedCounts(ctx);
    const big = base()[0]!.text + "0.0,0,0,0,0,0,0\n".repeat(150_000);
    const res = await upload(ctx, cast.tokens[cast.patient.id]!, [{ fileName: "big.csv", text: big }]);
    await expectRejected(res, 413, /too large/i, before);
  });

  it("more than 8 files → 413", async () => {
    const before = await storedCounts(ctx);
    const files = base();
    const many = Array.from({ length: 9 }, (_, i) => ({ fileName: `f${i}.csv`, text: files[i % 4]!.text }));
    const res = await upload(ctx, cast.tokens[cast.patient.id]!, many);
    await expectRejected(res, 413, /too many files/i, before);
  });

  it("no files at all → 400", async () => {
    const before = await storedCounts(ctx);
    const res = await request(ctx.app).post("/api/sessions").set("Authorization", `Bearer ${cast.tokens[cast.patient.id]}`).field("x", "1");
    await expectRejected(res, 400, /no files/, before);
  });

  it("a file field with another name → 400", async () => {
    const before = await storedCounts(ctx);
    const res = await request(ctx.app)
      .post("/api/sessions")
      .set("Authorization", `Bearer ${cast.tokens[cast.patient.id]}`)
      .attach("upload", Buffer.from(base()[0]!.text), "a.csv");
    await expectRejected(res, 400, /unexpected file field/i, before);
  });
});

describe("failed processing is visible to the clinician", () => {
  it("after the last attempt the session is failed with the reason; raw rows stay for reprocessing", async () => {
    const files = synthFor(serials, { seed: 41, startUtc: "2026-12-02T07:00:00.000Z" }).files;
    const res = await upload(ctx, cast.tokens[cast.patient.id]!, files);
    expect(res.status).toBe(202);
    const id = res.body.id as string;
    // Storage lost one object: processing cannot succeed.
    const lost = await ctx.db("raw_files").where({ session_id: id }).first();
    await ctx.deps.storage.delete(lost.storage_key);

    const job = (retryCount: number) => ({ id: "j", name: "process-session", data: { sessionId: id }, retryCount, retryLimit: 2 });
    await expect(handleProcessSessionJob(ctx.deps, job(0))).rejects.toThrow();
    let row = await ctx.db("walk_sessions").where({ id }).first();
    expect(row.status).toBe("queued");
    expect(row.error).toMatch(/retrying after/);
    await handleProcessSessionJob(ctx.deps, job(2));
    row = await ctx.db("walk_sessions").where({ id }).first();
    expect(row.status).toBe("failed");

    const detail = await request(ctx.app).get(`/api/sessions/${id}`).set("Authorization", `Bearer ${cast.tokens[cast.clinician.id]}`);
    expect(detail.status).toBe(200);
    expect(detail.body.status).toBe("failed");
    expect(detail.body.error).toMatch(/processing failed/);
    expect(detail.body.analysis).toBeUndefined();
    expect(await ctx.db("raw_files").where({ session_id: id }).count<{ n: string }[]>({ n: "*" })).toEqual([{ n: "4" }]);
  });
});

describe("who may do what with sessions", () => {
  let sessionId = "";
  beforeAll(async () => {
    const row = await ctx.db("walk_sessions").where({ patient_id: cast.patient.patientId, status: "done" }).first();
    sessionId = row.id;
  });
  const get = (userId: string, path = "") =>
    request(ctx.app).get(`/api/sessions/${sessionId}${path}`).set("Authorization", `Bearer ${cast.tokens[userId]}`);

  it("the patient and their clinician read it; another patient and another clinician get 404", async () => {
    expect((await get(cast.patient.id)).status).toBe(200);
    expect((await get(cast.clinician.id)).status).toBe(200);
    expect((await get(cast.otherPatient.id)).status).toBe(404);
    expect((await get(cast.otherClinician.id)).status).toBe(404);
    expect((await get(cast.otherClinician.id, "/signal")).status).toBe(404);
  });

  it("researchers and admins are refused (403): sessions are clinical data outside their scopes", async () => {
    expect((await get(cast.researcher.id)).status).toBe(403);
    expect((await get(cast.admin.id)).status).toBe(403);
    expect((await get(cast.admin.id, "/signal")).status).toBe(403);
  });

  it("without a token → 401", async () => {
    expect((await request(ctx.app).get(`/api/sessions/${sessionId}`)).status).toBe(401);
  });

  it("a patient cannot upload for someone else; a clinician only for the caseload; admin and researcher not at all", async () => {
    const files = synthFor(serials, { seed: 51, startUtc: "2026-12-03T07:00:00.000Z" }).files;
    expect((await upload(ctx, cast.tokens[cast.patient.id]!, files, { patientId: cast.otherPatient.patientId! })).status).toBe(404);
    expect((await upload(ctx, cast.tokens[cast.otherClinician.id]!, files, { patientId: cast.patient.patientId! })).status).toBe(404);
    expect((await upload(ctx, cast.tokens[cast.clinician.id]!, files)).status).toBe(400);
    expect((await upload(ctx, cast.tokens[cast.admin.id]!, files, { patientId: cast.patient.patientId! })).status).toBe(403);
    expect((await upload(ctx, cast.tokens[cast.researcher.id]!, files, { patientId: cast.patient.patientId! })).status).toBe(403);
  });

  it("reprocess: clinician of the caseload and admin yes; patient 403; other clinician 404", async () => {
    const post = (userId: string) => request(ctx.app).post(`/api/sessions/${sessionId}/reprocess`).set("Authorization", `Bearer ${cast.tokens[userId]}`);
    expect((await post(cast.patient.id)).status).toBe(403);
    expect((await post(cast.researcher.id)).status).toBe(403);
    expect((await post(cast.otherClinician.id)).status).toBe(404);
    expect((await post(cast.admin.id)).status).toBe(202);
    await processSession(ctx.deps, sessionId);
  });

  it("every session read is audited with the patient", async () => {
    const events = await ctx.db("audit_events").where({ action: "session.read", resource_id: sessionId });
    expect(events.length).toBeGreaterThan(0);
    expect(events.every((e) => e.patient_id === cast.patient.patientId)).toBe(true);
  });
});
