import { queryOptions, useQuery } from "@tanstack/react-query";
import type { z } from "zod";
import { cohortPreview } from "@pendula/ingest-server/contracts";
import { api } from "@/lib/api-client";
import { cohortDefinitionSchema, type CohortDefinition } from "./cohort-definition";
import { researchKeys } from "./research-keys";

export { cohortDefinitionSchema };

// The server's own contract: a suppressed cell carries null counts, so the portal cannot show a
// number it was never sent.
export const cohortPreviewSchema = cohortPreview;

export type CohortPreview = z.infer<typeof cohortPreview>;
export type CohortPreviewCell = CohortPreview["cells"][number];

export function previewCohort(definition: CohortDefinition, signal?: AbortSignal): Promise<CohortPreview> {
  return api.post("/research/cohorts", definition, { schema: cohortPreviewSchema, signal });
}

export function cohortPreviewQueryOptions(definition: CohortDefinition) {
  return queryOptions({
    queryKey: researchKeys.preview(definition),
    queryFn: ({ signal }) => previewCohort(definition, signal),
  });
}

/** The preview of a submitted definition; nothing is asked until a definition is submitted. */
export function useCohortPreview(definition: CohortDefinition | null) {
  return useQuery({
    ...cohortPreviewQueryOptions(definition ?? { conditions: [], ageBands: [], weeksSinceEnrolment: { from: 0, to: 0 }, metrics: [] }),
    enabled: definition !== null,
  });
}
