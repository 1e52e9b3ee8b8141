import { queryOptions, useQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "@/lib/api-client";
import { deviceKeys } from "./device-keys";

export const assignmentSchema = z.object({
  id: z.string(),
  patientId: z.string(),
  patientLabel: z.string().nullish(),
  placement: z.string(),
  from: z.string(),
  to: z.string().nullable(),
});

export const deviceSchema = z.object({
  id: z.string(),
  serial: z.string(),
  kind: z.string(),
  status: z.string(),
  firmware: z.string().nullish(),
  assignment: assignmentSchema.nullable(),
});

export type Assignment = z.infer<typeof assignmentSchema>;
export type Device = z.infer<typeof deviceSchema>;

export function getDevices(signal?: AbortSignal): Promise<Device[]> {
  return api.get("/devices", { schema: z.array(deviceSchema), signal });
}

export function devicesQueryOptions() {
  return queryOptions({ queryKey: deviceKeys.lists(), queryFn: ({ signal }) => getDevices(signal) });
}

export function useDevices() {
  return useQuery(devicesQueryOptions());
}

/** One device out of the inventory list: the list already carries everything the device page shows. */
export function useDevice(deviceId: string) {
  return useQuery({ ...devicesQueryOptions(), select: (devices) => devices.find((d) => d.id === deviceId) ?? null });
}

/** Human label for a patient in admin screens, which never show clinical detail. */
export function patientText(a: Pick<Assignment, "patientId" | "patientLabel">): string {
  return a.patientLabel ?? `Patient ${a.patientId.slice(0, 8)}`;
}
