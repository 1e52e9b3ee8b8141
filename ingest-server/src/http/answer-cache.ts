/**
 * Serialized JSON answers, kept per process and checked against a fingerprint of their data on
 * every read. A trend page or a processed session is re-read far more often than it changes, and
 * building one (thousands of rows or a large stored analysis, annotations, contract check, JSON)
 * costs tens of milliseconds, so repeated reads send the stored text. The caller reads the
 * fingerprint from the database every time (trends: the patient's processed-session count and
 * latest update; a session: its own update time and status), so several server processes never
 * serve a stale answer.
 */
import { createHash } from "node:crypto";
import { promisify } from "node:util";
import { gzip } from "node:zlib";
import type { Request, Response } from "express";

export interface CachedAnswer {
  fingerprint: string;
  /**
   * The JSON as UTF-8 bytes. Buffers live outside the JavaScript heap, so hundreds of megabytes of
   * cached answers add nothing to garbage-collection pauses (a 300 KB JSON string with one
   * non-Latin-1 character would be a 600 KB two-byte string that every major collection visits).
   */
  body: Buffer;
  /** The same body gzip-compressed once, for clients that accept it (every browser does). */
  gzip: Buffer;
  /** Strong validator of the body, computed once (Express would otherwise hash it on every send). */
  etag: string;
}

const gzipAsync = promisify(gzip);

export class AnswerCache {
  private readonly entries = new Map<string, CachedAnswer>();
  private bytes = 0;

  constructor(private readonly maxBytes: number) {}

  get(key: string, fingerprint: string): CachedAnswer | undefined {
    const hit = this.entries.get(key);
    if (!hit) return undefined;
    if (hit.fingerprint !== fingerprint) {
      this.delete(key);
      return undefined;
    }
    // Map keeps insertion order: re-inserting marks the entry as most recently used.
    this.entries.delete(key);
    this.entries.set(key, hit);
    return hit;
  }

  /**
   * Stores (when it fits the budget) and returns the entry for this body. Compression runs in
   * libuv's thread pool, so building a large answer does not hold up the requests behind it.
   */
  async set(key: string, fingerprint: string, json: string): Promise<CachedAnswer> {
    const body = Buffer.from(json, "utf8");
    const etag = `"${createHash("sha1").update(body).digest("base64url")}"`;
    const entry = { fingerprint, body, gzip: await gzipAsync(body), etag };
    const size = body.length + entry.gzip.length;
    if (size > this.maxBytes) return entry;
    this.delete(key);
    this.entries.set(key, entry);
    this.bytes += size;
    for (const [oldest] of this.entries) {
      if (this.bytes <= this.maxBytes) break;
      this.delete(oldest);
    }
    return entry;
  }

  get size(): number {
    return this.entries.size;
  }

  private delete(key: string): void {
    const e = this.entries.get(key);
    if (!e) return;
    this.bytes -= e.body.length + e.gzip.length;
    this.entries.delete(key);
  }
}

/**
 * Sends a cached answer: 304 when the client's validator still matches, the gzip copy when the
 * client accepts it (every browser does), the text otherwise. `no-store` like every API answer:
 * health data must not stay in a browser's disk cache on a shared ward computer. Browsers then never
 * revalidate, so the gain of this cache is on the server (the answer is built once, not per read);
 * a client that keeps its own copy may still send If-None-Match and get a 304.
 */
export function sendCachedAnswer(req: Request, res: Response, entry: CachedAnswer): void {
  res.status(200).type("application/json").vary("Accept-Encoding").set("ETag", entry.etag).set("Cache-Control", "no-store");
  if (req.fresh) {
    res.status(304).end();
    return;
  }
  if (req.acceptsEncodings("gzip", "identity") === "gzip") res.set("Content-Encoding", "gzip").send(entry.gzip);
  else res.send(entry.body);
}
