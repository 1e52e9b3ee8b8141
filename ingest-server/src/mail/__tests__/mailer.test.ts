import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { SmtpMailer } from "../mailer";
import { createTestContext, type TestContext } from "../../testing/harness";

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext();
});
afterAll(() => ctx?.close());

const message = (key: string) => ({
  to: "ward.nurse@example.test",
  subject: `Message ${key}`,
  text: "Plain text body",
  html: "<p>HTML body</p>",
  kind: "test",
  idempotencyKey: key,
});

describe("SmtpMailer", () => {
  it("delivers to SMTP and records the message in outbound_emails", async () => {
    expect(await ctx.deps.mailer.send(message("k-deliver"))).toEqual({ sent: true });
    const got = await ctx.mailbox.waitFor((m) => m.subject === "Message k-deliver");
    expect(got.to).toEqual(["ward.nurse@example.test"]);
    expect(got.text.trim()).toBe("Plain text body");
    expect(got.html).toContain("<p>HTML body</p>");
    const row = await ctx.db("outbound_emails").where({ idempotency_key: "k-deliver" }).first();
    expect(row.sent_at).not.toBeNull();
  });

  it("sends a message once when the same idempotency key is used twice, even concurrently", async () => {
    const first = await ctx.deps.mailer.send(message("k-once"));
    const again = await Promise.all([ctx.deps.mailer.send(message("k-once")), ctx.deps.mailer.send(message("k-once"))]);
    expect(first.sent).toBe(true);
    expect(again.map((r) => r.sent)).toEqual([false, false]);
    await ctx.mailbox.waitFor((m) => m.subject === "Message k-once");
    await new Promise((r) => setTimeout(r, 200));
    expect(ctx.mailbox.messages().filter((m) => m.subject === "Message k-once")).toHaveLength(1);
  });

  it("releases the claim when SMTP is unreachable so a retry can still send", async () => {
    const dead = new SmtpMailer(ctx.db, { host: "127.0.0.1", port: 1, from: "x@example.test", requireTls: false });
    await expect(dead.send(message("k-retry"))).rejects.toThrow();
    expect(await ctx.db("outbound_emails").where({ idempotency_key: "k-retry" }).first()).toBeUndefined();
    dead.close();
    expect(await ctx.deps.mailer.send(message("k-retry"))).toEqual({ sent: true });
  });

  it("refuses to send in clear when TLS is required and the server offers no STARTTLS", async () => {
    // The fake disables STARTTLS, as a relay without TLS (or an attacker stripping it) would.
    const strict = new SmtpMailer(ctx.db, { ...ctx.config.smtp, requireTls: true });
    try {
      await expect(strict.send(message("k-tls"))).rejects.toThrow(/STARTTLS/);
      expect(await ctx.db("outbound_emails").where({ idempotency_key: "k-tls" }).first()).toBeUndefined();
      await new Promise((r) => setTimeout(r, 100));
      expect(ctx.mailbox.messages().filter((m) => m.subject === "Message k-tls")).toHaveLength(0);
    } finally {
      strict.close();
    }
  });
});
