import { randomBytes } from "node:crypto";
import type { Request } from "express";
import type { z } from "zod";
import { audit } from "../../audit/audit";
import type { createResearchProjectRequest, ResearchProject } from "../../contracts/research";
import type { AppDeps } from "../../deps";
import { HttpError } from "../../http-error";
import type { AuthContext } from "../../middleware/authenticate";

interface ProjectRow {
  id: string;
  name: string;
  purpose: string | null;
  owner_id: string;
  owner_name: string;
  key_salt: Buffer;
  created_at: Date;
}

const toProject = (r: ProjectRow): ResearchProject => ({
  id: r.id,
  name: r.name,
  purpose: r.purpose,
  owner: { id: r.owner_id, displayName: r.owner_name },
  createdAt: new Date(r.created_at).toISOString(),
});

const projects = (deps: AppDeps) =>
  deps.db("research_projects as r")
    .join("users as u", "u.id", "r.owner_id")
    .select("r.id", "r.name", "r.purpose", "r.owner_id", "u.display_name as owner_name", "r.key_salt", "r.created_at")
    .orderBy([{ column: "r.created_at", order: "desc" }, { column: "r.id" }]);

/** A researcher sees the projects they own; an admin sees every project and its owner (never a key). */
export async function listProjects(deps: AppDeps, auth: AuthContext): Promise<{ items: ResearchProject[] }> {
  const q = projects(deps);
  if (auth.role !== "admin") q.where("r.owner_id", auth.userId);
  return { items: (await q).map(toProject) };
}

export async function createProject(deps: AppDeps, req: Request, auth: AuthContext, body: z.output<typeof createResearchProjectRequest>): Promise<ResearchProject> {
  if (auth.role !== "researcher") throw new HttpError(403, "forbidden", "research projects are created by researchers");
  return deps.db.transaction(async (trx) => {
    const clash = await trx("research_projects").where({ owner_id: auth.userId }).whereRaw("lower(btrim(name)) = lower(?)", [body.name]).first("id");
    if (clash) throw new HttpError(409, "project_name_taken", "you already have a project with this name");
    const [row] = await trx("research_projects")
      .insert({ name: body.name, purpose: body.purpose || null, owner_id: auth.userId, key_salt: randomBytes(32) })
      .returning("id");
    await audit(trx, req, { action: "research.project_create", resourceType: "research_project", resourceId: row.id, details: { name: body.name } });
    const created = await trx("research_projects as r")
      .join("users as u", "u.id", "r.owner_id")
      .where("r.id", row.id)
      .first("r.id", "r.name", "r.purpose", "r.owner_id", "u.display_name as owner_name", "r.key_salt", "r.created_at");
    return toProject(created as ProjectRow);
  });
}

/** The caller's own project with its key salt; anyone else's reads as 404, so project ids cannot be probed. */
export async function ownProject(deps: AppDeps, auth: AuthContext, projectId: string): Promise<ProjectRow> {
  const row = (await projects(deps).where("r.id", projectId).andWhere("r.owner_id", auth.userId).first()) as ProjectRow | undefined;
  if (!row) throw new HttpError(404, "not_found", "research project not found");
  return row;
}
