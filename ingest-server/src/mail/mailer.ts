import type { Knex } from "knex";
import nodemailer, { type Transporter } from "nodemailer";
import type { Config } from "../config/env";

export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  html?: string;
  /** What the message is for (invitation, password_reset, change_alert…), kept in outbound_emails. */
  kind: string;
  /** Same key = same message: a second send with it does nothing and returns {sent: false}. */
  idempotencyKey: string;
}

export interface Mailer {
  send(msg: MailMessage): Promise<{ sent: boolean }>;
}

/**
 * SMTP through nodemailer, made idempotent by the unique key of outbound_emails: the row is claimed
 * before the SMTP hand-off, so a retried job (or two racing workers) never sends twice. If SMTP fails
 * the claim is released so a retry can send. A crash between hand-off and bookkeeping leaves the
 * claim in place: we prefer a lost message to a duplicate one (at most once).
 */
export class SmtpMailer implements Mailer {
  private readonly transport: Transporter;

  constructor(
    private readonly db: Knex,
    private readonly smtp: Config["smtp"],
  ) {
    this.transport = nodemailer.createTransport({
      host: smtp.host,
      port: smtp.port,
      // Port 465 is TLS from the first byte; elsewhere STARTTLS is demanded, so a relay (or someone
      // in the middle) that does not offer it makes the send fail instead of going out in clear.
      // Only the local fake in demo mode speaks plain SMTP (config.smtp.requireTls is false then).
      secure: smtp.requireTls && smtp.port === 465,
      requireTLS: smtp.requireTls,
      ignoreTLS: !smtp.requireTls,
      ...(smtp.auth ? { auth: smtp.auth } : {}),
      connectionTimeout: 10_000,
    });
  }

  async send(msg: MailMessage): Promise<{ sent: boolean }> {
    const claimed = await this.db("outbound_emails")
      .insert({ idempotency_key: msg.idempotencyKey, kind: msg.kind, to_address: msg.to, subject: msg.subject })
      .onConflict("idempotency_key")
      .ignore()
      .returning("id");
    const row = claimed[0] as { id: string | number } | undefined;
    if (!row) return { sent: false };
    try {
      await this.transport.sendMail({
        from: this.smtp.from,
        to: msg.to,
        subject: msg.subject,
        text: msg.text,
        ...(msg.html ? { html: msg.html } : {}),
        headers: { "X-Pendula-Kind": msg.kind },
      });
    } catch (err) {
      await this.db("outbound_emails").where({ id: row.id }).delete();
      throw err;
    }
    await this.db("outbound_emails").where({ id: row.id }).update({ sent_at: this.db.fn.now() });
    return { sent: true };
  }

  close(): void {
    this.transport.close();
  }
}
