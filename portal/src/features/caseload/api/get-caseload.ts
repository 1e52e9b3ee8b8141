import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { caseloadList, type PatientSummary } from "@pendula/ingest-server/contracts";
import { api } from "@/lib/api-client";

/** A clinician's caseload row: GET /api/patients (contracts `patientSummary`). */
export type CaseloadRow = PatientSummary;

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

export const getCaseload = (signal?: AbortSignal) => api.get("/patients", { schema: caseloadList, signal });

export const caseloadQueryOptions = () => queryOptions({ queryKey: caseloadKeys.list(), queryFn: ({ signal }) => getCaseload(signal) });

export const useCaseload = () => useSuspenseQuery(caseloadQueryOptions());
