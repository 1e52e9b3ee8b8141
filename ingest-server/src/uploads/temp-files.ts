import { chmodSync, mkdirSync, mkdtempSync, readdirSync, rmSync, statSync } from "node:fs";
import { mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import type { Request, RequestHandler } from "express";

/**
 * Private folders for upload bodies on their way from the socket to object storage.
 *
 * Layout: `<root>/p-<pid>-<random>/r-<random>/<random name>`. The root (UPLOAD_TMP_DIR, or one made
 * under the system temp folder) and every folder below it are mode 700, so other local users cannot
 * read patients' recordings. Each server process has its own folder, so several processes can
 * share a root; each request gets a folder of its own, removed with everything in it when the
 * response closes — after success, after any 4xx/5xx, and when the client goes away mid-upload —
 * so no error path has to remember which files multer had already written.
 */
const STALE_PROCESS_FOLDER_MS = 6 * 60 * 60 * 1000; // common practice: far beyond any upload's life

const processFolders = new Map<string, string>();
const defaultRoot = () => path.join(tmpdir(), "pendula-uploads");

let exitHook = false;

function removeProcessFoldersOnExit(): void {
  if (exitHook) return;
  exitHook = true;
  process.once("exit", () => {
    for (const f of processFolders.values()) rmSync(f, { recursive: true, force: true });
  });
}

/** This process's private folder under `root` (made on first use; stale siblings are swept then). */
export function processUploadFolder(root: string | undefined): string {
  const base = path.resolve(root ?? defaultRoot());
  const known = processFolders.get(base);
  if (known) return known;
  mkdirSync(base, { recursive: true, mode: 0o700 });
  chmodSync(base, 0o700);
  sweepStale(base);
  const folder = mkdtempSync(path.join(base, `p-${process.pid}-`));
  chmodSync(folder, 0o700);
  processFolders.set(base, folder);
  removeProcessFoldersOnExit();
  return folder;
}

/** A process that died mid-upload leaves its folder behind; remove those older than a few hours. */
function sweepStale(base: string): void {
  const now = Date.now();
  for (const name of readdirSync(base)) {
    if (!name.startsWith("p-")) continue;
    const full = path.join(base, name);
    try {
      if (now - statSync(full).mtimeMs > STALE_PROCESS_FOLDER_MS) rmSync(full, { recursive: true, force: true });
    } catch {
      // Another process removed it first.
    }
  }
}

declare module "express-serve-static-core" {
  interface Request {
    /** Private folder holding this request's upload bodies (see uploads/temp-files.ts). */
    uploadFolder?: string;
  }
}

/**
 * Gives the request its own folder and removes it when the response closes (whatever the outcome).
 * Runs before multer, whose disk storage writes into `req.uploadFolder`.
 */
export function requestUploadFolder(root: string | undefined): RequestHandler {
  return async (req, res, next) => {
    const folder = await newRequestFolder(root);
    req.uploadFolder = folder;
    res.once("close", () => {
      void rm(folder, { recursive: true, force: true }).catch((err: unknown) => {
        console.error(`[upload] could not remove ${folder}`, err);
      });
    });
    next();
  };
}

/** A fresh folder in this process's folder, which is made again if a temp cleaner removed it. */
async function newRequestFolder(root: string | undefined): Promise<string> {
  try {
    return await mkdtemp(path.join(processUploadFolder(root), "r-"));
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== "ENOENT") throw err;
    processFolders.delete(path.resolve(root ?? defaultRoot()));
    return await mkdtemp(path.join(processUploadFolder(root), "r-"));
  }
}

export function uploadFolderOf(req: Request): string {
  if (!req.uploadFolder) throw new Error("upload folder missing: requestUploadFolder() must run before multer");
  return req.uploadFolder;
}

/**
 * For uploads that do not come over HTTP (the demo seed): writes the files to a private folder,
 * runs `use` with their paths, and removes the folder whatever happens.
 */
export async function withUploadFiles<T>(
  root: string | undefined,
  files: ReadonlyArray<{ originalName: string; bytes: Buffer | string }>,
  use: (files: Array<{ originalName: string; path: string }>) => Promise<T>,
): Promise<T> {
  const folder = await newRequestFolder(root);
  try {
    const written = await Promise.all(
      files.map(async (f, i) => {
        const file = path.join(folder, String(i));
        await writeFile(file, f.bytes);
        return { originalName: f.originalName, path: file };
      }),
    );
    return await use(written);
  } finally {
    await rm(folder, { recursive: true, force: true });
  }
}
