import { z } from "zod";

// Copied from ingest-server/src/contracts/sessions.ts (not yet re-exported by the contracts index);
// `analysis` is left out here: the patient screens only need the status.
export const SESSION_STATUSES = ["queued", "processing", "done", "failed"] as const;

export const uploadResponseSchema = z.object({
  id: z.string(),
  status: z.enum(SESSION_STATUSES),
  duplicate: z.boolean().optional(),
});
export type UploadResponse = z.infer<typeof uploadResponseSchema>;

export const sessionStatusSchema = z.object({
  id: z.string(),
  status: z.enum(SESSION_STATUSES),
  progressPct: z.number().optional(),
  recordedAt: z.string().optional(),
  error: z.string().nullish(),
});
export type SessionStatus = z.infer<typeof sessionStatusSchema>;

export const walkKeys = {
  all: ["patient-walk"] as const,
  sessions: () => [...walkKeys.all, "session"] as const,
  session: (id: string) => [...walkKeys.sessions(), id] as const,
};
