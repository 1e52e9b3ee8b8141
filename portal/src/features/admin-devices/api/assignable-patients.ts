import { queryOptions, useQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "@/lib/api-client";
import { deviceKeys } from "./device-keys";

const patientSchema = z
  .object({
    id: z.string(),
    label: z.string().nullish(),
    displayName: z.string().nullish(),
    pseudonym: z.string().nullish(),
  })
  .transform((p) => ({ id: p.id, label: p.label ?? p.displayName ?? p.pseudonym ?? `Patient ${p.id.slice(0, 8)}` }));

const listSchema = z
  .union([z.array(patientSchema), z.object({ items: z.array(patientSchema) })])
  .transform((v) => (Array.isArray(v) ? v : v.items));

export type AssignablePatient = z.output<typeof patientSchema>;

export function getAssignablePatients(signal?: AbortSignal): Promise<AssignablePatient[]> {
  return api.get("/patients", { schema: listSchema, signal });
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
