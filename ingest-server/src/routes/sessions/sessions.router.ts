import multer from "multer";
import type { RequestHandler } from "express";
import { rateLimit } from "express-rate-limit";
import { idParams } from "../../contracts/common";
import {
  reprocessResponse,
  sessionDetail,
  sessionUpdate,
  sessionUpdateResponse,
  signalQuery,
  signalResponse,
  uploadFields,
  uploadResponse,
} from "../../contracts/sessions";
import type { AppDeps } from "../../deps";
import { AnswerCache, sendCachedAnswer } from "../../http/answer-cache";
import { ApiRouter, conformResponse, type RouteModule } from "../../http/api-router";
import { getSessionJson, getSessionSignal, reprocessSession, updateSession } from "./sessions.service";
import { unprocessableUnless } from "../unprocessable-body";
import { uploadSession } from "./upload.service";

/** Multipart parsing in memory: the files are parsed and hashed before anything is stored. */
function uploadMiddleware(deps: AppDeps): RequestHandler {
  const { maxFiles, maxFileBytes } = deps.config.upload;
  return multer({
    storage: multer.memoryStorage(),
    limits: { files: maxFiles, fileSize: maxFileBytes, fields: 10, fieldSize: 4096, parts: maxFiles + 10 },
  }).array("files");
}

/**
 * Uploads per signed-in user (UPLOAD_RATE_LIMIT per UPLOAD_RATE_WINDOW_S), counted before multer
 * reads a byte, so a runaway client cannot make the server parse and store without end. Keyed by
 * user, not address: a clinic behind one NAT uploads for many patients at once.
 */
function uploadRateLimit(deps: AppDeps): RequestHandler {
  const { max, windowS } = deps.config.uploadRateLimit;
  return rateLimit({
    windowMs: windowS * 1000,
    limit: max,
    standardHeaders: "draft-7",
    legacyHeaders: false,
    keyGenerator: (req) => `user:${req.auth?.userId ?? "-"}`,
    handler: (_req, res, _next, options) => {
      res.status(options.statusCode).json({
        error: { code: "rate_limited", message: `too many uploads; at most ${max} per ${Math.ceil(windowS / 60)} minutes, try again later` },
      });
    },
  });
}

export function sessionsRouter(deps: AppDeps): ApiRouter {
  const api = new ApiRouter("/api/sessions", deps);
  const sessionCache = new AnswerCache(deps.config.sessionCacheBytes);
  api.endpoint({
    method: "post",
    path: "/",
    summary: "Upload one walking test (multipart field `files`, one file per device); 202 queued, 200 when the same files were uploaded before",
    access: { scopes: ["sessions:write:own", "sessions:write:caseload"] },
    before: [uploadRateLimit(deps), uploadMiddleware(deps)],
    request: { body: uploadFields },
    status: 202,
    response: uploadResponse,
    handler: async ({ auth, body }, req, res) => {
      const files = (Array.isArray(req.files) ? req.files : []).map((f) => ({ originalName: f.originalname, buffer: f.buffer }));
      const result = await uploadSession(deps, req, { auth, files, patientId: body.patientId, bidsStartUtc: body.startUtc });
      if (result.duplicate) {
        res.status(200).json(uploadResponse.parse(result));
        return undefined;
      }
      return { id: result.id, status: result.status };
    },
  });
  api.endpoint({
    method: "get",
    path: "/:id",
    summary: "One session: status, progress, files and, when done, the full analysis",
    access: { scopes: ["sessions:read:own", "sessions:read:caseload"] },
    request: { params: idParams },
    response: sessionDetail,
    handler: async ({ auth, params }, req, res) => {
      const entry = await getSessionJson(deps, req, auth, params.id, sessionCache, (payload) =>
        JSON.stringify(conformResponse(sessionDetail, payload, "get", "/api/sessions/:id")),
      );
      sendCachedAnswer(req, res, entry);
    },
  });
  api.endpoint({
    method: "patch",
    path: "/:id",
    summary: "Clinician of the caseload: record the walking aid used in this session (none, cane, crutches, rollator, other, or null; 422 otherwise)",
    access: { scopes: ["sessions:write:caseload"] },
    before: [unprocessableUnless(sessionUpdate, "invalid_session_field")],
    request: { params: idParams, body: sessionUpdate },
    response: sessionUpdateResponse,
    handler: ({ auth, params, body }, req) => updateSession(deps, req, auth, params.id, body),
  });
  api.endpoint({
    method: "get",
    path: "/:id/signal",
    summary: "Sagittal angular velocity per placement, min/max-decimated for the session chart",
    access: { scopes: ["sessions:read:own", "sessions:read:caseload"] },
    request: { params: idParams, query: signalQuery },
    response: signalResponse,
    handler: ({ auth, params, query }, req) => getSessionSignal(deps, req, auth, params.id, query),
  });
  api.endpoint({
    method: "post",
    path: "/:id/reprocess",
    summary: "Queue the session again from its stored raw files",
    access: { scopes: ["sessions:reprocess"] },
    request: { params: idParams },
    status: 202,
    response: reprocessResponse,
    handler: ({ auth, params }, req) => reprocessSession(deps, req, auth, params.id),
  });
  return api;
}

export const sessionsRoutes: RouteModule = { prefix: "/api/sessions", router: sessionsRouter };
