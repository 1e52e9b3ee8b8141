import { gunzipSync } from "node:zlib";
import { describe, expect, it } from "vitest";
import { AnswerCache } from "../answer-cache";

describe("AnswerCache", async () => {
  it("returns a body only while its fingerprint still matches", async () => {
    const c = new AnswerCache(1000);
    await c.set("p1", "3|t1", "{a}");
    expect(c.get("p1", "3|t1")?.body.toString()).toBe("{a}");
    expect(gunzipSync(c.get("p1", "3|t1")!.gzip).toString()).toBe("{a}");
    expect(c.get("p1", "4|t2")).toBeUndefined();
    // A mismatch drops the entry, so the old body can never come back.
    expect(c.get("p1", "3|t1")).toBeUndefined();
  });

  it("evicts the least recently used entries beyond its byte budget", async () => {
    const one = "x".repeat(100);
    const entryBytes = Buffer.byteLength(one) + (await new AnswerCache(1e6).set("k", "f", one)).gzip.length;
    const c = new AnswerCache(2 * entryBytes + 1);
    await c.set("a", "f", one);
    await c.set("b", "f", one);
    expect(c.get("a", "f")?.body.toString()).toBe(one); // a is now the most recent
    await c.set("c", "f", one); // three entries exceed the budget: b, the least recent, goes
    expect(c.get("b", "f")).toBeUndefined();
    expect(c.get("a", "f")?.body.toString()).toBe(one);
    expect(c.get("c", "f")?.body.toString()).toBe(one);
    expect(c.size).toBe(2);
  });

  it("never stores a body larger than the whole budget", async () => {
    const c = new AnswerCache(3);
    expect((await c.set("a", "f", "1234")).body.toString()).toBe("1234");
    expect(c.size).toBe(0);
  });
});
