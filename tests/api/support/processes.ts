import { spawn, type ChildProcess } from "node:child_process";
import { createServer } from "node:net";
import { fileURLToPath } from "node:url";
import type { TestContext } from "../../../ingest-server/src/testing/harness";

export const REPO_ROOT = fileURLToPath(new URL("../../..", import.meta.url));

/** The environment a real server or worker process needs to join a test context's services. */
export function childEnv(ctx: TestContext, extra: Record<string, string> = {}): NodeJS.ProcessEnv {
  const c = ctx.config;
  return {
    PATH: process.env.PATH,
    HOME: process.env.HOME,
    NODE_ENV: "test",
    PENDULA_MODE: c.mode,
    DATABASE_URL: c.databaseUrl,
    JWT_SECRET: c.jwtSecret,
    RESEARCH_HMAC_KEY: c.researchHmacKey,
    BCRYPT_COST: String(c.bcryptCost),
    S3_ENDPOINT: c.s3.endpoint ?? "",
    S3_BUCKET: c.s3.bucket,
    S3_REGION: c.s3.region,
    S3_ACCESS_KEY_ID: c.s3.accessKeyId,
    S3_SECRET_ACCESS_KEY: c.s3.secretAccessKey,
    SMTP_HOST: c.smtp.host,
    SMTP_PORT: String(c.smtp.port),
    PUBLIC_URL: c.publicUrl,
    QUEUE_SCHEMA: c.queueSchema,
    QUEUE_EXPIRE_S: String(c.queue.expireS),
    QUEUE_MAINTENANCE_S: String(c.queue.maintenanceS),
    PORTAL_DIST: c.portalDist ?? "",
    ...extra,
  };
}

export interface Child {
  proc: ChildProcess;
  output: () => string;
  /** Resolves with the first stdout line matching `pattern`. */
  waitForLine(pattern: RegExp, timeoutMs?: number): Promise<string>;
  /** SIGKILL to the whole process group (npx → tsx → node), then waits for the exit. */
  kill(signal?: NodeJS.Signals): Promise<void>;
}

/** `npx tsx <script>` in its own process group, so a kill reaches the node process that runs it. */
export function startTsx(script: string, env: NodeJS.ProcessEnv): Child {
  const proc = spawn("npx", ["tsx", script], { cwd: REPO_ROOT, env, detached: true, stdio: ["ignore", "pipe", "pipe"] });
  let out = "";
  const listeners: Array<() => void> = [];
  const onData = (d: Buffer) => {
    out += d.toString();
    for (const l of listeners) l();
  };
  proc.stdout!.on("data", onData);
  proc.stderr!.on("data", onData);
  const exited = new Promise<void>((resolve) => proc.once("exit", () => resolve()));
  return {
    proc,
    output: () => out,
    waitForLine(pattern, timeoutMs = 60_000) {
      return new Promise((resolve, reject) => {
        const check = () => {
          const line = out.split("\n").find((l) => pattern.test(l));
          if (line) {
            clearTimeout(timer);
            resolve(line);
          }
        };
        const timer = setTimeout(() => reject(new Error(`no line ${pattern} within ${timeoutMs} ms; output:\n${out.slice(-3000)}`)), timeoutMs);
        listeners.push(check);
        proc.once("exit", (code) => reject(new Error(`${script} exited (${code}) before ${pattern}; output:\n${out.slice(-3000)}`)));
        check();
      });
    },
    async kill(signal = "SIGKILL") {
      if (proc.exitCode === null && proc.signalCode === null) {
        try {
          process.kill(-proc.pid!, signal);
        } catch {
          // already gone
        }
      }
      await exited;
    },
  };
}

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once("error", reject);
    s.listen(0, "127.0.0.1", () => {
      const addr = s.address();
      const port = typeof addr === "object" && addr ? addr.port : 0;
      s.close(() => resolve(port));
    });
  });
}

export async function waitUntil<T>(what: string, fn: () => Promise<T | undefined>, timeoutMs = 90_000, everyMs = 100): Promise<T> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const v = await fn();
    if (v !== undefined) return v;
    if (Date.now() > until) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, everyMs));
  }
}
