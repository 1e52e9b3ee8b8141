/**
 * A per-process map of values that stay valid while a fingerprint of their inputs does not change,
 * least recently used out first. The caller computes the fingerprint from the database on every
 * read (as the trend cache does), so several server processes never serve a stale value.
 */
export class FingerprintCache<T> {
  private readonly entries = new Map<string, { fingerprint: string; value: T }>();

  constructor(private readonly maxEntries: number) {}

  get(key: string, fingerprint: string): T | undefined {
    const hit = this.entries.get(key);
    if (!hit) return undefined;
    this.entries.delete(key);
    if (hit.fingerprint !== fingerprint) return undefined;
    // Map keeps insertion order: re-inserting marks the entry as most recently used.
    this.entries.set(key, hit);
    return hit.value;
  }

  set(key: string, fingerprint: string, value: T): T {
    this.entries.delete(key);
    this.entries.set(key, { fingerprint, value });
    for (const [oldest] of this.entries) {
      if (this.entries.size <= this.maxEntries) break;
      this.entries.delete(oldest);
    }
    return value;
  }

  get size(): number {
    return this.entries.size;
  }
}
