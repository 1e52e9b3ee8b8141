import type { Knex } from "knex";
import type { InvitationSummary } from "../../contracts/invitations";

type Db = Knex | Knex.Transaction;

interface Row {
  id: string;
  user_id: string;
  email: string;
  display_name: string;
  role: InvitationSummary["role"];
  patient_id: string | null;
  invited_by: string | null;
  created_at: Date;
  expires_at: Date;
  accepted_at: Date | null;
}

export const toInvitationSummary = (r: Row): InvitationSummary => ({
  id: r.id,
  userId: r.user_id,
  email: r.email,
  displayName: r.display_name,
  role: r.role,
  patientId: r.patient_id,
  invitedBy: r.invited_by,
  createdAt: r.created_at.toISOString(),
  expiresAt: r.expires_at.toISOString(),
  acceptedAt: r.accepted_at ? r.accepted_at.toISOString() : null,
});

const joined = (db: Db) =>
  db("invitations as i")
    .join("users as u", "u.id", "i.user_id")
    .select(
      "i.id",
      "i.user_id",
      "u.email",
      "u.display_name",
      "u.role",
      "u.patient_id",
      "i.invited_by",
      "i.created_at",
      "i.expires_at",
      "i.accepted_at",
    );

export const invitationsRepository = {
  async get(db: Db, id: string): Promise<Row | undefined> {
    return joined(db).where("i.id", id).first();
  },

  async list(db: Db, filter: { invitedBy?: string; state: "pending" | "accepted" | "expired" | "all" }): Promise<Row[]> {
    return joined(db)
      .modify((q) => {
        if (filter.invitedBy) q.where("i.invited_by", filter.invitedBy);
        if (filter.state === "pending") q.whereNull("i.accepted_at").where("i.expires_at", ">", db.fn.now());
        if (filter.state === "accepted") q.whereNotNull("i.accepted_at");
        if (filter.state === "expired") q.whereNull("i.accepted_at").where("i.expires_at", "<=", db.fn.now());
      })
      .orderBy("i.created_at", "desc")
      .limit(500);
  },

  findUserByEmail(db: Db, email: string) {
    return db("users")
      .whereRaw("lower(email) = lower(?)", [email])
      .first<{ id: string; role: string; status: string; patient_id: string | null } | undefined>("id", "role", "status", "patient_id");
  },

  /** An open invitation stops working when a new one is issued for the same account. */
  async patientHasAccount(db: Db, patientId: string): Promise<boolean> {
    return (await db("users").where({ patient_id: patientId }).first("id")) !== undefined;
  },

  closeOpenInvitations(db: Db, userId: string): Promise<number> {
    return db("invitations").where({ user_id: userId }).whereNull("accepted_at").where("expires_at", ">", db.fn.now()).update({ expires_at: db.fn.now() });
  },

  async insertPatient(db: Db, p: Record<string, unknown>): Promise<string> {
    const [row] = await db("patients").insert(p).returning("id");
    return row.id as string;
  },

  async insertUser(db: Db, u: { email: string; display_name: string; role: string; patient_id: string | null }): Promise<string> {
    const [row] = await db("users").insert({ ...u, status: "invited", password_hash: null }).returning("id");
    return row.id as string;
  },

  async insertInvitation(db: Db, i: { user_id: string; token_sha256: string; invited_by: string; expires_at: Date }): Promise<string> {
    const [row] = await db("invitations").insert(i).returning("id");
    return row.id as string;
  },
};
