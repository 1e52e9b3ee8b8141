import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "@/lib/api-client";

// ingest-server/src/contracts/patients.ts `patientSummary` (copied: the contracts index does not
// re-export it yet). `flags` is optional: the server may add the open change flags per patient.
export const CONDITION_LABEL: Record<string, string> = {
  incomplete_sci: "Incomplete SCI",
  stroke: "Stroke",
  parkinsons: "Parkinson's",
  other: "Other",
};

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
    })
    .optional(),
  flags: z.array(z.object({ metricKey: z.string(), flag: z.string() }).catchall(z.unknown())).optional(),
});
export type CaseloadRow = z.infer<typeof caseloadRowSchema>;

export const caseloadKeys = {
  all: ["caseload"] as const,
  list: () => [...caseloadKeys.all, "list"] as const,
};

export const getCaseload = (signal?: AbortSignal) => api.get("/patients", { schema: z.object({ items: z.array(caseloadRowSchema) }), signal });

export const caseloadQueryOptions = () => queryOptions({ queryKey: caseloadKeys.list(), queryFn: ({ signal }) => getCaseload(signal) });

export const useCaseload = () => useSuspenseQuery(caseloadQueryOptions());
