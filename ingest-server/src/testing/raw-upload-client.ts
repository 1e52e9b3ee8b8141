import net from "node:net";

/**
 * A deliberately naive HTTP/1.1 client for upload tests: it writes the request head and the whole
 * body before it reads a byte of the answer, as Python's http.client and many upload libraries do.
 * A server that answers mid-body and then closes with unread bytes makes the kernel reset the
 * connection, and this client then sees a write error and no status — which is what the tests of
 * early refusals guard against.
 */
export interface RawAnswer {
  /** 0 when no status line was received. */
  status: number;
  headers: Record<string, string>;
  body: string;
  /** The socket error met while writing or reading (e.g. EPIPE, ECONNRESET), if any. */
  socketError?: string;
}

export function multipartBody(boundary: string, files: ReadonlyArray<{ fileName: string; bytes: Buffer }>, fields: Record<string, string> = {}): Buffer[] {
  const chunks: Buffer[] = [];
  for (const [name, value] of Object.entries(fields)) {
    chunks.push(Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="${name}"\r\n\r\n${value}\r\n`));
  }
  for (const f of files) {
    chunks.push(Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="files"; filename="${f.fileName}"\r\nContent-Type: text/csv\r\n\r\n`));
    chunks.push(f.bytes);
    chunks.push(Buffer.from("\r\n"));
  }
  chunks.push(Buffer.from(`--${boundary}--\r\n`));
  return chunks;
}

export interface RawRequest {
  port: number;
  path: string;
  headers: Record<string, string>;
  body: Buffer[];
  /** Called after this many body bytes were written; the returned promise holds the rest back. */
  pauseAfter?: { bytes: number; until: () => Promise<void> };
  timeoutMs?: number;
}

export function writeAllThenRead(req: RawRequest): Promise<RawAnswer> {
  const length = req.body.reduce((n, c) => n + c.length, 0);
  const head =
    `POST ${req.path} HTTP/1.1\r\nHost: 127.0.0.1:${req.port}\r\nContent-Length: ${length}\r\n` +
    Object.entries(req.headers)
      .map(([k, v]) => `${k}: ${v}\r\n`)
      .join("") +
    "\r\n";
  return new Promise((resolve, reject) => {
    const socket = net.connect(req.port, "127.0.0.1");
    const received: Buffer[] = [];
    let socketError: string | undefined;
    let settled = false;
    const timer = setTimeout(() => finish(new Error(`no complete answer within ${req.timeoutMs ?? 60_000} ms`)), req.timeoutMs ?? 60_000);
    const finish = (err?: Error) => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      socket.destroy();
      if (err) reject(err);
      else resolve({ ...parseAnswer(Buffer.concat(received)), ...(socketError ? { socketError } : {}) });
    };
    socket.on("error", (err: NodeJS.ErrnoException) => {
      socketError = err.code ?? err.message;
      finish();
    });
    socket.pause(); // nothing is read until the whole request is written
    socket.once("connect", () => {
      (async () => {
        const write = (chunk: Buffer | string) =>
          new Promise<void>((done) => {
            if (socket.destroyed) return done();
            if (socket.write(chunk)) done();
            else socket.once("drain", () => done());
          });
        await write(head);
        let written = 0;
        for (const chunk of req.body) {
          if (req.pauseAfter && written < req.pauseAfter.bytes && written + chunk.length >= req.pauseAfter.bytes) {
            const cut = req.pauseAfter.bytes - written;
            await write(chunk.subarray(0, cut));
            await req.pauseAfter.until();
            await write(chunk.subarray(cut));
          } else {
            await write(chunk);
          }
          written += chunk.length;
          if (socket.destroyed) break;
        }
        if (settled) return;
        socket.on("data", (c: Buffer) => {
          received.push(c);
          if (answerComplete(Buffer.concat(received))) finish();
        });
        socket.on("end", () => finish());
        socket.resume();
      })().catch((err: unknown) => finish(err instanceof Error ? err : new Error(String(err))));
    });
  });
}

function splitHead(raw: Buffer): { head: string; body: Buffer } | undefined {
  const at = raw.indexOf("\r\n\r\n");
  if (at < 0) return undefined;
  return { head: raw.subarray(0, at).toString("latin1"), body: raw.subarray(at + 4) };
}

function answerComplete(raw: Buffer): boolean {
  const parts = splitHead(raw);
  if (!parts) return false;
  const m = /\r\ncontent-length:\s*(\d+)/i.exec(parts.head);
  return m ? parts.body.length >= Number(m[1]) : false;
}

function parseAnswer(raw: Buffer): Omit<RawAnswer, "socketError"> {
  const parts = splitHead(raw);
  if (!parts) return { status: 0, headers: {}, body: raw.toString("utf8") };
  const [statusLine, ...lines] = parts.head.split("\r\n");
  const status = Number(/^HTTP\/1\.[01] (\d{3})/.exec(statusLine ?? "")?.[1] ?? 0);
  const headers: Record<string, string> = {};
  for (const line of lines) {
    const colon = line.indexOf(":");
    if (colon > 0) headers[line.slice(0, colon).trim().toLowerCase()] = line.slice(colon + 1).trim();
  }
  return { status, headers, body: parts.body.toString("utf8") };
}
