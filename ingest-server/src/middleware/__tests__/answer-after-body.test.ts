import type { Server } from "node:http";
import type { AddressInfo } from "node:net";
import express, { type RequestHandler } from "express";
import { afterEach, describe, expect, it } from "vitest";
import { writeAllThenRead } from "../../testing/raw-upload-client";
import { answerAfterBody } from "../answer-after-body";

// An endpoint that refuses before reading the body and closes the connection, as a server must
// not keep reading an unwanted upload on a reused connection. Without answerAfterBody the close
// comes while the client is still writing, and a client that reads only after writing gets a
// reset instead of the answer (the failure this middleware exists for).
const refuse: RequestHandler = (_req, res) => {
  res.setHeader("Connection", "close");
  res.status(401).json({ error: { code: "unauthorized", message: "sign-in required" } });
};

let server: Server | undefined;
afterEach(async () => {
  await new Promise((r) => (server ? server.close(r) : r(undefined)));
  server = undefined;
});

async function listen(handlers: RequestHandler[]): Promise<number> {
  const app = express();
  app.post("/upload", ...handlers);
  server = app.listen(0, "127.0.0.1");
  await new Promise((r) => server!.once("listening", r));
  return (server.address() as AddressInfo).port;
}

const body = (mib: number) => Array.from({ length: mib }, () => Buffer.alloc(1024 * 1024, 0x61));

describe("answerAfterBody", () => {
  it("a refusal sent mid-body and closed at once does not reach a write-everything-first client (the hazard)", async () => {
    const port = await listen([refuse]);
    const res = await writeAllThenRead({ port, path: "/upload", headers: { "Content-Type": "application/octet-stream" }, body: body(32) });
    expect(res.status).toBe(0);
    expect(res.socketError).toMatch(/EPIPE|ECONNRESET/);
  });

  it("with it, the same client reads the status and JSON body, then the connection closes", async () => {
    const port = await listen([answerAfterBody({ maxBytes: 64 * 1024 * 1024, maxMs: 30_000 }), refuse]);
    const res = await writeAllThenRead({ port, path: "/upload", headers: { "Content-Type": "application/octet-stream" }, body: body(32) });
    expect(res.socketError).toBeUndefined();
    expect(res.status).toBe(401);
    expect(res.headers.connection).toBe("close");
    expect(JSON.parse(res.body).error.code).toBe("unauthorized");
  });

  it("leaves successful answers and requests without a body alone", async () => {
    const port = await listen([answerAfterBody({ maxBytes: 64 * 1024 * 1024, maxMs: 30_000 }), (_req, res) => void res.status(200).json({ ok: true })]);
    const res = await writeAllThenRead({ port, path: "/upload", headers: {}, body: [] });
    expect(res.status).toBe(200);
    expect(res.headers.connection).not.toBe("close");
  });
});
