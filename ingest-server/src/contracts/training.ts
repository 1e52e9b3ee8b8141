import { z } from "zod";
import { isoDateTime } from "./common";
import { TRAINING_KINDS } from "./enums";

export const createTraining = z.object({
  performedOn: z.iso.date({ error: "performedOn must be a date (YYYY-MM-DD)" }),
  kind: z.enum(TRAINING_KINDS),
  minutes: z.number().int().min(1).max(600),
  description: z.string().trim().max(2000).optional(),
});

export const trainingEntry = z.strictObject({
  id: z.uuid(),
  patientId: z.uuid(),
  authorId: z.uuid(),
  performedOn: z.iso.date(),
  kind: z.enum(TRAINING_KINDS),
  minutes: z.number().int(),
  description: z.string().nullable(),
  createdAt: isoDateTime,
});

export const trainingList = z.strictObject({ items: z.array(trainingEntry) });
