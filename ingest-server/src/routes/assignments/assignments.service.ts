import type { Request } from "express";
import type { z } from "zod";
import type { AppDeps } from "../../deps";
import type { AssignmentView, createAssignmentRequest, endAssignmentRequest, swapPlacementRequest } from "../../contracts/devices";
import { audit } from "../../audit/audit";
import type { AuthContext } from "../../middleware/authenticate";
import { HttpError, notFound } from "../../http-error";
import { devicesRepository } from "../devices/devices.repository";
import { assignmentsRepository as repo, toAssignmentView } from "./assignments.repository";

const pgCode = (err: unknown) => (err as { code?: string })?.code;
const range = (from: string, to: string | null) => `${from} – ${to ?? "open"}`;

type Db = AppDeps["db"];

async function requireDevice(trx: Db, id: string) {
  const device = await repo.lockDevice(trx, id);
  if (!device) throw notFound("device");
  return device;
}

/** Locks the device and reads one of its assignments (404 when either is missing). */
async function requireAssignment(trx: Db, deviceId: string, assignmentId: string) {
  const { serial } = await requireDevice(trx, deviceId);
  const row = await repo.get(trx, deviceId, assignmentId);
  if (!row) throw notFound("assignment");
  return { serial, row, view: toAssignmentView(row) };
}
type HeldAssignment = Awaited<ReturnType<typeof requireAssignment>>;

/** Translates an exclusion-constraint refusal into a 409 that names the assignment in the way. */
async function overlapConflict(db: Db, q: Parameters<typeof repo.overlapping>[1], serial: string): Promise<HttpError> {
  const rows = (await repo.overlapping(db, q)).map(toAssignmentView);
  const lines = rows.map((r) =>
    r.deviceId === q.deviceId
      ? `device ${serial} is already on ${r.patientLabel} (${r.placement}) for ${range(r.from, r.to)}`
      : `${r.patientLabel}'s ${r.placement} already carries another device for ${range(r.from, r.to)}`,
  );
  return new HttpError(
    409,
    "assignment_overlap",
    lines.length ? lines.join("; ") : "the assignment overlaps another one on this device or placement",
    { conflicts: rows },
  );
}

/**
 * Starts an assignment inside the caller's transaction: the row, the device's status brought in
 * line with it, and the audit event that commits with both.
 */
async function startAssignment(
  trx: Db,
  req: Request,
  row: Parameters<typeof repo.insert>[1],
  event: { action: string; details: Record<string, unknown> },
): Promise<string> {
  const id = await repo.insert(trx, row);
  await devicesRepository.syncStatus(trx, row.device_id);
  await audit(trx, req, { action: event.action, resourceType: "device_assignment", resourceId: id, patientId: row.patient_id, details: event.details });
  return id;
}

async function run<T>(work: () => Promise<T>, conflict: () => Promise<HttpError>): Promise<T> {
  try {
    return await work();
  } catch (err) {
    if (pgCode(err) === "23P01") throw await conflict();
    if (pgCode(err) === "23514") throw new HttpError(422, "invalid_range", "an assignment must end after it starts");
    throw err;
  }
}

export async function listAssignments({ db }: AppDeps, deviceId: string): Promise<AssignmentView[]> {
  if (!(await repo.deviceExists(db, deviceId))) throw notFound("device");
  return (await repo.listForDevice(db, deviceId)).map(toAssignmentView);
}

export async function createAssignment({ db }: AppDeps, actor: AuthContext, deviceId: string, input: z.output<typeof createAssignmentRequest>, req: Request): Promise<AssignmentView> {
  const from = new Date(input.from);
  const to = input.to ? new Date(input.to) : null;
  let serial = "";
  const id = await run(
    () =>
      db.transaction(async (trx) => {
        const device = await requireDevice(trx, deviceId);
        serial = device.serial;
        if (device.status === "retired" || device.status === "maintenance") {
          throw new HttpError(409, "device_unavailable", `device ${device.serial} is ${device.status} and cannot be assigned`);
        }
        if (!(await repo.patientExists(trx, input.patientId))) throw new HttpError(422, "unknown_patient", "patient not found");
        return startAssignment(
          trx,
          req,
          { device_id: deviceId, patient_id: input.patientId, placement: input.placement, valid_from: from, valid_to: to, created_by: actor.userId },
          { action: "assignment.create", details: { deviceId, placement: input.placement, from: input.from, to: input.to ?? null } },
        );
      }),
    () => overlapConflict(db, { deviceId, patientId: input.patientId, placement: input.placement, from, to }, serial),
  );
  return toAssignmentView((await repo.get(db, deviceId, id))!);
}

export async function endAssignment({ db }: AppDeps, deviceId: string, assignmentId: string, input: z.output<typeof endAssignmentRequest>, req: Request): Promise<AssignmentView> {
  const to = new Date(input.to);
  let held: HeldAssignment | undefined;
  await run(
    () =>
      db.transaction(async (trx) => {
        held = await requireAssignment(trx, deviceId, assignmentId);
        const { row, view: current } = held;
        if (to.getTime() <= row.valid_from.getTime()) {
          throw new HttpError(422, "invalid_range", `an assignment must end after it starts (${current.from})`);
        }
        await repo.setEnd(trx, assignmentId, to);
        await devicesRepository.syncStatus(trx, deviceId);
        await audit(trx, req, {
          action: "assignment.end",
          resourceType: "device_assignment",
          resourceId: assignmentId,
          patientId: row.patient_id,
          details: { deviceId, from: current.from, previousTo: current.to, to: input.to },
        });
      }),
    // Extending an end date can run into a later assignment.
    () => {
      const { view: current, serial } = held!;
      return overlapConflict(db, { deviceId, patientId: current.patientId, placement: current.placement, from: new Date(current.from), to, excludeId: assignmentId }, serial);
    },
  );
  return toAssignmentView((await repo.get(db, deviceId, assignmentId))!);
}

/** The same device moves to another placement on the same patient: end at `at`, start anew at `at`. */
export async function swapAssignmentPlacement({ db }: AppDeps, actor: AuthContext, deviceId: string, assignmentId: string, input: z.output<typeof swapPlacementRequest>, req: Request) {
  const at = new Date(input.at);
  let held: HeldAssignment | undefined;
  const newId = await run(
    () =>
      db.transaction(async (trx) => {
        held = await requireAssignment(trx, deviceId, assignmentId);
        const { row } = held;
        if (row.placement === input.placement) throw new HttpError(422, "same_placement", `the device is already on ${input.placement}`);
        if (at.getTime() <= row.valid_from.getTime() || (row.valid_to && at.getTime() >= row.valid_to.getTime())) {
          throw new HttpError(422, "invalid_range", "the swap time must fall inside the current assignment");
        }
        await repo.setEnd(trx, assignmentId, at);
        return startAssignment(
          trx,
          req,
          { device_id: deviceId, patient_id: row.patient_id, placement: input.placement, valid_from: at, valid_to: row.valid_to, created_by: actor.userId },
          { action: "assignment.swap", details: { deviceId, endedAssignmentId: assignmentId, from: row.placement, to: input.placement, at: input.at } },
        );
      }),
    () => {
      const { view: current, serial } = held!;
      return overlapConflict(
        db,
        { deviceId, patientId: current.patientId, placement: input.placement, from: at, to: current.to ? new Date(current.to) : null, excludeId: assignmentId },
        serial,
      );
    },
  );
  return {
    ended: toAssignmentView((await repo.get(db, deviceId, assignmentId))!),
    started: toAssignmentView((await repo.get(db, deviceId, newId))!),
  };
}
