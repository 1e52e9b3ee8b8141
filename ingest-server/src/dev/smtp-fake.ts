import { randomUUID } from "node:crypto";
import { mkdirSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import type { AddressInfo } from "node:net";
import path from "node:path";
import { simpleParser } from "mailparser";
import { SMTPServer } from "smtp-server";

export interface CapturedMessage {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  headers: Record<string, string>;
}

export interface SmtpFake {
  host: "127.0.0.1";
  port: number;
  directory: string;
  messages(): CapturedMessage[];
  /** Resolves with the first captured message matching `predicate` (polls; rejects after timeoutMs). */
  waitFor(predicate: (m: CapturedMessage) => boolean, timeoutMs?: number): Promise<CapturedMessage>;
  clear(): void;
  close(): Promise<void>;
}

/**
 * A local SMTP server that accepts everything and keeps it: in memory for tests, and one JSON file
 * per message in `directory` so another process (the server's dev mailbox route) can list them.
 */
export async function startSmtpFake(options: { directory: string; port?: number }): Promise<SmtpFake> {
  mkdirSync(options.directory, { recursive: true });
  let captured: CapturedMessage[] = [];
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    logger: false,
    size: 5 * 1024 * 1024,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          const headers: Record<string, string> = {};
          for (const [k, v] of parsed.headers) if (typeof v === "string") headers[k] = v;
          const message: CapturedMessage = {
            id: randomUUID(),
            receivedAt: new Date().toISOString(),
            from: session.envelope.mailFrom ? session.envelope.mailFrom.address : "",
            to: session.envelope.rcptTo.map((r) => r.address),
            subject: parsed.subject ?? "",
            text: parsed.text ?? "",
            html: typeof parsed.html === "string" ? parsed.html : null,
            headers,
          };
          captured.push(message);
          // Time-ordered file names so a directory listing is already chronological.
          const file = `${message.receivedAt.replace(/[:.]/g, "-")}_${message.id}.json`;
          writeFileSync(path.join(options.directory, file), JSON.stringify(message, null, 2));
          callback();
        })
        .catch((err: Error) => callback(err));
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port ?? 0, "127.0.0.1", () => resolve());
  });
  const port = (server.server.address() as AddressInfo).port;
  return {
    host: "127.0.0.1",
    port,
    directory: options.directory,
    messages: () => [...captured],
    async waitFor(predicate, timeoutMs = 5000) {
      const deadline = Date.now() + timeoutMs;
      for (;;) {
        const found = captured.find(predicate);
        if (found) return found;
        if (Date.now() > deadline) throw new Error("no matching message reached the SMTP fake in time");
        await new Promise((r) => setTimeout(r, 25));
      }
    },
    clear() {
      captured = [];
    },
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

/** Messages a fake wrote to `directory`, newest first (used by GET /api/dev/mailbox). */
export function readMailbox(directory: string): CapturedMessage[] {
  let files: string[];
  try {
    files = readdirSync(directory).filter((f) => f.endsWith(".json"));
  } catch {
    return [];
  }
  return files
    .sort()
    .reverse()
    .flatMap((f) => {
      try {
        return [JSON.parse(readFileSync(path.join(directory, f), "utf8")) as CapturedMessage];
      } catch {
        return []; // a file being written right now; it shows up on the next read
      }
    });
}
