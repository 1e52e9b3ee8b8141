import type { CohortDefinition } from "./cohort-definition";

/** One hierarchical key factory for the research feature: invalidating `all` refreshes every preview and project list. */
export const researchKeys = {
  all: ["research"] as const,
  previews: () => [...researchKeys.all, "preview"] as const,
  preview: (definition: CohortDefinition) => [...researchKeys.previews(), definition] as const,
  projects: () => [...researchKeys.all, "projects"] as const,
  exportRules: () => [...researchKeys.all, "export-rules"] as const,
};
