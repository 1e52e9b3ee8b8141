import { randomUUID } from "node:crypto";
import path from "node:path";
import type { Request } from "express";
import { audit } from "../../audit/audit";
import { assertPatientAccess } from "../../auth/patient-access";
import type { AppDeps } from "../../deps";
import { HttpError } from "../../http-error";
import type { AuthContext } from "../../middleware/authenticate";
import { uploadParsePool } from "../../uploads/parse-pool";
import type { UploadSummary } from "../../uploads/parse-job";
import { invalidFile } from "../../uploads/parse-upload";
import { parsedRecordingsKey } from "../../uploads/parsed-recordings";
import {
  findDeviceAt,
  findSession,
  findSessionByContent,
  insertSessionWithFiles,
  isDuplicateContentError,
  type NewRawFile,
} from "../../sessions/sessions.repository";
import { enqueueProcessing } from "../../sessions/process-session-job";

export interface UploadResult {
  id: string;
  status: string;
  duplicate: boolean;
}

/** A file multer wrote to the request's private folder. */
export interface UploadedFile {
  originalName: string;
  path: string;
}

export interface UploadInput {
  auth: AuthContext;
  files: UploadedFile[];
  /** Required when a clinician uploads; ignored (must match) for a patient. */
  patientId?: string;
  bidsStartUtc?: string;
}

function resolvePatient(auth: AuthContext, patientId: string | undefined): string {
  if (auth.role === "patient") {
    if (!auth.patientId) throw new HttpError(403, "forbidden", "this account is not linked to a patient record");
    if (patientId && patientId !== auth.patientId) throw new HttpError(404, "not_found", "patient not found");
    return auth.patientId;
  }
  if (!patientId) throw new HttpError(400, "invalid_request", "patientId is required when a clinician uploads for a patient");
  return patientId;
}

/**
 * Device serial → placement through the assignment active for this patient at the file's start.
 * Errors name the device and the file, but never another patient: a device worn by someone else at
 * that moment reads as "not assigned to this patient".
 *
 * BIDS Motion data has one DeviceSerialNumber per tracking system, not per sensor, so its sensors
 * are registered as `<DeviceSerialNumber>:<tracked point>` (the reader names each recording so) and
 * go through the registry like any sensor file: an unregistered one is refused, so nobody can
 * upload walks for a patient without the devices the clinic gave them.
 */
async function mapPlacements(deps: AppDeps, patientId: string, upload: UploadSummary) {
  const mapped: Array<{ deviceId: string; placement: string }> = [];
  const byPlacement = new Map<string, string>();
  for (const [i, recording] of upload.recordings.entries()) {
    const file = upload.files[upload.recordingFile[i]!]!;
    const fileName = file.originalName;
    const serial = recording.deviceSerial;
    if (!serial) throw invalidFile(fileName, `${fileName}: no device serial in the file`);
    const device = await findDeviceAt(deps.db, serial, recording.startUtc);
    if (!device && file.format === "bids-motion") {
      const [system, trackedPoint] = splitBidsSerial(serial);
      throw new HttpError(
        422,
        "unknown_device",
        `${recording.fileName}: sensor ${serial} is not registered (BIDS sensors are registered as <DeviceSerialNumber>:<tracked point>, here DeviceSerialNumber ${system} and tracked point ${trackedPoint}); ask an administrator to register and assign it`,
        { file: fileName, deviceSerial: serial },
      );
    }
    if (!device) {
      throw new HttpError(422, "unknown_device", `${fileName}: device ${serial} is not registered`, { file: fileName, deviceSerial: serial });
    }
    if (!device.assignment || device.assignment.patientId !== patientId) {
      throw new HttpError(
        422,
        "device_not_assigned",
        `${fileName}: device ${serial} was not assigned to this patient at ${recording.startUtc}`,
        { file: fileName, deviceSerial: serial, startUtc: recording.startUtc },
      );
    }
    const placement = device.assignment.placement;
    const other = byPlacement.get(placement);
    if (other) {
      throw new HttpError(422, "duplicate_placement", `${fileName}: ${placement} is already covered by ${other} in this upload`, {
        file: fileName,
        placement,
      });
    }
    byPlacement.set(placement, fileName);
    mapped.push({ deviceId: device.deviceId, placement });
  }
  return mapped;
}

/** `<DeviceSerialNumber>:<tracked point>` → its two parts (the serial itself may hold colons). */
function splitBidsSerial(serial: string): [string, string] {
  const at = serial.lastIndexOf(":");
  return at < 0 ? [serial, "n/a"] : [serial.slice(0, at), serial.slice(at + 1)];
}

