import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "@/lib/api-client";

// ingest-server/src/contracts/patients.ts `patientSummary` (copied: the contracts index does not
// re-export it yet). `flags` is optional: the server may add the open change flags per patient.
export const caseloadRowSchema = z.object({
  id: z.string(),
  displayName: z.string(),
  researchId: z.string().optional(),
  condition: z.string().optional(),
  lastUploadAt: z.string().nullish(),
  adherencePct: z.number().nullish(),
  expectedUploadsPerWeek: z.number().optional(),
  latest: z
    .object({
      sessionId: z.string().nullish(),
      cadenceStepsPerMin: z.number().nullish(),
      strideTimeCvPct: z.number().nullish(),
      phaseCoordinationIndexPct: z.number().nullish(),
      walkingSpeedMPerS: z.number().nullish(),
    })
    .optional(),
  flags: z
    .array(
      z
        .object({ metricKey: z.string(), flag: z.string(), kind: z.string().optional(), label: z.string().optional(), severity: z.number().optional() })
        .catchall(z.unknown()),
    )
    .optional(),
});
export type CaseloadRow = z.infer<typeof caseloadRowSchema>;

/**
 * A caseload flag with its words and urgency. The server names them (ingest-server
 * clinical/caseload-flags.ts); these fallbacks only cover an answer without names.
 */
export interface NamedFlag {
  metricKey: string;
  flag: string;
  kind: string;
  label: string;
  severity: number;
}

const FALLBACK: Record<string, { kind: string; severity: number; words: string }> = {
  worsened: { kind: "worsened", severity: 50, words: "worse than baseline" },
  improved: { kind: "improved", severity: 10, words: "better than baseline" },
};

export function namedFlag(f: NonNullable<CaseloadRow["flags"]>[number]): NamedFlag {
  const fb = FALLBACK[f.flag];
  return {
    metricKey: f.metricKey,
    flag: f.flag,
    kind: f.kind ?? fb?.kind ?? "other",
    label: f.label ?? `${f.metricKey}: ${fb?.words ?? f.flag}`,
    severity: f.severity ?? fb?.severity ?? 20,
  };
}

/** Most urgent first; ties keep the server's order. */
export function orderedFlags(flags: NonNullable<CaseloadRow["flags"]>): NamedFlag[] {
  return flags
    .map(namedFlag)
    .map((f, i) => ({ f, i }))
    .sort((a, b) => b.f.severity - a.f.severity || a.i - b.i)
    .map(({ f }) => f);
}

/** Sort key for the flags column: the worst flag's severity, then the number of flags. */
export function flagRank(flags: NonNullable<CaseloadRow["flags"]>): number {
  const named = flags.map(namedFlag);
  return named.length ? Math.max(...named.map((f) => f.severity)) * 1000 + named.length : 0;
}

export const caseloadKeys = {
  all: ["caseload"] as const,
  list: () => [...caseloadKeys.all, "list"] as const,
};

export const getCaseload = (signal?: AbortSignal) => api.get("/patients", { schema: z.object({ items: z.array(caseloadRowSchema) }), signal });

export const caseloadQueryOptions = () => queryOptions({ queryKey: caseloadKeys.list(), queryFn: ({ signal }) => getCaseload(signal) });

export const useCaseload = () => useSuspenseQuery(caseloadQueryOptions());
