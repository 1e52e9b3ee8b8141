import { z } from "zod";

export const capturedMessage = z.strictObject({
  id: z.string(),
  receivedAt: z.string(),
  from: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  text: z.string(),
  html: z.string().nullable(),
  /** The message's string headers as the fake captured them (e.g. X-Pendula-Kind). */
  headers: z.record(z.string(), z.string()),
});
export const mailboxResponse = z.strictObject({ messages: z.array(capturedMessage) });
export type MailboxResponse = z.infer<typeof mailboxResponse>;
