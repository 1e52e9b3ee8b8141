import { z } from "zod";
import { isoDateTime } from "./common";
import { DEVICE_KINDS, DEVICE_STATUSES, PLACEMENTS } from "./enums";

export const assignmentView = z.strictObject({
  id: z.uuid(),
  deviceId: z.uuid(),
  patientId: z.uuid(),
  patientLabel: z.string(),
  placement: z.enum(PLACEMENTS),
  from: isoDateTime,
  to: isoDateTime.nullable(),
});
export type AssignmentView = z.infer<typeof assignmentView>;

/** Device list entry. `assignment` is the one active now (null when the device is on no one). */
export const deviceView = z.strictObject({
  id: z.uuid(),
  serial: z.string(),
  kind: z.enum(DEVICE_KINDS),
  status: z.enum(DEVICE_STATUSES),
  firmware: z.string(),
  accRangeG: z.number(),
  gyroRangeDps: z.number(),
  notes: z.string().nullable(),
  assignment: assignmentView.omit({ deviceId: true }).nullable(),
});
export type DeviceView = z.infer<typeof deviceView>;
export const deviceList = z.array(deviceView);

const serial = z
  .string()
  .trim()
  .min(3)
  .max(40)
  .regex(/^[A-Za-z0-9][A-Za-z0-9._-]*$/, { error: "serial may hold letters, digits, '.', '_' and '-'" });
const firmware = z.string().trim().min(1).max(40);

export const listDevicesQuery = z.object({
  status: z.enum(DEVICE_STATUSES).optional(),
  kind: z.enum(DEVICE_KINDS).optional(),
  patientId: z.uuid().optional(),
});

export const createDeviceRequest = z.object({
  serial,
  kind: z.enum(DEVICE_KINDS),
  firmware,
  accRangeG: z.number().positive().max(400).default(16),
  gyroRangeDps: z.number().positive().max(10_000).default(2000),
  notes: z.string().trim().max(500).optional(),
});
export type CreateDeviceRequest = z.input<typeof createDeviceRequest>;

export const updateDeviceRequest = z
  .object({
    status: z.enum(DEVICE_STATUSES).optional(),
    firmware: firmware.optional(),
    notes: z.string().trim().max(500).nullable().optional(),
  })
  .refine((v) => v.status !== undefined || v.firmware !== undefined || v.notes !== undefined, {
    error: "give at least one of status, firmware, notes",
  });
export type UpdateDeviceRequest = z.input<typeof updateDeviceRequest>;

export const createAssignmentRequest = z
  .object({
    patientId: z.uuid(),
    placement: z.enum(PLACEMENTS),
    from: isoDateTime,
    to: isoDateTime.optional(),
  })
  .refine((v) => !v.to || Date.parse(v.to) > Date.parse(v.from), { path: ["to"], error: "to must be after from" });
export type CreateAssignmentRequest = z.input<typeof createAssignmentRequest>;

export const endAssignmentRequest = z.object({ to: isoDateTime });
export type EndAssignmentRequest = z.input<typeof endAssignmentRequest>;

/** Move a device to another placement: the current assignment ends at `at`, a new one starts there. */
export const swapPlacementRequest = z.object({ placement: z.enum(PLACEMENTS), at: isoDateTime });
export type SwapPlacementRequest = z.input<typeof swapPlacementRequest>;

export const assignmentList = z.array(assignmentView);

/** Answer of a placement swap: the assignment that ended and the one that started. */
export const swapPlacementResponse = z.strictObject({ ended: assignmentView, started: assignmentView });
export type SwapPlacementResponse = z.infer<typeof swapPlacementResponse>;
export const assignmentParams = z.object({ id: z.uuid(), assignmentId: z.uuid() });
