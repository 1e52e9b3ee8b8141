import { createHash, randomBytes } from "node:crypto";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import http from "node:http";
import type { AddressInfo } from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, afterEach, describe, expect, it } from "vitest";
import { createS3Client, S3ObjectStorage } from "../object-storage";

// A stand-in S3 endpoint that misbehaves on purpose: the SDK never retries a streamed body, so
// putFile must (a reused keep-alive socket closing under a request is routine).
const dir = mkdtempSync(path.join(tmpdir(), "pendula-putfile-retry-"));
const file = path.join(dir, "walk.csv");
const bytes = randomBytes(256 * 1024 + 3);
writeFileSync(file, bytes);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

let server: http.Server | undefined;
afterEach(async () => {
  await new Promise((r) => (server ? server.close(r) : r(undefined)));
  server = undefined;
});

async function fakeS3(answer: (attempt: number, req: http.IncomingMessage, res: http.ServerResponse, body: Buffer) => void) {
  const seen: Buffer[] = [];
  server = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", () => {
      const body = Buffer.concat(chunks);
      seen.push(body);
      answer(seen.length, req, res, body);
    });
  });
  server.listen(0, "127.0.0.1");
  await new Promise((r) => server!.once("listening", r));
  const { port } = server.address() as AddressInfo;
  const client = createS3Client({ endpoint: `http://127.0.0.1:${port}`, bucket: "b", region: "local", accessKeyId: "k", secretAccessKey: "s" });
  return { storage: new S3ObjectStorage(client, "b"), seen };
}

const sha = (b: Buffer) => createHash("sha256").update(b).digest("hex");

describe("S3ObjectStorage.putFile", () => {
  it("sends the file again from the start when the connection drops under the first attempt", async () => {
    const { storage, seen } = await fakeS3((attempt, _req, res) => {
      if (attempt === 1) res.socket?.destroy();
      else res.writeHead(200, { ETag: '"x"' }).end();
    });
    await storage.putFile("raw/p/s/00-x", file, "text/plain");
    expect(seen).toHaveLength(2);
    expect(sha(seen[1]!)).toBe(sha(bytes));
    storage.destroy();
  });

  it("does not retry a refusal (403)", async () => {
    const { storage, seen } = await fakeS3((_attempt, _req, res) => {
      res.writeHead(403, { "Content-Type": "application/xml" }).end("<Error><Code>AccessDenied</Code><Message>denied</Message></Error>");
    });
    await expect(storage.putFile("raw/p/s/00-x", file)).rejects.toThrow();
    expect(seen).toHaveLength(1);
    storage.destroy();
  });
});
