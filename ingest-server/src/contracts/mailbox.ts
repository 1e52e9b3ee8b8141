import { z } from "zod";

export const capturedMessage = z.object({
  id: z.string(),
  receivedAt: z.string(),
  from: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  text: z.string(),
  html: z.string().nullable(),
});
export const mailboxResponse = z.object({ messages: z.array(capturedMessage) });
export type MailboxResponse = z.infer<typeof mailboxResponse>;
