import { queryOptions, useQuery } from "@tanstack/react-query";
import { patientIdentityList, type PatientIdentity } from "@pendula/ingest-server/contracts";
import { api } from "@/lib/api-client";
import { userKeys } from "./user-keys";

/** A patient record the invite form can link an account to (the admin's list: identity only). */
export type PatientRecord = PatientIdentity;

export async function getPatientRecords(signal?: AbortSignal): Promise<PatientRecord[]> {
  return (await api.get("/patients", { schema: patientIdentityList, signal })).items;
}

export function patientRecordsQueryOptions() {
  return queryOptions({
    queryKey: userKeys.patientRecords(),
    queryFn: ({ signal }) => getPatientRecords(signal),
    select: (rows: PatientRecord[]) => [...rows].sort((a, b) => a.displayName.localeCompare(b.displayName)),
  });
}

export function usePatientRecords(enabled = true) {
  return useQuery({ ...patientRecordsQueryOptions(), enabled });
}
