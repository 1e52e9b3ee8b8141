import { z } from "zod";

// Parsed once at start-up so a misconfigured build fails loudly with every problem listed,
// instead of a half-working app that calls the wrong server.
const EnvSchema = z.object({
  API_BASE_URL: z
    .string()
    .min(1)
    .refine((v) => v.startsWith("/") || /^https?:\/\//.test(v), "must be a path (/api) or an http(s) URL")
    .transform((v) => v.replace(/\/+$/, "")),
  SESSION_POLL_MS: z.coerce.number().int().min(250).max(60_000),
  MODE: z.enum(["development", "production", "test"]),
});

export type Env = z.infer<typeof EnvSchema>;

export function parseEnv(raw: Record<string, unknown>): Env {
  const result = EnvSchema.safeParse({
    API_BASE_URL: raw.VITE_API_BASE_URL ?? "/api",
    SESSION_POLL_MS: raw.VITE_SESSION_POLL_MS ?? 1500,
    MODE: raw.MODE ?? "development",
  });
  if (!result.success) {
    const problems = result.error.issues.map((i) => `- ${i.path.join(".") || "(root)"}: ${i.message}`).join("\n");
    throw new Error(`Pendula portal configuration is invalid:\n${problems}`);
  }
  return result.data;
}

export const env = parseEnv(import.meta.env as Record<string, unknown>);
