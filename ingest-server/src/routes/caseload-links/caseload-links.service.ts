import type { Request } from "express";
import type { Knex } from "knex";
import type { z } from "zod";
import type { AppDeps } from "../../deps";
import type {
  CareTeamMember,
  CaseloadLinkPage,
  CaseloadLinkView,
  createCaseloadLinkRequest,
  endCaseloadLinkRequest,
  listCaseloadLinksQuery,
} from "../../contracts/caseload-links";
import { audit } from "../../audit/audit";
import type { AuthContext } from "../../middleware/authenticate";
import { HttpError } from "../../http-error";
import { caseloadLinksRepository as repo } from "./caseload-links.repository";

type CreateLink = z.output<typeof createCaseloadLinkRequest>;
type EndLink = z.output<typeof endCaseloadLinkRequest>;
type ListLinks = z.output<typeof listCaseloadLinksQuery>;

/**
 * Opens a link inside the caller's transaction and records it in the audit trail. The one way a
 * link comes into being: the caseload-links route and a clinician's invitation of a new patient
 * both call it, so every link has an author, a reason and an audit event.
 */
export async function openCaseloadLink(
  trx: Knex.Transaction,
  req: Request,
  actor: AuthContext,
  link: { clinicianId: string; patientId: string; reason: string },
): Promise<string> {
  const clinician = await repo.findUser(trx, link.clinicianId);
  if (!clinician || clinician.role !== "clinician") {
    throw new HttpError(422, "not_a_clinician", "clinicianId does not name a clinician account", { clinicianId: link.clinicianId });
  }
  if (clinician.status === "disabled") {
    throw new HttpError(422, "clinician_disabled", "this clinician account is disabled; enable it before giving it a caseload", { clinicianId: link.clinicianId });
  }
  if (!(await repo.patientExists(trx, link.patientId))) {
    throw new HttpError(422, "not_a_patient", "patientId does not name a patient record", { patientId: link.patientId });
  }
  const id = await repo.insert(trx, { ...link, createdBy: actor.userId });
  if (!id) throw new HttpError(409, "link_exists", "this clinician already has this patient on their caseload");
  await audit(trx, req, {
    action: "caseload_link.create",
    resourceType: "caseload_link",
    resourceId: id,
    patientId: link.patientId,
    details: { clinicianId: link.clinicianId, reason: link.reason },
  });
  return id;
}

/** Admin: every link, filtered; clinician: their own links only (active, ended or both). */
export async function listCaseloadLinks({ db }: AppDeps, actor: AuthContext, query: ListLinks, req: Request): Promise<CaseloadLinkPage> {
  if (actor.role === "clinician" && query.clinicianId && query.clinicianId !== actor.userId) {
    throw new HttpError(403, "forbidden", "a clinician sees only their own caseload links");
  }
  const filter = actor.role === "admin" ? query : { ...query, clinicianId: actor.userId };
  const page = await repo.list(db, filter);
  await audit(db, req, {
    action: "caseload_link.list",
    resourceType: "caseload_link",
    // The column names a patient only when the filter matched one: a made-up id stays in details.
    patientId: filter.patientId && page.total > 0 ? filter.patientId : null,
    details: {
      count: page.items.length,
      state: filter.state,
      ...(filter.clinicianId ? { clinicianId: filter.clinicianId } : {}),
      ...(filter.patientId ? { patientId: filter.patientId } : {}),
    },
  });
  return { ...page, limit: query.limit, offset: query.offset };
}

export async function createCaseloadLink({ db }: AppDeps, actor: AuthContext, body: CreateLink, req: Request): Promise<CaseloadLinkView> {
  const id = await db.transaction((trx) => openCaseloadLink(trx, req, actor, body));
  return (await repo.get(db, id))!;
}

/** Ends an open link: access stops at once, the link stays in the history with who, when and why. */
export async function endCaseloadLink({ db }: AppDeps, actor: AuthContext, id: string, body: EndLink, req: Request): Promise<CaseloadLinkView> {
  await db.transaction(async (trx) => {
    const link = await repo.lockForEnd(trx, id);
    if (!link) throw new HttpError(404, "not_found", "caseload link not found");
    if (link.ended_at) throw new HttpError(409, "link_ended", `this link already ended on ${link.ended_at.toISOString()}`);
    await repo.end(trx, { id, clinicianId: link.clinician_id, patientId: link.patient_id, endedBy: actor.userId, reason: body.reason });
    await audit(trx, req, {
      action: "caseload_link.end",
      resourceType: "caseload_link",
      resourceId: id,
      patientId: link.patient_id,
      details: { clinicianId: link.clinician_id, reason: body.reason },
    });
  });
  return (await repo.get(db, id))!;
}

/** The signed-in patient's clinicians, current and former, in plain terms. */
export async function readCareTeam({ db }: AppDeps, actor: AuthContext, req: Request): Promise<CareTeamMember[]> {
  if (actor.role !== "patient" || !actor.patientId) throw new HttpError(403, "forbidden", "only a patient has a care team");
  const team = await repo.careTeam(db, actor.patientId);
  await audit(db, req, { action: "caseload_link.read_care_team", resourceType: "patient", resourceId: actor.patientId, patientId: actor.patientId });
  return team;
}
