import { queryOptions, useQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "@/lib/api-client";
import { userKeys } from "./user-keys";

// Only what the invite form needs to link an account to an existing patient record.
const patientRecord = z.object({ id: z.string(), displayName: z.string() });
const patientRecords = z.object({ items: z.array(patientRecord) }).transform((v) => v.items);

export type PatientRecord = z.infer<typeof patientRecord>;

export function getPatientRecords(signal?: AbortSignal): Promise<PatientRecord[]> {
  return api.get("/patients", { schema: patientRecords, signal });
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
