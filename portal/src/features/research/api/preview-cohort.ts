import { queryOptions, useQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "@/lib/api-client";
import { cohortDefinitionSchema, type CohortDefinition } from "./cohort-definition";
import { researchKeys } from "./research-keys";

export { cohortDefinitionSchema };

// A cell is one condition × age band group. A suppressed cell carries no counts at all: the server
// withholds them, and the portal must not be able to show a number it was never sent.
const previewCellSchema = z.object({
  condition: z.string(),
  ageBand: z.string(),
  suppressed: z.boolean(),
  subjects: z.number().int().nullable().optional(),
  sessions: z.number().int().nullable().optional(),
});

export const cohortPreviewSchema = z.object({
  k: z.number().int().positive().default(5),
  cells: z.array(previewCellSchema),
});

export type CohortPreview = z.infer<typeof cohortPreviewSchema>;
export type CohortPreviewCell = z.infer<typeof previewCellSchema>;

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
