import { z } from "zod";
import { isoDateTime } from "./common";

export const createNote = z.object({
  body: z.string().trim().min(1, { error: "body must not be empty" }).max(10_000),
  sessionId: z.uuid().optional(),
});

export const note = z.strictObject({
  id: z.uuid(),
  patientId: z.uuid(),
  sessionId: z.uuid().nullable(),
  authorId: z.uuid(),
  authorName: z.string(),
  body: z.string(),
  createdAt: isoDateTime,
});

export const noteList = z.strictObject({ items: z.array(note) });
