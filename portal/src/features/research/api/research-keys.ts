import type { CohortDefinition } from "./cohort-definition";

/** One hierarchical key factory for the research feature: invalidating `all` refreshes every preview. */
export const researchKeys = {
  all: ["research"] as const,
  previews: () => [...researchKeys.all, "preview"] as const,
  preview: (definition: CohortDefinition) => [...researchKeys.previews(), definition] as const,
};
