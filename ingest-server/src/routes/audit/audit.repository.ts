import type { Knex } from "knex";
import type { z } from "zod";
import type { AuditEventView, listAuditQuery } from "../../contracts/audit";
import { auditViewForAdmin } from "./audit-view";

type Filter = z.output<typeof listAuditQuery>;

interface Row {
  id: string | number;
  at: Date;
  actor_id: string | null;
  actor_role: string | null;
  actor_email: string | null;
  actor_current_role: string | null;
  action: string;
  resource_type: string;
  resource_id: string | null;
  patient_id: string | null;
  ip: string | null;
  user_agent: string | null;
  details: Record<string, unknown> | null;
}

const toView = (r: Row): AuditEventView =>
  auditViewForAdmin(
    {
      id: String(r.id),
      at: r.at.toISOString(),
      actorId: r.actor_id,
      actorRole: r.actor_role ?? r.actor_current_role,
      actorEmail: r.actor_email,
      action: r.action,
      resourceType: r.resource_type,
      resourceId: r.resource_id,
      patientId: r.patient_id,
      ip: r.ip,
      userAgent: r.user_agent,
      details: r.details,
    },
    r.actor_role === "patient" || r.actor_current_role === "patient",
  );

export const auditRepository = {
  async list(db: Knex, f: Filter): Promise<{ items: AuditEventView[]; total: number }> {
    const base = db("audit_events as e").modify((q) => {
      if (f.actorId) q.where("e.actor_id", f.actorId);
      if (f.patientId) q.where("e.patient_id", f.patientId);
      if (f.action) {
        if (f.action.endsWith(".")) q.whereRaw("e.action LIKE ?", [`${f.action.replace(/_/g, "\\_")}%`]);
        else q.where("e.action", f.action);
      }
      if (f.from) q.where("e.at", ">=", new Date(f.from));
      if (f.to) q.where("e.at", "<", new Date(f.to));
    });
    const [{ n }] = (await base.clone().count<{ n: string }[]>({ n: "*" })) as [{ n: string }];
    const rows = (await base
      .clone()
      .leftJoin("users as u", "u.id", "e.actor_id")
      .select("e.*", "u.email as actor_email", "u.role as actor_current_role")
      .orderBy([
        { column: "e.at", order: "desc" },
        { column: "e.id", order: "desc" },
      ])
      .limit(f.limit)
      .offset(f.offset)) as Row[];
    return { items: rows.map(toView), total: Number(n) };
  },
};
