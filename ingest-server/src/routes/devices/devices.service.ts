import type { Request } from "express";
import type { z } from "zod";
import type { AppDeps } from "../../deps";
import type { createDeviceRequest, DeviceView, listDevicesQuery, updateDeviceRequest } from "../../contracts/devices";
import { audit } from "../../audit/audit";
import { HttpError, notFound } from "../../http-error";
import { devicesRepository as repo, toDeviceView } from "./devices.repository";

const isUniqueViolation = (err: unknown) => (err as { code?: string })?.code === "23505";

export async function getDevice({ db }: AppDeps, id: string): Promise<DeviceView> {
  const row = await repo.get(db, id);
  if (!row) throw notFound("device");
  return toDeviceView(row);
}

export async function listDevices({ db }: AppDeps, f: z.output<typeof listDevicesQuery>): Promise<DeviceView[]> {
  return (await repo.list(db, f)).map(toDeviceView);
}

export async function createDevice(deps: AppDeps, input: z.output<typeof createDeviceRequest>, req: Request): Promise<DeviceView> {
  let id: string;
  try {
    id = await deps.db.transaction(async (trx) => {
      const newId = await repo.insert(trx, {
        serial: input.serial,
        kind: input.kind,
        firmware: input.firmware,
        acc_range_g: input.accRangeG,
        gyro_range_dps: input.gyroRangeDps,
        notes: input.notes ?? null,
      });
      await audit(trx, req, { action: "device.create", resourceType: "device", resourceId: newId, details: { serial: input.serial } });
      return newId;
    });
  } catch (err) {
    if (isUniqueViolation(err)) throw new HttpError(409, "serial_taken", `a device with serial ${input.serial} already exists`);
    throw err;
  }
  return getDevice(deps, id);
}

export async function updateDevice(deps: AppDeps, id: string, change: z.output<typeof updateDeviceRequest>, req: Request): Promise<DeviceView> {
  await deps.db.transaction(async (trx) => {
    const before = await repo.lockForChange(trx, id);
    if (!before) throw notFound("device");
    if (change.status === "assigned" || (change.status === "in_stock" && before.status !== "in_stock")) {
      // in_stock/assigned follow the assignments; setting them by hand would contradict them.
      const active = await repo.hasAssignmentInForce(trx, id);
      if (change.status === "assigned" && !active) {
        throw new HttpError(409, "status_follows_assignments", "a device becomes assigned by assigning it to a patient");
      }
      if (change.status === "in_stock" && active) {
        throw new HttpError(409, "status_follows_assignments", "end the device's current assignment first");
      }
    }
    if ((change.status === "retired" || change.status === "maintenance") && before.status === "assigned") {
      throw new HttpError(409, "device_in_use", "end the device's current assignment before taking it out of service");
    }
    const patch: Record<string, unknown> = {};
    if (change.status !== undefined) patch.status = change.status;
    if (change.firmware !== undefined) patch.firmware = change.firmware;
    if (change.notes !== undefined) patch.notes = change.notes;
    await repo.update(trx, id, patch);
    if (change.status === "in_stock") await repo.syncStatus(trx, id);
    const changed: Record<string, { from: unknown; to: unknown }> = {};
    for (const k of ["status", "firmware"] as const) {
      if (change[k] !== undefined && change[k] !== before[k]) changed[k] = { from: before[k], to: change[k] };
    }
    if (change.notes !== undefined) changed.notes = { from: "(changed)", to: "(changed)" };
    await audit(trx, req, { action: "device.update", resourceType: "device", resourceId: id, details: { changed } });
  });
  return getDevice(deps, id);
}
