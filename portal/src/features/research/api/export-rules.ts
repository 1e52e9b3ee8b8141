import { queryOptions, useQuery } from "@tanstack/react-query";
import type { z } from "zod";
import { exportRules } from "@pendula/ingest-server/contracts";
import { api } from "@/lib/api-client";
import { researchKeys } from "./research-keys";

/** The server's rounding table and study clock: the screen shows the rules the export really applies. */
export type ExportRules = z.infer<typeof exportRules>;

export function exportRulesQueryOptions() {
  return queryOptions({
    queryKey: researchKeys.exportRules(),
    queryFn: ({ signal }) => api.get("/research/export-rules", { schema: exportRules, signal }),
    staleTime: Infinity,
  });
}

export function useExportRules() {
  return useQuery(exportRulesQueryOptions());
}
