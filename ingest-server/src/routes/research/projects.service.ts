import { randomBytes } from "node:crypto";
import type { Request } from "express";
import type { z } from "zod";
import { audit } from "../../audit/audit";
import type { createResearchProjectRequest, ResearchProject } from "../../contracts/research";
import type { AppDeps } from "../../deps";
import { HttpError } from "../../http-error";
import type { AuthContext } from "../../middleware/authenticate";
import { findProject, insertProject, listProjectRows, ownerHasProjectNamed, type ProjectRow } from "./research.repository";

const toProject = (r: ProjectRow): ResearchProject => ({
  id: r.id,
  name: r.name,
  purpose: r.purpose,
  owner: { id: r.owner_id, displayName: r.owner_name },
  createdAt: new Date(r.created_at).toISOString(),
});

/** A researcher sees the projects they own; an admin sees every project and its owner (never a key). */
export async function listProjects(deps: AppDeps, auth: AuthContext): Promise<{ items: ResearchProject[] }> {
  const rows = await listProjectRows(deps.db, auth.role === "admin" ? null : auth.userId);
  return { items: rows.map(toProject) };
}

export async function createProject(deps: AppDeps, req: Request, auth: AuthContext, body: z.output<typeof createResearchProjectRequest>): Promise<ResearchProject> {
  if (auth.role !== "researcher") throw new HttpError(403, "forbidden", "research projects are created by researchers");
  return deps.db.transaction(async (trx) => {
    if (await ownerHasProjectNamed(trx, auth.userId, body.name)) throw new HttpError(409, "project_name_taken", "you already have a project with this name");
    const id = await insertProject(trx, { name: body.name, purpose: body.purpose || null, owner_id: auth.userId, key_salt: randomBytes(32) });
    await audit(trx, req, { action: "research.project_create", resourceType: "research_project", resourceId: id, details: { name: body.name } });
    const created = await findProject(trx, id);
    return toProject(created!);
  });
}

/** The caller's own project with its key salt; anyone else's reads as 404, so project ids cannot be probed. */
export async function ownProject(deps: AppDeps, auth: AuthContext, projectId: string): Promise<ProjectRow> {
  const row = await findProject(deps.db, projectId, auth.userId);
  if (!row) throw new HttpError(404, "not_found", "research project not found");
  return row;
}
