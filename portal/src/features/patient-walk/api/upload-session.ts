import { useMutation } from "@tanstack/react-query";
import { uploadWithProgress, type UploadProgress } from "@/lib/api-client";
import { uploadResponse, type UploadResponse } from "@pendula/ingest-server/contracts";

export interface FileProgress {
  name: string;
  sizeBytes: number;
  /** 0..1 */
  fraction: number;
}

/**
 * One multipart request carries every file (field `files`), so the browser reports progress for
 * the whole body. The parts go in order, so each file's share is read from the running byte count
 * (multipart boundaries add a few hundred bytes, which we leave to the last file).
 */
export function perFileProgress(files: { name: string; size: number }[], progress: UploadProgress): FileProgress[] {
  const total = files.reduce((s, f) => s + f.size, 0);
  const scale = progress.totalBytes > 0 && total > 0 ? total / progress.totalBytes : 1;
  let sent = progress.loadedBytes * scale;
  return files.map((f) => {
    const mine = Math.max(0, Math.min(f.size, sent));
    sent -= f.size;
    return { name: f.name, sizeBytes: f.size, fraction: f.size === 0 ? 1 : mine / f.size };
  });
}

export interface UploadRequest {
  files: File[];
  /** BIDS Motion only: clock time of the first sample, ISO 8601 UTC (BIDS keeps it outside these files). */
  startUtc?: string;
}

export function uploadSession({ files, startUtc }: UploadRequest, onProgress: (p: FileProgress[]) => void, signal?: AbortSignal): Promise<UploadResponse> {
  return uploadWithProgress(
    "/sessions",
    () => {
      const form = new FormData();
      if (startUtc) form.append("startUtc", startUtc);
      for (const f of files) form.append("files", f, f.name);
      return form;
    },
    (p) => onProgress(perFileProgress(files, p)),
    { schema: uploadResponse, signal },
  );
}

export function useUploadSession(onProgress: (p: FileProgress[]) => void) {
  return useMutation({ mutationFn: (request: UploadRequest) => uploadSession(request, onProgress) });
}
