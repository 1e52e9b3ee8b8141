import type { Knex } from "knex";
import type { ListUsersFilter, UserSummary } from "../../contracts/users";

type Db = Knex | Knex.Transaction;

interface Row {
  id: string;
  email: string;
  display_name: string;
  role: UserSummary["role"];
  status: UserSummary["status"];
  patient_id: string | null;
  created_at: Date;
  last_login_at: Date | null;
}

const COLUMNS = ["id", "email", "display_name", "role", "status", "patient_id", "created_at", "last_login_at"];

export const toUserSummary = (r: Row): UserSummary => ({
  id: r.id,
  email: r.email,
  displayName: r.display_name,
  role: r.role,
  status: r.status,
  patientId: r.patient_id,
  createdAt: r.created_at.toISOString(),
  lastLoginAt: r.last_login_at ? r.last_login_at.toISOString() : null,
});

// LIKE wildcards in a search term are literal characters, not patterns.
const escapeLike = (s: string) => s.replace(/[\\%_]/g, (c) => `\\${c}`);

export const usersRepository = {
  async list(db: Db, q: ListUsersFilter) {
    const base = db("users").modify((b) => {
      if (q.role) b.where("role", q.role);
      if (q.status) b.where("status", q.status);
      if (q.q) {
        const like = `%${escapeLike(q.q.toLowerCase())}%`;
        b.where((w) => w.whereRaw("lower(email) LIKE ?", [like]).orWhereRaw("lower(display_name) LIKE ?", [like]));
      }
    });
    const [{ n }] = (await base.clone().count<{ n: string }[]>({ n: "*" })) as [{ n: string }];
    const rows = (await base.clone().select(COLUMNS).orderBy([{ column: "created_at", order: "desc" }, "id"]).limit(q.limit).offset(q.offset)) as Row[];
    return { items: rows.map(toUserSummary), total: Number(n) };
  },

  async get(db: Db, id: string): Promise<Row | undefined> {
    return db("users").where({ id }).first(COLUMNS);
  },

  async update(db: Db, id: string, patch: Partial<Pick<Row, "role" | "status" | "display_name">>): Promise<Row | undefined> {
    const [row] = (await db("users").where({ id }).update(patch).returning(COLUMNS)) as Row[];
    return row;
  },

  /** The fields a change is judged on, with the row locked until the transaction ends. */
  lockForChange(trx: Knex.Transaction, id: string): Promise<Pick<Row, "id" | "role" | "status" | "display_name"> | undefined> {
    return trx("users").where({ id }).forUpdate().first("id", "role", "status", "display_name");
  },

  countActiveAdmins(db: Db): Promise<number> {
    return db("users")
      .where({ role: "admin", status: "active" })
      .count<{ n: string }[]>({ n: "*" })
      .then((r) => Number(r[0]?.n ?? 0));
  },
};
