import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { auditEventView } from "../../../contracts/audit";
import { createTestContext, type SeededUser, type TestContext } from "../../../testing/harness";
import { auditViewForAdmin } from "../audit-view";

let ctx: TestContext;
let admin: SeededUser;
let adminToken: string;
beforeAll(async () => {
  ctx = await createTestContext();
  admin = await ctx.seedUser({ role: "admin" });
  adminToken = await ctx.tokenFor(admin);
});
afterAll(() => ctx?.close());

const count = async () => Number((await ctx.db("audit_events").count<{ n: string }[]>({ n: "*" }))[0]!.n);

describe("audit_events is append-only for the application", () => {
  it("UPDATE, DELETE and TRUNCATE through the application's connection fail and change nothing; INSERT works", async () => {
    await ctx.db("audit_events").insert({ action: "test.append_only", resource_type: "test", ip: "127.0.0.7" });
    const before = await count();
    const row = await ctx.db("audit_events").where({ action: "test.append_only" }).first();

    await expect(ctx.db("audit_events").where({ id: row.id }).update({ ip: "10.0.0.1" })).rejects.toThrow(/append-only: UPDATE refused/);
    await expect(ctx.db("audit_events").where({ id: row.id }).delete()).rejects.toThrow(/append-only: DELETE refused/);
    // Refused even when nothing matches, so an attempt cannot pass for a no-op.
    await expect(ctx.db("audit_events").whereRaw("false").delete()).rejects.toThrow(/append-only/);
    await expect(ctx.db.raw("TRUNCATE audit_events")).rejects.toThrow(/append-only: TRUNCATE refused/);
    await expect(ctx.db.transaction((trx) => trx("audit_events").update({ details: null }))).rejects.toThrow(/append-only/);

    expect(await count()).toBe(before);
    expect((await ctx.db("audit_events").where({ id: row.id }).first()).ip).toBe("127.0.0.7");
  });

  it("deleting an account or patient with a history is refused instead of blanking its audit rows", async () => {
    const clinician = await ctx.seedUser({ role: "clinician" });
    const patientId = await ctx.seedPatient();
    await ctx.db("audit_events").insert({ actor_id: clinician.id, patient_id: patientId, action: "test.history", resource_type: "test" });
    await expect(ctx.db("users").where({ id: clinician.id }).delete()).rejects.toThrow(/foreign key/);
    await expect(ctx.db("patients").where({ id: patientId }).delete()).rejects.toThrow(/foreign key/);
    expect(await ctx.db("audit_events").where({ action: "test.history" }).first()).toMatchObject({ actor_id: clinician.id, patient_id: patientId });
  });
});

describe("the admin's audit answer", () => {
  it("leaves out a patient's network address and browser, and training and walking-aid details, and says so", async () => {
    const clinician = await ctx.seedUser({ role: "clinician" });
    const patient = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id] });
    await ctx.login(patient.email, patient.password);
    await ctx.login(clinician.email, clinician.password);
    const training = await request(ctx.app)
      .post(`/api/patients/${patient.patientId}/training`)
      .set("Authorization", `Bearer ${await ctx.tokenFor(clinician)}`)
      .set("User-Agent", "ward-tablet")
      .send({ performedOn: "2026-11-30", kind: "treadmill", minutes: 25 });
    expect(training.status).toBe(201);

    const stored = await ctx.db("audit_events").where({ actor_id: patient.id }).whereNotNull("ip").first();
    expect(stored.ip).toBeTruthy(); // the stored row keeps the address
    const storedTraining = await ctx.db("audit_events").where({ action: "training.create" }).first();
    expect(storedTraining.details).toEqual({ kind: "treadmill", minutes: 25 });

    const asAdmin = (q: string) => request(ctx.app).get(`/api/audit?${q}`).set("Authorization", `Bearer ${adminToken}`);
    const patientRows = (await asAdmin(`actorId=${patient.id}`)).body.items;
    expect(patientRows.length).toBeGreaterThan(0);
    for (const e of patientRows) {
      expect(e).toMatchObject({ actorRole: "patient", ip: null, userAgent: null });
      expect(e.withheld).toEqual(expect.arrayContaining(["ip"]));
    }
    const [trainingRow] = (await asAdmin("action=training.create")).body.items;
    expect(trainingRow).toMatchObject({ actorRole: "clinician", details: null, withheld: ["details"], userAgent: "ward-tablet" });
    const clinicianSignIn = (await asAdmin(`actorId=${clinician.id}&action=auth.`)).body.items[0];
    expect(clinicianSignIn.ip).toBeTruthy();
    expect(clinicianSignIn.withheld).toEqual([]);
  });

  it("the contract itself refuses an answer that carries a patient's address or a training detail", () => {
    const base = {
      id: "1",
      at: "2026-12-01T10:00:00Z",
      actorId: null,
      actorEmail: null,
      resourceType: "patient",
      resourceId: null,
      patientId: null,
      userAgent: null,
      details: null,
      withheld: [],
    };
    expect(auditEventView.safeParse({ ...base, actorRole: "patient", action: "auth.login", ip: "192.0.2.1" }).success).toBe(false);
    expect(auditEventView.safeParse({ ...base, actorRole: "clinician", action: "training.create", ip: null, details: { minutes: 5 } }).success).toBe(false);
    expect(auditEventView.safeParse({ ...base, actorRole: "clinician", action: "session.update", ip: null, details: { walkingAid: {} } }).success).toBe(false);
    expect(auditEventView.safeParse({ ...base, actorRole: "clinician", action: "auth.login", ip: "192.0.2.1" }).success).toBe(true);
  });

  it("auditViewForAdmin names only what it actually left out", () => {
    const e = {
      id: "2",
      at: "2026-12-01T10:00:00Z",
      actorId: null,
      actorRole: "patient",
      actorEmail: null,
      action: "session.update",
      resourceType: "session",
      resourceId: null,
      patientId: null,
      ip: null,
      userAgent: "phone",
      details: { walkingAid: { from: null, to: "cane" } },
    };
    expect(auditViewForAdmin(e, true)).toMatchObject({ ip: null, userAgent: null, details: null, withheld: ["userAgent", "details"] });
    expect(auditViewForAdmin({ ...e, action: "session.upload" }, false)).toMatchObject({ userAgent: "phone", details: e.details, withheld: [] });
  });
});
