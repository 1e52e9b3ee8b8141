import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import {
  caseloadLinkPage,
  caseloadLinkView,
  createCaseloadLinkRequest,
  endCaseloadLinkRequest,
  patientIdentityList,
  userPage,
  type CaseloadLinkPage,
  type CaseloadLinkView,
  type CreateCaseloadLinkRequest,
  type EndCaseloadLinkRequest,
} from "@pendula/ingest-server/contracts";
import { api, request } from "@/lib/api-client";

export type { CaseloadLinkView } from "@pendula/ingest-server/contracts";
export { createCaseloadLinkRequest, endCaseloadLinkRequest };

export const CASELOAD_LINK_PAGE_SIZE = 25;

export interface CaseloadLinkFilters {
  clinicianId?: string;
  patientId?: string;
  state: "active" | "ended" | "all";
  limit: number;
  offset: number;
}

/** One key factory for the feature: the list pages and the pickers of the "give access" form. */
export const caseloadLinkKeys = {
  all: ["admin-caseloads"] as const,
  lists: () => [...caseloadLinkKeys.all, "list"] as const,
  list: (f: CaseloadLinkFilters) => [...caseloadLinkKeys.lists(), f] as const,
  clinicians: () => [...caseloadLinkKeys.all, "clinicians"] as const,
  patients: () => [...caseloadLinkKeys.all, "patients"] as const,
};

export function getCaseloadLinks(f: CaseloadLinkFilters, signal?: AbortSignal): Promise<CaseloadLinkPage> {
  return api.get("/caseload-links", { query: { ...f }, schema: caseloadLinkPage, signal });
}

export function caseloadLinksQueryOptions(f: CaseloadLinkFilters) {
  return queryOptions({ queryKey: caseloadLinkKeys.list(f), queryFn: ({ signal }) => getCaseloadLinks(f, signal), placeholderData: keepPreviousData });
}

export function useCaseloadLinks(f: CaseloadLinkFilters) {
  return useQuery(caseloadLinksQueryOptions(f));
}

export interface PickerOption {
  id: string;
  label: string;
}

const byLabel = (a: PickerOption, b: PickerOption) => a.label.localeCompare(b.label);

/** Active clinician accounts: the only accounts a link can give access to. */
export function cliniciansQueryOptions() {
  return queryOptions({
    queryKey: caseloadLinkKeys.clinicians(),
    queryFn: ({ signal }) => api.get("/users", { query: { role: "clinician", status: "active", limit: 500 }, schema: userPage, signal }),
    select: (page): PickerOption[] => page.items.map((u) => ({ id: u.id, label: `${u.displayName} (${u.email})` })).sort(byLabel),
  });
}

export function useClinicianOptions() {
  return useQuery(cliniciansQueryOptions());
}

// The admin's patient list (identity only); the picker shows the name.

export function patientsQueryOptions() {
  return queryOptions({
    queryKey: caseloadLinkKeys.patients(),
    queryFn: ({ signal }) => api.get("/patients", { schema: patientIdentityList, signal }),
    select: (page): PickerOption[] => page.items.map((p) => ({ id: p.id, label: p.displayName })).sort(byLabel),
  });
}

export function usePatientOptions() {
  return useQuery(patientsQueryOptions());
}

export function createCaseloadLink(input: CreateCaseloadLinkRequest): Promise<CaseloadLinkView> {
  return request("/caseload-links", { method: "POST", body: input, schema: caseloadLinkView });
}

export function endCaseloadLink(id: string, input: EndCaseloadLinkRequest): Promise<CaseloadLinkView> {
  return request(`/caseload-links/${encodeURIComponent(id)}`, { method: "DELETE", body: input, schema: caseloadLinkView });
}

export function useCreateCaseloadLink() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createCaseloadLink,
    onSettled: () => queryClient.invalidateQueries({ queryKey: caseloadLinkKeys.lists() }),
  });
}

export function useEndCaseloadLink() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id: string; input: EndCaseloadLinkRequest }) => endCaseloadLink(id, input),
    onSettled: () => queryClient.invalidateQueries({ queryKey: caseloadLinkKeys.lists() }),
  });
}
