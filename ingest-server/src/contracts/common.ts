import { z } from "zod";

export const uuid = z.uuid();
export const idParams = z.object({ id: z.uuid({ error: "id must be a UUID" }) });
export const isoDateTime = z.iso.datetime({ offset: true });

export const errorBody = z.strictObject({
  error: z.strictObject({ code: z.string(), message: z.string(), details: z.unknown().optional() }),
});
export type ErrorBody = z.infer<typeof errorBody>;

export const paging = z.object({
  limit: z.coerce.number().int().min(1).max(500).default(50),
  offset: z.coerce.number().int().min(0).max(1_000_000).default(0),
});

export const page = <T extends z.ZodType>(item: T) =>
  z.strictObject({ items: z.array(item), total: z.number().int(), limit: z.number().int(), offset: z.number().int() });

export const email = z
  .email({ error: "a valid e-mail address is required" })
  .max(254)
  .transform((s) => s.trim().toLowerCase());

// Length bounds only: bcrypt reads at most 72 bytes, so a longer password would be silently truncated.
export const newPassword = z
  .string()
  .min(10, { error: "password must be at least 10 characters" })
  .refine((s) => new TextEncoder().encode(s).length <= 72, { error: "password must be at most 72 bytes" });
