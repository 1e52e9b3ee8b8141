import type { Request } from "express";
import { audit } from "../../audit/audit";
import { assertPatientAccess } from "../../auth/patient-access";
import { idParams } from "../../contracts/common";
import { createTraining, trainingEntry, trainingList } from "../../contracts/training";
import type { AppDeps } from "../../deps";
import { ApiRouter, type RouteModule } from "../../http/api-router";
import type { AuthContext } from "../../middleware/authenticate";

interface TrainingRow {
  id: string;
  patient_id: string;
  author_id: string;
  /** 'YYYY-MM-DD': DATE columns arrive as the stored day (db/src/connection.ts). */
  performed_on: string;
  kind: "overground" | "treadmill" | "body_weight_support" | "balance" | "strength" | "other";
  minutes: number;
  description: string | null;
  created_at: Date;
}

const toEntry = (t: TrainingRow) => ({
  id: t.id,
  patientId: t.patient_id,
  authorId: t.author_id,
  performedOn: t.performed_on,
  kind: t.kind,
  minutes: t.minutes,
  description: t.description,
  createdAt: new Date(t.created_at).toISOString(),
});

async function listTraining(deps: AppDeps, req: Request, auth: AuthContext, patientId: string) {
  await assertPatientAccess(deps.db, auth, patientId, "clinical");
  const rows: TrainingRow[] = await deps.db("training_log").where({ patient_id: patientId }).orderBy([{ column: "performed_on", order: "desc" }, { column: "created_at", order: "desc" }]).limit(1000);
  await audit(deps.db, req, { action: "training.list", resourceType: "patient", resourceId: patientId, patientId });
  return { items: rows.map(toEntry) };
}

async function addTraining(
  deps: AppDeps,
  req: Request,
  auth: AuthContext,
  patientId: string,
  body: { performedOn: string; kind: TrainingRow["kind"]; minutes: number; description?: string },
) {
  await assertPatientAccess(deps.db, auth, patientId, "clinical");
  return deps.db.transaction(async (trx) => {
    const [row] = await trx("training_log")
      .insert({
        patient_id: patientId,
        author_id: auth.userId,
        performed_on: body.performedOn,
        kind: body.kind,
        minutes: body.minutes,
        description: body.description ?? null,
      })
      .returning("*");
    await audit(trx, req, { action: "training.create", resourceType: "training", resourceId: row.id, patientId, details: { kind: body.kind, minutes: body.minutes } });
    return toEntry(row as TrainingRow);
  });
}

export function trainingRouter(deps: AppDeps): ApiRouter {
  const api = new ApiRouter("/api/patients", deps);
  api.endpoint({
    method: "get",
    path: "/:id/training",
    summary: "Training log of the patient, newest first",
    access: { scopes: ["training:read"] },
    request: { params: idParams },
    response: trainingList,
    handler: ({ auth, params }, req) => listTraining(deps, req, auth, params.id),
  });
  api.endpoint({
    method: "post",
    path: "/:id/training",
    summary: "Log a training session",
    access: { scopes: ["training:write"] },
    request: { params: idParams, body: createTraining },
    status: 201,
    response: trainingEntry,
    handler: ({ auth, params, body }, req) => addTraining(deps, req, auth, params.id, body),
  });
  return api;
}

export const trainingRoutes: RouteModule = { prefix: "/api/patients", router: trainingRouter };