/**
 * POST /api/sessions. Order matters for "nothing lost, nothing orphaned":
 * 1. the files start streaming from the request's private folder to object storage under keys
 *    unique to this attempt (the attempt's session id), while a parse thread validates them and
 *    writes their parsed recordings beside them — storing no longer waits for parsing;
 * 2. any refusal (a 4xx from the parse, an unknown or unassigned device) waits for the PUTs still
 *    running and deletes every key of this attempt before answering, so a refused upload leaves
 *    nothing behind; the folder goes when the response closes;
 * 3. same patient + same content → the existing session (200 duplicate; this attempt's objects
 *    are deleted);
 * 4. the parsed recordings are stored too (best effort: without them the worker parses the
 *    originals); once the files are stored, session + raw_files rows go in one transaction beside
 *    that PUT; if it fails, this attempt's objects are deleted (after the PUT settles). A
 *    concurrent identical upload loses on the unique (patient_id, content_sha256) constraint,
 *    deletes its own objects and answers with the winner;
 * 5. enqueue processing once the parsed recordings' PUT has settled. If enqueueing fails the
 *    session stays `queued` and the worker's sweep re-enqueues it, so the upload is never lost.
 * Keys never hold anything another attempt could share, so deleting them never touches what was
 * stored before.
 */
export async function uploadSession(deps: AppDeps, req: Request, input: UploadInput): Promise<UploadResult> {
  const timing = new ServerTiming();
  const patientId = resolvePatient(input.auth, input.patientId);
  await assertPatientAccess(deps.db, input.auth, patientId, "clinical");

  const sessionId = randomUUID();
  // Keys never contain names a user chose (see ObjectStorage); the attempt's session id keeps two
  // concurrent uploads of the same bytes from ever sharing — and deleting — one object.
  const keys = input.files.map((_, i) => `raw/${patientId}/${sessionId}/${String(i).padStart(2, "0")}`);
  const attempt = new StoredAttempt(deps);
  const storing = timing.measure(
    "store",
    attempt.putAll(
      input.files.map((f, i) => ({ key: keys[i]!, path: f.path, contentType: f.originalName.toLowerCase().endsWith(".json") ? "application/json" : "text/plain" })),
    ),
  );
  // A refusal may come before the PUTs settle; their failure is then no longer anyone's answer.
  storing.catch(() => undefined);

  try {
    // The parse thread writes the parsed recordings next to the bodies, in the request's private folder.
    const parsedPath = input.files[0] ? path.join(path.dirname(input.files[0].path), "parsed-recordings") : undefined;
    const upload = await timing.measure(
      "parse",
      uploadParsePool().run({
        files: input.files,
        ...(parsedPath === undefined ? {} : { parsedPath }),
        maxChars: deps.config.upload.maxFileBytes,
        ...(input.bidsStartUtc === undefined ? {} : { bidsStartUtc: input.bidsStartUtc }),
      }),
    );
    // A cache of the parse, not the record: if it cannot be stored the worker parses the originals.
    // Started at once, beside the device checks; a refusal below discards it with the files.
    const parsedStored = parsedPath
      ? timing
          .measure("parsed", attempt.putAll([{ key: parsedRecordingsKey(patientId, sessionId), path: parsedPath, contentType: "application/octet-stream" }]))
          .catch((err: unknown) => {
            console.error(`[upload] parsed recordings of session ${sessionId} not stored; the worker will parse the uploaded files`, err);
          })
      : Promise.resolve();
    const placements = await mapPlacements(deps, patientId, upload);

    const existing = await findSessionByContent(deps.db, patientId, upload.contentSha256);
    if (existing) {
      await attempt.discard();
      await audit(deps.db, req, { action: "session.upload_duplicate", resourceType: "session", resourceId: existing.id, patientId });
      return { id: existing.id, status: existing.status, duplicate: true };
    }

    const recordedAt = upload.recordings.map((r) => r.startUtc).sort()[0]!;
    const rows: NewRawFile[] = upload.files.map((file, fileIndex) => {
      // Sidecars of a BIDS set describe the recordings of their data file.
      const dataIndex = file.bidsMotionFile ? upload.files.findIndex((f) => f.originalName === file.bidsMotionFile) : fileIndex;
      const recIndexes = upload.files[dataIndex]!.recordingIndexes;
      const first = recIndexes[0]!;
      const recording = upload.recordings[first]!;
      const isData = fileIndex === dataIndex;
      return {
        storage_key: keys[fileIndex]!,
        sha256: file.sha256,
        size_bytes: file.sizeBytes,
        original_name: file.originalName,
        format: file.format,
        device_serial: recording.deviceSerial,
        device_id: placements[first]!.deviceId,
        placement: placements[first]!.placement,
        start_utc: new Date(recording.startUtc),
        recording_placements:
          file.format === "bids-motion" && isData
            ? Object.fromEntries(recIndexes.map((r) => [upload.recordings[r]!.deviceSerial, placements[r]!.placement]))
            : null,
      };
    });

    // The rows need the files stored, not the parsed recordings: the insert runs beside their PUT,
    // and only the enqueue below waits for it, so the worker finds them when it takes the job.
    await storing;
    try {
      await timing.measure(
        "record",
        insertSessionWithFiles(deps.db, { id: sessionId, patientId, recordedAt, uploadedBy: input.auth.userId, contentSha256: upload.contentSha256 }, rows),
      );
    } catch (err) {
      if (!isDuplicateContentError(err)) throw err;
      await attempt.discard();
      const winner = await findSessionByContent(deps.db, patientId, upload.contentSha256);
      if (!winner) throw err;
      await audit(deps.db, req, { action: "session.upload_duplicate", resourceType: "session", resourceId: winner.id, patientId });
      return { id: winner.id, status: winner.status, duplicate: true };
    }
    attempt.keep();

    await audit(deps.db, req, {
      action: "session.upload",
      resourceType: "session",
      resourceId: sessionId,
      patientId,
      details: { files: rows.length, bytes: rows.reduce((n, r) => n + Number(r.size_bytes), 0) },
    });
    await parsedStored;
    try {
      await enqueueProcessing(deps, sessionId);
    } catch (err) {
      console.error(`[upload] session ${sessionId} stored but not enqueued; the worker sweep will pick it up`, err);
    }
    const session = await findSession(deps.db, sessionId);
    return { id: sessionId, status: session?.status ?? "queued", duplicate: false };
  } finally {
    // Refused, failed or a duplicate: nothing of this attempt stays in storage (a no-op once kept).
    await attempt.discard();
    if (req.res && !req.res.headersSent) req.res.setHeader("Server-Timing", timing.header());
  }
}

