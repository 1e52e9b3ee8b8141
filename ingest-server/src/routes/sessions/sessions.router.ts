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
import { answerAfterBody } from "../../middleware/answer-after-body";
import { inFlightUploadLimit } from "../../uploads/in-flight-limit";
import { requestUploadFolder, uploadFolderOf } from "../../uploads/temp-files";

/** Retry-After of a refusal for too many uploads in flight (common practice: a few seconds). */
const UPLOAD_RETRY_AFTER_S = 10;

/**
 * Multipart bodies stream to the request's private folder (uploads/temp-files.ts), never into
 * memory; parsing happens later, in a parse thread. multer removes what it wrote when it fails, and
 * the folder itself goes when the response closes.
 */
function uploadMiddleware(deps: AppDeps): RequestHandler {
  const { maxFiles, maxFileBytes } = deps.config.upload;
  return multer({
    storage: multer.diskStorage({ destination: (req, _file, cb) => cb(null, uploadFolderOf(req)) }),
    limits: { files: maxFiles, fileSize: maxFileBytes, fields: 10, fieldSize: 4096, parts: maxFiles + 10 },
  }).array("files");
}

/**
 * Refusals answered before the body is read (401, 403, 429, 413) wait until the client has sent
 * it, so clients that write everything before reading still get the answer. Bounded by what an
 * upload may legitimately carry, plus room for the multipart framing, and by two minutes.
 */
function refusalsAfterBody(deps: AppDeps): RequestHandler {
  const { maxFiles, maxFileBytes } = deps.config.upload;
  return answerAfterBody({ maxBytes: maxFiles * maxFileBytes + 1024 * 1024, maxMs: 120_000 });
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
  // Mounted ahead of the endpoint (and so of its authentication): see refusalsAfterBody.
  api.router.post("/", refusalsAfterBody(deps));
  api.endpoint({
    method: "post",
    path: "/",
    summary: "Upload one walking test (multipart field `files`, one file per device); 202 queued, 200 when the same files were uploaded before",
    access: { scopes: ["sessions:write:own", "sessions:write:caseload"] },
    // In-flight cap first: a refused duplicate click should not use up the hourly allowance.
    before: [
      inFlightUploadLimit(deps.config.upload.inFlightPerUser, UPLOAD_RETRY_AFTER_S),
      uploadRateLimit(deps),
      requestUploadFolder(deps.config.upload.tmpDir),
      uploadMiddleware(deps),
    ],
    request: { body: uploadFields },
    status: 202,
    response: uploadResponse,
    handler: async ({ auth, body }, req, res) => {
      const files = (Array.isArray(req.files) ? req.files : []).map((f) => ({ originalName: f.originalname, path: f.path }));
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
