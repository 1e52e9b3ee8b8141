import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { isoWeekStart } from "../../../clinical/iso-week";
import { patientTrendData } from "../../../clinical/notifications/repository";
import { createTestContext, type SeededUser, type TestContext } from "../../../testing/harness";
import { insertDoneSession } from "../../../testing/session-fixtures";

/**
 * The enrolment day as the trend page, the caseload's adherence and the clinical e-mails read it,
 * on a server east of UTC. There, a DATE turned into a local-midnight Date lands on the previous
 * UTC day, which moved the enrolment into the ISO week before and made a missed week out of it.
 * Node applies a change of process.env.TZ at once, so this file runs the whole server in Auckland.
 */
const EAST_OF_UTC = "Pacific/Auckland";
const WEEK_MS = 7 * 86_400_000;

let previousTz: string | undefined;
let ctx: TestContext;
let clinician: SeededUser;
let patient: SeededUser;
const now = new Date();
// Enrolled on the Monday two ISO weeks back: a day earlier would be the Sunday of the week before.
const enrolment = new Date(isoWeekStart(now).getTime() - 2 * WEEK_MS);
const enrolledOn = enrolment.toISOString().slice(0, 10);
// One upload (the expected one per week) on the Wednesday of last week, the only ended week after enrolment.
const lastWeekUpload = new Date(isoWeekStart(now).getTime() - WEEK_MS + 2 * 86_400_000 + 10 * 3_600_000).toISOString();

beforeAll(async () => {
  previousTz = process.env.TZ;
  process.env.TZ = EAST_OF_UTC;
  ctx = await createTestContext();
  clinician = await ctx.seedUser({ role: "clinician" });
  patient = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id], patient: { enrolledOn } });
  await insertDoneSession(ctx, patient.patientId!, lastWeekUpload, { cadenceStepsPerMin: 100 });
});

afterAll(async () => {
  await ctx?.close();
  if (previousTz === undefined) delete process.env.TZ;
  else process.env.TZ = previousTz;
});

describe("enrolment day on a server east of UTC", () => {
  it("runs in a zone where local midnight of the enrolment day is still the previous day in UTC", () => {
    const localMidnight = new Date(enrolment.getUTCFullYear(), enrolment.getUTCMonth(), enrolment.getUTCDate());
    expect(localMidnight.getTimezoneOffset()).toBeLessThan(0);
    expect(localMidnight.toISOString().slice(0, 10)).not.toBe(enrolledOn);
  });

  it("reads a DATE column as the stored day", async () => {
    const { rows } = await ctx.db.raw("SELECT ?::date AS day", [enrolledOn]);
    expect(rows[0].day).toBe(enrolledOn);
  });

  it("the trend page, the caseload adherence and the e-mail jobs agree on the enrolment day and week", async () => {
    const auth = { Authorization: `Bearer ${await ctx.tokenFor(clinician)}` };

    // Trend page header (patient read).
    const page = await request(ctx.app).get(`/api/patients/${patient.patientId}`).set(auth);
    expect(page.status).toBe(200);
    expect(page.body.enrolledOn).toBe(enrolledOn);

    // Caseload: the enrolment week is not judged, so last week (met) is the only one counted.
    const caseload = await request(ctx.app).get("/api/patients").set(auth);
    expect(caseload.status).toBe(200);
    const row = caseload.body.items.find((p: { id: string }) => p.id === patient.patientId);
    expect(row.enrolledOn).toBe(enrolledOn);
    expect(row.adherencePct).toBe(100);

    // E-mail jobs: change alerts and digests read the trend data.
    const trendData = await patientTrendData(ctx.db, patient.patientId!);
    expect(trendData?.patient.enrolledOn).toBe(enrolledOn);
  });

  it("a training day (the other DATE column) is answered as entered, on write and on read", async () => {
    const auth = { Authorization: `Bearer ${await ctx.tokenFor(clinician)}` };
    const created = await request(ctx.app)
      .post(`/api/patients/${patient.patientId}/training`)
      .set(auth)
      .send({ performedOn: enrolledOn, kind: "overground", minutes: 20 });
    expect(created.status).toBe(201);
    expect(created.body.performedOn).toBe(enrolledOn);
    const list = await request(ctx.app).get(`/api/patients/${patient.patientId}/training`).set(auth);
    expect(list.status).toBe(200);
    expect(list.body.items.map((t: { performedOn: string }) => t.performedOn)).toEqual([enrolledOn]);
  });
});
