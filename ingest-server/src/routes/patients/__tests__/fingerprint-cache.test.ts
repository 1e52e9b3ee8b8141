import { describe, expect, it } from "vitest";
import { FingerprintCache } from "../fingerprint-cache";

describe("FingerprintCache", () => {
  it("returns a value only while its fingerprint matches, and forgets it on a mismatch", () => {
    const c = new FingerprintCache<string[]>(10);
    c.set("p1", "3|t1", ["cadence improved"]);
    expect(c.get("p1", "3|t1")).toEqual(["cadence improved"]);
    expect(c.get("p1", "4|t2")).toBeUndefined();
    expect(c.get("p1", "3|t1")).toBeUndefined();
    expect(c.size).toBe(0);
  });

  it("keeps at most maxEntries, dropping the least recently used", () => {
    const c = new FingerprintCache<number>(2);
    c.set("a", "f", 1);
    c.set("b", "f", 2);
    expect(c.get("a", "f")).toBe(1); // a is now the most recent
    c.set("c", "f", 3);
    expect(c.get("b", "f")).toBeUndefined();
    expect(c.get("a", "f")).toBe(1);
    expect(c.get("c", "f")).toBe(3);
    expect(c.size).toBe(2);
  });
});
