import { queryOptions, useQuery } from "@tanstack/react-query";
import { deviceList, type AssignmentView, type DeviceView } from "@pendula/ingest-server/contracts";
import { api } from "@/lib/api-client";
import { deviceKeys } from "./device-keys";

/** An assignment as the screens use it: a history row, or the device list's current one (which omits the device id). */
export type Assignment = Omit<AssignmentView, "deviceId">;
export type Device = DeviceView;

export function getDevices(signal?: AbortSignal): Promise<Device[]> {
  return api.get("/devices", { schema: deviceList, signal });
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
  return a.patientLabel || `Patient ${a.patientId.slice(0, 8)}`;
}
