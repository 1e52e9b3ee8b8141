import { queryOptions, useQuery } from "@tanstack/react-query";
import { patientIdentityList } from "@pendula/ingest-server/contracts";
import { api } from "@/lib/api-client";
import { deviceKeys } from "./device-keys";

/** A patient the device can be assigned to, as the picker names them (admins see identity only). */
export interface AssignablePatient {
  id: string;
  label: string;
}

export async function getAssignablePatients(signal?: AbortSignal): Promise<AssignablePatient[]> {
  const { items } = await api.get("/patients", { schema: patientIdentityList, signal });
  return items.map((p) => ({ id: p.id, label: p.displayName || `Patient ${p.id.slice(0, 8)}` }));
}

export function assignablePatientsQueryOptions() {
  return queryOptions({
    queryKey: deviceKeys.patients(),
    queryFn: ({ signal }) => getAssignablePatients(signal),
    select: (rows: AssignablePatient[]) => [...rows].sort((a, b) => a.label.localeCompare(b.label)),
  });
}

export function useAssignablePatients() {
  return useQuery(assignablePatientsQueryOptions());
}
