/**
 * Serialized trend answers, kept per process and checked against a fingerprint of the patient's
 * processed sessions on every read. A trend page is re-read far more often than a session is
 * processed, and building one (2 000+ rows, flags, bands, contract check, JSON) costs tens of
 * milliseconds, so repeated reads send the stored text. The fingerprint query runs every time,
 * so several server processes never serve a stale answer: a new, reprocessed or re-timed
 * session changes the count or the latest updated_at.
 */
import { createHash } from "node:crypto";
import { gzipSync } from "node:zlib";

export interface CachedTrend {
  fingerprint: string;
  body: string;
  /** The same body gzip-compressed once, for clients that accept it (every browser does). */
  gzip: Buffer;
  /** Strong validator of the body, computed once (Express would otherwise hash it on every send). */
  etag: string;
}

export class TrendCache {
  private readonly entries = new Map<string, CachedTrend>();
  private bytes = 0;

  constructor(private readonly maxBytes: number) {}

  get(key: string, fingerprint: string): CachedTrend | undefined {
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

  /** Stores (when it fits the budget) and returns the entry for this body. */
  set(key: string, fingerprint: string, body: string): CachedTrend {
    const etag = `"${createHash("sha1").update(body).digest("base64url")}"`;
    const entry = { fingerprint, body, gzip: gzipSync(body), etag };
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