/**
 * The objects one upload attempt writes. Every key is recorded before its PUT starts (deleting a
 * missing key is no error), so discarding removes whatever made it, including a PUT that failed
 * on our side but completed on the storage's. Discarding waits for running PUTs to finish rather
 * than abandoning them: a PUT cut off on our side may still be completed by the storage after
 * our DELETE, leaving an orphan (seen with the fake); a refusal waits at most for its own files.
 */
class StoredAttempt {
  private readonly keys: string[] = [];
  private readonly running = new Set<Promise<unknown>>();
  private kept = false;

  constructor(private readonly deps: Pick<AppDeps, "storage">) {}

  /** All at once: the storage round trips overlap instead of adding up. Rejects with the first failure, after all have settled. */
  async putAll(files: Array<{ key: string; path: string; contentType: string }>): Promise<void> {
    const puts = files.map((f) => {
      this.keys.push(f.key);
      const put = this.deps.storage.putFile(f.key, f.path, f.contentType);
      this.running.add(put);
      void put.catch(() => undefined).finally(() => this.running.delete(put));
      return put;
    });
    const outcomes = await Promise.allSettled(puts);
    const failed = outcomes.find((o): o is PromiseRejectedResult => o.status === "rejected");
    if (failed) throw failed.reason;
  }

  /** The session row now points at these objects: they are the record. */
  keep(): void {
    this.kept = true;
  }

  async discard(): Promise<void> {
    if (this.kept || this.keys.length === 0) return;
    await Promise.allSettled([...this.running]);
    const keys = this.keys.splice(0);
    await Promise.allSettled(keys.map((key) => this.deps.storage.delete(key)));
  }
}

/**
 * W3C Server Timing (https://www.w3.org/TR/server-timing/): where an upload's time went, for
 * clients and benchmarks (`parsed`: storing the parsed recordings). `total` is this handler's time, from the body on disk to the answer;
 * the client's own total minus it is the time to receive the body.
 */
class ServerTiming {
  private readonly parts: Array<[string, number]> = [];
  private readonly started = performance.now();

  async measure<T>(name: string, work: Promise<T>): Promise<T> {
    const t0 = performance.now();
    try {
      return await work;
    } finally {
      this.parts.push([name, performance.now() - t0]);
    }
  }

  header(): string {
    return [...this.parts, ["total", performance.now() - this.started] as const].map(([name, ms]) => `${name};dur=${ms.toFixed(1)}`).join(", ");
  }
}
