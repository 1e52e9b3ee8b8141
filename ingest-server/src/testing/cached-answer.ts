import { expect } from "vitest";
import type { Response, Test } from "supertest";

/**
 * Reads an answer twice and once more with its validator: the repeat is the same text, the ETag
 * is a strong one, neither answer may be stored (health data: `no-store`), and revalidation
 * answers 304 without a body (http/answer-cache.ts). Three requests in all; returns the first
 * answer and its ETag.
 */
export async function expectRevalidatedAnswer(get: () => Test): Promise<{ first: Response; second: Response; etag: string }> {
  const first = await get();
  const second = await get();
  expect(second.status).toBe(200);
  expect(second.text).toBe(first.text);
  expect(first.headers["cache-control"]).toBe("no-store");
  expect(second.headers["cache-control"]).toBe("no-store");
  const etag = first.headers.etag as string;
  expect(etag).toMatch(/^"[A-Za-z0-9_-]+"$/);
  expect((await get().set("If-None-Match", etag)).status).toBe(304);
  return { first, second, etag };
}
