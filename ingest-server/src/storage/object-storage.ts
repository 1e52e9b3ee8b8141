import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadObjectCommand,
  NoSuchKey,
  NotFound,
  PutObjectCommand,
  S3Client,
} from "@aws-sdk/client-s3";
import { createReadStream } from "node:fs";
import { stat } from "node:fs/promises";
import type { Config } from "../config/env";

/** Raw-file storage. Keys are opaque to callers' users: never built from names a patient chose. */
export interface ObjectStorage {
  put(key: string, body: Buffer, contentType?: string): Promise<void>;
  /** Streams a file from disk (uploads are never held whole in memory on their way to storage). */
  putFile(key: string, filePath: string, contentType?: string): Promise<void>;
  /** Rejects with ObjectNotFoundError when the key does not exist. */
  get(key: string): Promise<Buffer>;
  /** Deleting a missing key is not an error (S3 semantics). */
  delete(key: string): Promise<void>;
  exists(key: string): Promise<boolean>;
}

export class ObjectNotFoundError extends Error {
  constructor(readonly key: string) {
    super(`object not found: ${key}`);
    this.name = "ObjectNotFoundError";
  }
}

export function createS3Client(s3: Config["s3"]): S3Client {
  return new S3Client({
    region: s3.region,
    endpoint: s3.endpoint,
    credentials: { accessKeyId: s3.accessKeyId, secretAccessKey: s3.secretAccessKey },
    // Path-style addressing works against any S3-compatible server on 127.0.0.1.
    forcePathStyle: true,
    // The SDK's default flexible checksums make s3rver store streamed bodies corrupted without an
    // error; checksums only where the API demands them (storage round-trip test guards this).
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
  });
}

export class S3ObjectStorage implements ObjectStorage {
  constructor(
    private readonly client: S3Client,
    private readonly bucket: string,
  ) {}

  static fromConfig(s3: Config["s3"]): S3ObjectStorage {
    return new S3ObjectStorage(createS3Client(s3), s3.bucket);
  }

  async put(key: string, body: Buffer, contentType = "application/octet-stream"): Promise<void> {
    await this.client.send(
      new PutObjectCommand({ Bucket: this.bucket, Key: key, Body: body, ContentType: contentType, ContentLength: body.length }),
    );
  }

  async putFile(key: string, filePath: string, contentType = "application/octet-stream"): Promise<void> {
    // ContentLength from the file itself: without it the SDK would buffer the stream to measure it.
    const { size } = await stat(filePath);
    // The SDK retries a Buffer body itself but never a stream (it cannot rewind one), so a socket
    // the server closed just as it was reused ("socket hang up") would fail the upload. A file can
    // be read again: retry with a fresh stream. PUT of the same key and bytes is idempotent.
    for (let attempt = 1; ; attempt++) {
      const body = createReadStream(filePath);
      try {
        await this.client.send(new PutObjectCommand({ Bucket: this.bucket, Key: key, Body: body, ContentType: contentType, ContentLength: size }));
        return;
      } catch (err) {
        if (attempt >= PUT_FILE_ATTEMPTS || !isTransient(err)) throw err;
        await new Promise((r) => setTimeout(r, 100 * 4 ** (attempt - 1)));
      } finally {
        body.destroy();
      }
    }
  }

  async get(key: string): Promise<Buffer> {
    try {
      const out = await this.client.send(new GetObjectCommand({ Bucket: this.bucket, Key: key }));
      if (!out.Body) throw new ObjectNotFoundError(key);
      // A view, not a copy: a session's parsed recordings are tens of megabytes.
      const bytes = await out.Body.transformToByteArray();
      return Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    } catch (err) {
      if (err instanceof NoSuchKey || isNotFound(err)) throw new ObjectNotFoundError(key);
      throw err;
    }
  }

  async delete(key: string): Promise<void> {
    await this.client.send(new DeleteObjectCommand({ Bucket: this.bucket, Key: key }));
  }

  async exists(key: string): Promise<boolean> {
    try {
      await this.client.send(new HeadObjectCommand({ Bucket: this.bucket, Key: key }));
      return true;
    } catch (err) {
      if (err instanceof NotFound || isNotFound(err)) return false;
      throw err;
    }
  }

  destroy(): void {
    this.client.destroy();
  }
}

const PUT_FILE_ATTEMPTS = 3;

/** Connection-level failures and 5xx answers; a 4xx would only repeat itself. */
export function isTransient(err: unknown): boolean {
  const e = err as { code?: string; name?: string; $metadata?: { httpStatusCode?: number } };
  const status = e?.$metadata?.httpStatusCode;
  if (status !== undefined) return status >= 500;
  return ["ECONNRESET", "EPIPE", "ECONNREFUSED", "ETIMEDOUT"].includes(e?.code ?? "") || e?.name === "TimeoutError";
}

function isNotFound(err: unknown): boolean {
  const e = err as { name?: string; $metadata?: { httpStatusCode?: number } };
  return e?.name === "NoSuchKey" || e?.name === "NotFound" || e?.$metadata?.httpStatusCode === 404;
}
