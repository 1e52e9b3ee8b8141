import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import { consentState, type RecordConsentRequest } from "@pendula/ingest-server/contracts";
import { api } from "@/lib/api-client";

export type ConsentState = z.infer<typeof consentState>;
export type ConsentEvent = ConsentState["events"][number];

/** One key factory for research consent: the patient's page and the staff history share it. */
export const consentKeys = {
  all: ["research-consent"] as const,
  patient: (patientId: string) => [...consentKeys.all, patientId] as const,
};

export function fetchConsent(patientId: string, signal?: AbortSignal): Promise<ConsentState> {
  return api.get(`/consent/patients/${patientId}`, { schema: consentState, signal });
}

export function consentQueryOptions(patientId: string) {
  return queryOptions({ queryKey: consentKeys.patient(patientId), queryFn: ({ signal }) => fetchConsent(patientId, signal) });
}

export function useConsent(patientId: string) {
  return useQuery(consentQueryOptions(patientId));
}

export function recordConsent(patientId: string, body: RecordConsentRequest): Promise<ConsentState> {
  return api.post(`/consent/patients/${patientId}/events`, body, { schema: consentState });
}

export function useRecordConsent(patientId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationKey: [...consentKeys.patient(patientId), "record"],
    mutationFn: (body: RecordConsentRequest) => recordConsent(patientId, body),
    onSuccess: (state) => client.setQueryData(consentKeys.patient(patientId), state),
  });
}
