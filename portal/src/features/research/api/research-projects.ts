import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import { createResearchProjectRequest, researchProject, researchProjectList } from "@pendula/ingest-server/contracts";
import { api } from "@/lib/api-client";
import { researchKeys } from "./research-keys";

export type ResearchProject = z.infer<typeof researchProject>;
export type NewResearchProject = z.input<typeof createResearchProjectRequest>;
/** The server's own rule for a project name and purpose, so the form says what is wrong before sending. */
export const newProjectSchema = createResearchProjectRequest;

export function fetchResearchProjects(signal?: AbortSignal): Promise<ResearchProject[]> {
  return api.get("/research/projects", { schema: researchProjectList, signal }).then((r) => r.items);
}

export function researchProjectsQueryOptions() {
  return queryOptions({ queryKey: researchKeys.projects(), queryFn: ({ signal }) => fetchResearchProjects(signal) });
}

export function useResearchProjects() {
  return useQuery(researchProjectsQueryOptions());
}

export function createResearchProject(body: NewResearchProject): Promise<ResearchProject> {
  return api.post("/research/projects", body, { schema: researchProject });
}

export function useCreateResearchProject() {
  const client = useQueryClient();
  return useMutation({
    mutationKey: [...researchKeys.projects(), "create"],
    mutationFn: createResearchProject,
    onSuccess: () => client.invalidateQueries({ queryKey: researchKeys.projects() }),
  });
}
