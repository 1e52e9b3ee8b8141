import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type SeededUser, type TestContext } from "../../../testing/harness";
import { insertDoneSession } from "../../../testing/session-fixtures";
import type { Mailer, MailMessage } from "../../../mail/mailer";
import {
  CLINICAL_QUEUES,
  CLINICAL_SCHEDULES,
  enqueueChangeAlerts,
  ensureClinicalSchedules,
  sendChangeAlerts,
  sendWeeklyDigests,
  sendWeeklyReminders,
  workClinicalJobs,
  type ClinicalDeps,
} from "../jobs";

// Invented scenario: Harrow Lane rehabilitation outpatients (fictional), two physiotherapists.
describe("clinical e-mail jobs against PostgreSQL, pg-boss and the SMTP fake", () => {
  let ctx: TestContext;
  let deps: ClinicalDeps;
  let c1: SeededUser;
  let c2: SeededUser;
  let walker: SeededUser;
  let quiet: SeededUser;
  const sessionIds: string[] = [];

  beforeAll(async () => {
    ctx = await createTestContext();
    deps = ctx.deps;
    c1 = await ctx.seedUser({ role: "clinician", email: "r.okafor@harrow-lane.example.test" });
    c2 = await ctx.seedUser({ role: "clinician", email: "m.ito@harrow-lane.example.test" });
    walker = await ctx.seedUser({
      role: "patient",
      displayName: "Tamsin Quell",
      email: "tamsin.q@example.test",
      patient: { condition: "stroke", enrolledOn: "2026-09-01", birthYear: 1961 },
      caseloadOf: [c1.id, c2.id],
    });
    quiet = await ctx.seedUser({ role: "patient", email: "orrin.v@example.test", caseloadOf: [c1.id], patient: { enrolledOn: "2026-09-01" } });
    // Weekly Mondays from 2026-09-07; stride CV baseline [2.1, 2.3, 2.2] (MDC95 0.277), then 2.25 (within error), 3.4 (worsened).
    const cv = [2.1, 2.3, 2.2, 2.25, 3.4];
    for (let i = 0; i < cv.length; i++) {
      const at = new Date(Date.parse("2026-09-07T10:00:00Z") + i * 7 * 86_400_000).toISOString();
      sessionIds.push(await insertDoneSession(ctx, walker.patientId!, at, { strideTimeCvPct: cv[i]!, cadenceStepsPerMin: 95 }));
    }
  });

  afterAll(async () => {
    await ctx?.close();
  });

  it("sends no alert for a session within error", async () => {
    expect(await sendChangeAlerts(deps, sessionIds[3]!)).toEqual({ planned: 0, sent: 0 });
  });

  it("alerts both clinicians once for a worsened session; a retry sends nothing", async () => {
    ctx.mailbox.clear();
    expect(await sendChangeAlerts(deps, sessionIds[4]!)).toEqual({ planned: 2, sent: 2 });
    expect(await sendChangeAlerts(deps, sessionIds[4]!)).toEqual({ planned: 2, sent: 0 });
    await ctx.mailbox.waitFor(() => ctx.mailbox.messages().length >= 2);
    const msgs = ctx.mailbox.messages();
    expect(msgs.map((m) => m.to[0]).sort()).toEqual([c2.email, c1.email].sort());
    for (const m of msgs) {
      expect(m.text).toContain(`${ctx.config.publicUrl}/clinician/patients/${walker.patientId}`);
      expect(m.text + m.subject).not.toMatch(/Tamsin|Quell|3\.4|2\.2|stride|cadence|%/);
    }
    const rows = await ctx.db("outbound_emails").where("idempotency_key", "like", `alert:${sessionIds[4]}:%`);
    expect(rows).toHaveLength(2);
  });

  it("a job that failed after its first e-mail sends only the missing one when retried", async () => {
    const sid = await insertDoneSession(ctx, walker.patientId!, "2026-10-12T10:00:00Z", { strideTimeCvPct: 3.6 });
    let calls = 0;
    const flaky: Mailer = {
      async send(msg: MailMessage) {
        calls++;
        if (calls === 2) throw new Error("SMTP connection reset");
        return deps.mailer.send(msg);
      },
    };
    await expect(sendChangeAlerts({ ...deps, mailer: flaky }, sid)).rejects.toThrow(/reset/);
    expect(await sendChangeAlerts(deps, sid)).toEqual({ planned: 2, sent: 1 });
    expect(await ctx.db("outbound_emails").where("idempotency_key", "like", `alert:${sid}:%`).whereNotNull("sent_at")).toHaveLength(2);
  });

  it("reminds only the patient with no upload this week, once per ISO week", async () => {
    ctx.mailbox.clear();
    const thursday = new Date("2026-10-15T09:00:00Z"); // W42: walker uploaded on Monday 10-12, quiet did not
    expect(await sendWeeklyReminders(deps, thursday)).toEqual({ planned: 1, sent: 1 });
    expect(await sendWeeklyReminders(deps, thursday)).toEqual({ planned: 1, sent: 0 });
    const m = await ctx.mailbox.waitFor((x) => x.to.includes(quiet.email));
    expect(m.subject).toMatch(/walking test/);
    expect(await ctx.db("outbound_emails").where({ idempotency_key: `reminder:${quiet.id}:2026-W42` })).toHaveLength(1);
  });

  it("sends each clinician a counts-only digest for the week that ended, once", async () => {
    ctx.mailbox.clear();
    const monday = new Date("2026-10-12T07:00:00Z"); // digest for W41 (session 5: worsened)
    expect(await sendWeeklyDigests(deps, monday)).toEqual({ planned: 2, sent: 2 });
    expect(await sendWeeklyDigests(deps, monday)).toEqual({ planned: 2, sent: 0 });
    const m = await ctx.mailbox.waitFor((x) => x.to.includes(c1.email) && /W41/.test(x.subject));
    expect(m.text).toContain("- patients: 2");
    expect(m.text).toContain("- walking-test sessions recorded: 1");
    expect(m.text).toContain("- sessions suggested for review: 1");
    expect(m.text).toContain("- patients with fewer uploads than expected: 1");
    expect(m.text).not.toMatch(/Tamsin|Orrin/);
  });

  it("judges a session recorded with microsecond precision against the sessions up to and including it", async () => {
    const sid = await insertDoneSession(ctx, walker.patientId!, "2026-10-13T10:00:00.123456Z", { strideTimeCvPct: 3.7 });
    expect((await sendChangeAlerts(deps, sid)).planned).toBe(2);
  });

  it("runs the alert through the queue: enqueue twice, one e-mail per clinician", async () => {
    const sid = await insertDoneSession(ctx, walker.patientId!, "2026-10-19T10:00:00Z", { strideTimeCvPct: 3.8 });
    ctx.mailbox.clear();
    await enqueueChangeAlerts(deps, sid);
    await enqueueChangeAlerts(deps, sid);
    await workClinicalJobs(deps);
    await ctx.mailbox.waitFor(() => ctx.mailbox.messages().length >= 2, 30_000);
    // Give a possible duplicate job time to run before counting.
    await new Promise((r) => setTimeout(r, 3000));
    expect(ctx.mailbox.messages().filter((m) => m.text.includes(walker.patientId!))).toHaveLength(2);
  });

  it("writes the cron schedules idempotently", async () => {
    await ensureClinicalSchedules(ctx.config);
    await ensureClinicalSchedules(ctx.config);
    const rows = await ctx.db.withSchema(ctx.config.queueSchema).table("schedule").select("name", "cron").orderBy("name");
    expect(rows).toEqual(
      CLINICAL_SCHEDULES.map((s) => ({ name: s.name, cron: s.cron })).sort((a, b) => a.name.localeCompare(b.name)),
    );
    expect(Object.values(CLINICAL_QUEUES)).toContain("clinical-change");
  });
});
