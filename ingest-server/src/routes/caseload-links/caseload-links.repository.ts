import type { Knex } from "knex";
import type { CareTeamMember, CaseloadLinkView } from "../../contracts/caseload-links";

type Db = Knex | Knex.Transaction;

interface Row {
  id: string;
  clinician_id: string;
  clinician_name: string;
  clinician_email: string;
  patient_id: string;
  patient_name: string;
  created_at: Date;
  created_by: string | null;
  created_by_name: string | null;
  reason: string | null;
  ended_at: Date | null;
  ended_by: string | null;
  ended_by_name: string | null;
  end_reason: string | null;
}

const toView = (r: Row): CaseloadLinkView => ({
  id: r.id,
  clinicianId: r.clinician_id,
  clinicianName: r.clinician_name,
  clinicianEmail: r.clinician_email,
  patientId: r.patient_id,
  patientName: r.patient_name,
  active: r.ended_at === null,
  createdAt: r.created_at.toISOString(),
  createdBy: r.created_by,
  createdByName: r.created_by_name,
  reason: r.reason,
  endedAt: r.ended_at ? r.ended_at.toISOString() : null,
  endedBy: r.ended_by,
  endedByName: r.ended_by_name,
  endReason: r.end_reason,
});

export interface LinkFilter {
  clinicianId?: string;
  patientId?: string;
  state: "active" | "ended" | "all";
  limit: number;
  offset: number;
}

const filtered = (db: Db, f: Omit<LinkFilter, "limit" | "offset">) =>
  db("caseload_links as l").modify((q) => {
    if (f.clinicianId) q.where("l.clinician_id", f.clinicianId);
    if (f.patientId) q.where("l.patient_id", f.patientId);
    if (f.state === "active") q.whereNull("l.ended_at");
    if (f.state === "ended") q.whereNotNull("l.ended_at");
  });

const withNames = (q: Knex.QueryBuilder) =>
  q
    .join("users as c", "c.id", "l.clinician_id")
    .join("patients as p", "p.id", "l.patient_id")
    .leftJoin("users as cb", "cb.id", "l.created_by")
    .leftJoin("users as eb", "eb.id", "l.ended_by")
    .select(
      "l.*",
      "c.display_name as clinician_name",
      "c.email as clinician_email",
      "p.display_name as patient_name",
      "cb.display_name as created_by_name",
      "eb.display_name as ended_by_name",
    );

export const caseloadLinksRepository = {
  async list(db: Db, f: LinkFilter): Promise<{ items: CaseloadLinkView[]; total: number }> {
    const [{ n }] = (await filtered(db, f).count<{ n: string }[]>({ n: "*" })) as [{ n: string }];
    const rows = (await withNames(filtered(db, f))
      .orderBy([
        { column: "l.created_at", order: "desc" },
        { column: "l.id", order: "desc" },
      ])
      .limit(f.limit)
      .offset(f.offset)) as Row[];
    return { items: rows.map(toView), total: Number(n) };
  },

  async get(db: Db, id: string): Promise<CaseloadLinkView | undefined> {
    const row = (await withNames(db("caseload_links as l")).where("l.id", id).first()) as Row | undefined;
    return row ? toView(row) : undefined;
  },

  /** The row, locked for the rest of the transaction so two removals cannot both end it. */
  lockForEnd(trx: Knex.Transaction, id: string) {
    return trx("caseload_links").where({ id }).forUpdate().first<{ id: string; clinician_id: string; patient_id: string; ended_at: Date | null } | undefined>(
      "id",
      "clinician_id",
      "patient_id",
      "ended_at",
    );
  },

  findUser(db: Db, id: string) {
    return db("users").where({ id }).first<{ id: string; role: string; status: string } | undefined>("id", "role", "status");
  },

  patientExists(db: Db, id: string): Promise<boolean> {
    return db("patients")
      .where({ id })
      .first("id")
      .then((r) => Boolean(r));
  },

  /**
   * The history row first, then the access row: the trigger on `caseload` sees the open link and
   * does not add a second one. Returns undefined when the pair already has an open link.
   */
  async insert(trx: Knex.Transaction, link: { clinicianId: string; patientId: string; createdBy: string; reason: string }): Promise<string | undefined> {
    let row: { id: string } | undefined;
    try {
      [row] = await trx("caseload_links")
        .insert({ clinician_id: link.clinicianId, patient_id: link.patientId, created_by: link.createdBy, reason: link.reason })
        .returning("id");
    } catch (err) {
      // A racing request opened the same link first; the transaction is over either way.
      if ((err as { constraint?: string }).constraint === "caseload_links_one_open") return undefined;
      throw err;
    }
    if (!row) return undefined;
    await trx("caseload").insert({ clinician_id: link.clinicianId, patient_id: link.patientId }).onConflict(["clinician_id", "patient_id"]).ignore();
    return row.id as string;
  },

  async end(trx: Knex.Transaction, link: { id: string; clinicianId: string; patientId: string; endedBy: string; reason: string }): Promise<void> {
    await trx("caseload_links").where({ id: link.id }).whereNull("ended_at").update({
      ended_at: trx.raw("greatest(now(), created_at)"),
      ended_by: link.endedBy,
      end_reason: link.reason,
    });
    await trx("caseload").where({ clinician_id: link.clinicianId, patient_id: link.patientId }).delete();
  },

  async careTeam(db: Db, patientId: string): Promise<CareTeamMember[]> {
    const rows = await db("caseload_links as l")
      .join("users as c", "c.id", "l.clinician_id")
      .where("l.patient_id", patientId)
      .orderByRaw("l.ended_at IS NOT NULL, l.created_at DESC")
      .select<{ display_name: string; created_at: Date; ended_at: Date | null }[]>("c.display_name", "l.created_at", "l.ended_at");
    return rows.map((r) => ({
      clinicianName: r.display_name,
      active: r.ended_at === null,
      since: r.created_at.toISOString(),
      until: r.ended_at ? r.ended_at.toISOString() : null,
    }));
  },
};
