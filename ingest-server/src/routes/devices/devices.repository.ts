import type { Knex } from "knex";
import type { DeviceView } from "../../contracts/devices";

type Db = Knex | Knex.Transaction;

export interface DeviceRow {
  id: string;
  serial: string;
  kind: DeviceView["kind"];
  status: DeviceView["status"];
  firmware: string;
  acc_range_g: number;
  gyro_range_dps: number;
  notes: string | null;
  a_id: string | null;
  a_patient_id: string | null;
  a_patient_label: string | null;
  a_placement: NonNullable<DeviceView["assignment"]>["placement"] | null;
  a_from: Date | null;
  a_to: Date | null;
}

export const toDeviceView = (r: DeviceRow): DeviceView => ({
  id: r.id,
  serial: r.serial,
  kind: r.kind,
  status: r.status,
  firmware: r.firmware,
  accRangeG: r.acc_range_g,
  gyroRangeDps: r.gyro_range_dps,
  notes: r.notes,
  assignment:
    r.a_id && r.a_patient_id && r.a_placement && r.a_from
      ? {
          id: r.a_id,
          patientId: r.a_patient_id,
          patientLabel: r.a_patient_label ?? "",
          placement: r.a_placement,
          from: r.a_from.toISOString(),
          to: r.a_to ? r.a_to.toISOString() : null,
        }
      : null,
});

/** Devices with the assignment active at this moment (at most one, by the exclusion constraint). */
function withCurrentAssignment(db: Db) {
  return db("devices as d")
    .leftJoin("device_assignments as a", function () {
      this.on("a.device_id", "d.id")
        .andOn("a.valid_from", "<=", db.raw("now()"))
        .andOn(db.raw("(a.valid_to IS NULL OR a.valid_to > now())"));
    })
    .leftJoin("patients as p", "p.id", "a.patient_id")
    .select(
      "d.id",
      "d.serial",
      "d.kind",
      "d.status",
      "d.firmware",
      "d.acc_range_g",
      "d.gyro_range_dps",
      "d.notes",
      "a.id as a_id",
      "a.patient_id as a_patient_id",
      "p.display_name as a_patient_label",
      "a.placement as a_placement",
      "a.valid_from as a_from",
      "a.valid_to as a_to",
    );
}

export const devicesRepository = {
  list(db: Db, f: { status?: string; kind?: string; patientId?: string }): Promise<DeviceRow[]> {
    return withCurrentAssignment(db)
      .modify((q) => {
        if (f.status) q.where("d.status", f.status);
        if (f.kind) q.where("d.kind", f.kind);
        if (f.patientId) q.where("a.patient_id", f.patientId);
      })
      .orderBy("d.serial");
  },

  get(db: Db, id: string): Promise<DeviceRow | undefined> {
    return withCurrentAssignment(db).where("d.id", id).first();
  },

  async insert(db: Db, d: Record<string, unknown>): Promise<string> {
    const [row] = await db("devices").insert(d).returning("id");
    return row.id as string;
  },

  /** The fields a change is judged on, with the row locked until the transaction ends. */
  lockForChange(trx: Knex.Transaction, id: string): Promise<Pick<DeviceRow, "status" | "firmware" | "notes"> | undefined> {
    return trx("devices").where({ id }).forUpdate().first("status", "firmware", "notes");
  },

  /** True while an assignment of the device is in force now. */
  async hasAssignmentInForce(db: Db, id: string): Promise<boolean> {
    const row = await db("device_assignments")
      .where({ device_id: id })
      .where("valid_from", "<=", db.fn.now())
      .where((w) => w.whereNull("valid_to").orWhere("valid_to", ">", db.fn.now()))
      .first("id");
    return row !== undefined;
  },

  update(db: Db, id: string, patch: Record<string, unknown>): Promise<number> {
    return db("devices").where({ id }).update(patch);
  },

  /**
   * Keeps `in_stock`/`assigned` in step with the assignments in force now; `maintenance` and
   * `retired` are an admin's decision and stay as they are.
   */
  async syncStatus(db: Db, id: string): Promise<void> {
    await db.raw(
      `UPDATE devices SET status = CASE WHEN EXISTS (
          SELECT 1 FROM device_assignments a
          WHERE a.device_id = devices.id AND a.valid_from <= now() AND (a.valid_to IS NULL OR a.valid_to > now())
        ) THEN 'assigned' ELSE 'in_stock' END
       WHERE id = ? AND status IN ('in_stock', 'assigned')`,
      [id],
    );
  },
};
