import type { Knex } from "knex";
import type { AssignmentView } from "../../contracts/devices";

type Db = Knex | Knex.Transaction;

interface Row {
  id: string;
  device_id: string;
  serial: string;
  patient_id: string;
  patient_label: string;
  placement: AssignmentView["placement"];
  valid_from: Date;
  valid_to: Date | null;
}

export const toAssignmentView = (r: Row): AssignmentView => ({
  id: r.id,
  deviceId: r.device_id,
  patientId: r.patient_id,
  patientLabel: r.patient_label,
  placement: r.placement,
  from: r.valid_from.toISOString(),
  to: r.valid_to ? r.valid_to.toISOString() : null,
});

const base = (db: Db) =>
  db("device_assignments as a")
    .join("patients as p", "p.id", "a.patient_id")
    .join("devices as d", "d.id", "a.device_id")
    .select("a.id", "a.device_id", "d.serial", "a.patient_id", "p.display_name as patient_label", "a.placement", "a.valid_from", "a.valid_to");

export const assignmentsRepository = {
  /** The device an assignment change is about, locked until the transaction ends. */
  lockDevice(trx: Db, id: string): Promise<{ id: string; serial: string; status: string } | undefined> {
    return trx("devices").where({ id }).forUpdate().first("id", "serial", "status");
  },

  async deviceExists(db: Db, id: string): Promise<boolean> {
    return (await db("devices").where({ id }).first("id")) !== undefined;
  },

  async patientExists(db: Db, id: string): Promise<boolean> {
    return (await db("patients").where({ id }).first("id")) !== undefined;
  },

  listForDevice(db: Db, deviceId: string): Promise<Row[]> {
    return base(db).where("a.device_id", deviceId).orderBy("a.valid_from", "desc");
  },

  get(db: Db, deviceId: string, id: string): Promise<Row | undefined> {
    return base(db).where({ "a.id": id, "a.device_id": deviceId }).first();
  },

  async insert(db: Db, a: { device_id: string; patient_id: string; placement: string; valid_from: Date; valid_to: Date | null; created_by: string }) {
    const [row] = await db("device_assignments").insert(a).returning("id");
    return row.id as string;
  },

  setEnd(db: Db, id: string, to: Date): Promise<number> {
    return db("device_assignments").where({ id }).update({ valid_to: to });
  },

  /**
   * Assignments that overlap [from, to) either on this device or on this patient's placement:
   * what the exclusion constraints refused, so the 409 can say which assignment is in the way.
   */
  overlapping(db: Db, q: { deviceId: string; patientId: string; placement: string; from: Date; to: Date | null; excludeId?: string }): Promise<Row[]> {
    return base(db)
      .whereRaw("tstzrange(a.valid_from, a.valid_to, '[)') && tstzrange(?::timestamptz, ?::timestamptz, '[)')", [q.from, q.to])
      .where((w) => w.where("a.device_id", q.deviceId).orWhere((x) => x.where("a.patient_id", q.patientId).where("a.placement", q.placement)))
      .modify((b) => {
        if (q.excludeId) b.whereNot("a.id", q.excludeId);
      })
      .orderBy("a.valid_from");
  },
};
