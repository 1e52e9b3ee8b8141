import { z } from "zod";

/**
 * Server configuration, parsed once at start-up from the environment. A bad environment fails with
 * every problem listed at once, so a deploy is fixed in one round instead of one variable at a time.
 */
const int = (fallback: number, min: number, max: number) => z.coerce.number().int().min(min).max(max).default(fallback);
const secret = (name: string) =>
  z.string({ error: `${name} is required` }).min(32, { error: `${name} must be at least 32 characters` });

/**
 * `demo`: the invented scenario's accounts with their published password, the local fakes and the
 * captured-mail route. `production`: none of those. Production is the default, so a server started
 * by hand without saying otherwise is the locked-down one; `npm start` and the tests ask for demo.
 */
export const PENDULA_MODES = ["demo", "production"] as const;
export type PendulaMode = (typeof PENDULA_MODES)[number];

// s3rver's built-in key pair, which the local object-storage fake accepts.
const S3_FAKE_KEY_ID = "S3RVER";
const LOOPBACK_HOSTNAMES = ["127.0.0.1", "localhost"];
const HOSTNAME = /^(?:[a-z0-9](?:[a-z0-9-]{0,61}[a-z0-9])?)(?:\.[a-z0-9](?:[a-z0-9-]{0,61}[a-z0-9])?)*$/;

export const envSchema = z.object({
  NODE_ENV: z.enum(["development", "test", "production"]).default("development"),
  PENDULA_MODE: z.enum(PENDULA_MODES, { error: "PENDULA_MODE must be demo or production" }).default("production"),
  PORT: int(8641, 1, 65535),
  // The server only ever binds loopback; a reverse proxy in front of it terminates TLS.
  HOST: z.literal("127.0.0.1", { error: "HOST must be 127.0.0.1 (the server binds loopback only)" }).default("127.0.0.1"),
  DATABASE_URL: z.url({ protocol: /^postgres(ql)?$/, error: "DATABASE_URL must be a postgres:// URL" }),
  JWT_SECRET: secret("JWT_SECRET"),
  ACCESS_TOKEN_TTL_S: int(900, 30, 86_400),
  REFRESH_TTL_DAYS: int(14, 1, 90),
  INVITATION_TTL_DAYS: int(7, 1, 30),
  PASSWORD_RESET_TTL_MIN: int(60, 5, 1440),
  S3_ENDPOINT: z.url().optional(),
  S3_BUCKET: z.string().min(3).default("pendula-raw"),
  S3_REGION: z.string().min(1).default("us-east-1"),
  S3_ACCESS_KEY_ID: z.string({ error: "S3_ACCESS_KEY_ID is required" }).min(1),
  S3_SECRET_ACCESS_KEY: z.string({ error: "S3_SECRET_ACCESS_KEY is required" }).min(1),
  SMTP_HOST: z.string().min(1).default("127.0.0.1"),
  SMTP_PORT: int(2525, 1, 65535),
  // A relay that wants a sign-in; both or neither.
  SMTP_USER: z.string().min(1).optional(),
  SMTP_PASSWORD: z.string().min(1).optional(),
  MAIL_FROM: z.string().min(3).default("Pendula <no-reply@pendula.invalid>"),
  PUBLIC_URL: z.url().default("http://127.0.0.1:8641"),
  // Host names (no port) the server answers for, comma-separated; PUBLIC_URL's and loopback's are
  // always included. Anything else gets 421, so a DNS-rebinding page cannot talk to the server.
  ALLOWED_HOSTS: z
    .string()
    .transform((v) => v.split(",").map((h) => h.trim().toLowerCase()).filter((h) => h !== ""))
    .pipe(z.array(z.string().regex(HOSTNAME, { error: "ALLOWED_HOSTS entries must be host names without port or scheme" })))
    .default([]),
  BCRYPT_COST: int(12, 4, 15),
  UPLOAD_MAX_FILES: int(8, 1, 32),
  UPLOAD_MAX_FILE_BYTES: int(50 * 1024 * 1024, 1024, 1024 * 1024 * 1024),
  // Private folder (mode 700) for upload bodies between the socket and object storage; default:
  // pendula-uploads under the system temp folder. Uploads a user may have in flight at once.
  UPLOAD_TMP_DIR: z.string().min(1).optional(),
  UPLOAD_IN_FLIGHT_PER_USER: int(2, 1, 100),
  JSON_BODY_LIMIT: z.string().default("100kb"),
  LOGIN_RATE_LIMIT: int(10, 1, 10_000),
  LOGIN_RATE_WINDOW_S: int(900, 1, 86_400),
  // Uploads per signed-in user and window (each one parses and stores megabytes).
  UPLOAD_RATE_LIMIT: int(60, 1, 100_000),
  // Per-process memory for serialized trend and session answers (see http/answer-cache.ts); 0 disables it.
  TREND_CACHE_MB: int(128, 0, 8192),
  SESSION_CACHE_MB: int(128, 0, 8192),
  UPLOAD_RATE_WINDOW_S: int(900, 1, 86_400),
  RESEARCH_HMAC_KEY: secret("RESEARCH_HMAC_KEY"),
  // Seals authenticator secrets at rest (auth/secret-box.ts). Unset: derived from JWT_SECRET with HKDF.
  SECOND_FACTOR_KEY: secret("SECOND_FACTOR_KEY").optional(),
  // Only behind a reverse proxy on this machine: then X-Forwarded-For from loopback names the client.
  TRUST_PROXY: z.enum(["0", "1", "false", "true"]).default("0"),
  QUEUE_SCHEMA: z
    .string()
    .regex(/^[a-z_][a-z0-9_]*$/, { error: "QUEUE_SCHEMA must be a lower-case SQL identifier" })
    .default("pgboss"),
  // A job still active this long after it started is taken for crashed and retried (pg-boss
  // expireInSeconds, under its 24-hour cap); the check runs every QUEUE_MAINTENANCE_S seconds.
  QUEUE_EXPIRE_S: int(15 * 60, 1, 23 * 3600),
  QUEUE_MAINTENANCE_S: int(120, 1, 3600),
  // Folder the SMTP fake writes captured messages to; enables GET /api/dev/mailbox when set.
  DEV_MAILBOX_DIR: z.string().min(1).optional(),
  // Built portal; defaults to ../portal/dist relative to the ingest-server package.
  PORTAL_DIST: z.string().min(1).optional(),
});

export type Env = z.output<typeof envSchema>;

export interface Config {
  env: Env["NODE_ENV"];
  /** demo or production; ask isDemoMode(config) rather than comparing strings. */
  mode: PendulaMode;
  port: number;
  host: "127.0.0.1";
  databaseUrl: string;
  jwtSecret: string;
  accessTokenTtlS: number;
  refreshTtlDays: number;
  invitationTtlDays: number;
  passwordResetTtlMin: number;
  s3: { endpoint?: string; bucket: string; region: string; accessKeyId: string; secretAccessKey: string };
  smtp: {
    host: string;
    port: number;
    from: string;
    /** STARTTLS (or TLS on 465) is mandatory, except to the local fake in demo mode. */
    requireTls: boolean;
    auth?: { user: string; pass: string };
  };
  publicUrl: string;
  /** Lower-case host names (ports ignored) a request's Host header may carry. */
  allowedHosts: string[];
  /** True when PUBLIC_URL is https: cookies then carry the Secure flag. */
  secureCookies: boolean;
  bcryptCost: number;
  upload: { maxFiles: number; maxFileBytes: number; tmpDir?: string; inFlightPerUser: number };
  jsonBodyLimit: string;
  loginRateLimit: { max: number; windowS: number };
  uploadRateLimit: { max: number; windowS: number };
  trendCacheBytes: number;
  sessionCacheBytes: number;
  researchHmacKey: string;
  /** Key material for sealing authenticator secrets; when absent, one is derived from jwtSecret. */
  secondFactorKey?: string;
  trustProxy: boolean;
  queueSchema: string;
  queue: { expireS: number; maintenanceS: number };
  devMailboxDir?: string;
  portalDist?: string;
}

export class ConfigError extends Error {
  constructor(readonly problems: string[]) {
    super(`Invalid environment:\n${problems.map((p) => `  - ${p}`).join("\n")}`);
    this.name = "ConfigError";
  }
}

export function loadConfig(source: NodeJS.ProcessEnv = process.env): Config {
  // Empty strings count as unset, so `FOO=` in a shell falls back to the default.
  const cleaned = Object.fromEntries(Object.entries(source).filter(([, v]) => v !== undefined && v !== ""));
  const parsed = envSchema.safeParse(cleaned);
  if (!parsed.success) {
    throw new ConfigError(parsed.error.issues.map((i) => `${i.path.join(".") || "(root)"}: ${i.message}`));
  }
  const e = parsed.data;
  const problems = modeProblems(e);
  if (problems.length > 0) throw new ConfigError(problems);
  const publicHost = new URL(e.PUBLIC_URL).hostname.toLowerCase();
  const loopbackSmtp = LOOPBACK_HOSTNAMES.includes(e.SMTP_HOST.toLowerCase());
  return {
    env: e.NODE_ENV,
    mode: e.PENDULA_MODE,
    port: e.PORT,
    host: e.HOST,
    databaseUrl: e.DATABASE_URL,
    jwtSecret: e.JWT_SECRET,
    accessTokenTtlS: e.ACCESS_TOKEN_TTL_S,
    refreshTtlDays: e.REFRESH_TTL_DAYS,
    invitationTtlDays: e.INVITATION_TTL_DAYS,
    passwordResetTtlMin: e.PASSWORD_RESET_TTL_MIN,
    s3: {
      endpoint: e.S3_ENDPOINT,
      bucket: e.S3_BUCKET,
      region: e.S3_REGION,
      accessKeyId: e.S3_ACCESS_KEY_ID,
      secretAccessKey: e.S3_SECRET_ACCESS_KEY,
    },
    smtp: {
      host: e.SMTP_HOST,
      port: e.SMTP_PORT,
      from: e.MAIL_FROM,
      requireTls: !(e.PENDULA_MODE === "demo" && loopbackSmtp),
      ...(e.SMTP_USER && e.SMTP_PASSWORD ? { auth: { user: e.SMTP_USER, pass: e.SMTP_PASSWORD } } : {}),
    },
    publicUrl: e.PUBLIC_URL.replace(/\/+$/, ""),
    allowedHosts: [...new Set([publicHost, ...LOOPBACK_HOSTNAMES, ...e.ALLOWED_HOSTS])],
    secureCookies: e.PUBLIC_URL.startsWith("https:"),
    bcryptCost: e.BCRYPT_COST,
    upload: { maxFiles: e.UPLOAD_MAX_FILES, maxFileBytes: e.UPLOAD_MAX_FILE_BYTES, tmpDir: e.UPLOAD_TMP_DIR, inFlightPerUser: e.UPLOAD_IN_FLIGHT_PER_USER },
    jsonBodyLimit: e.JSON_BODY_LIMIT,
    loginRateLimit: { max: e.LOGIN_RATE_LIMIT, windowS: e.LOGIN_RATE_WINDOW_S },
    uploadRateLimit: { max: e.UPLOAD_RATE_LIMIT, windowS: e.UPLOAD_RATE_WINDOW_S },
    trendCacheBytes: e.TREND_CACHE_MB * 1024 * 1024,
    sessionCacheBytes: e.SESSION_CACHE_MB * 1024 * 1024,
    researchHmacKey: e.RESEARCH_HMAC_KEY,
    ...(e.SECOND_FACTOR_KEY ? { secondFactorKey: e.SECOND_FACTOR_KEY } : {}),
    trustProxy: e.TRUST_PROXY === "1" || e.TRUST_PROXY === "true",
    queueSchema: e.QUEUE_SCHEMA,
    queue: { expireS: e.QUEUE_EXPIRE_S, maintenanceS: e.QUEUE_MAINTENANCE_S },
    devMailboxDir: e.DEV_MAILBOX_DIR,
    portalDist: e.PORTAL_DIST,
  };
}

/** True in demo mode: demo accounts, the captured-mail route and the local fakes are allowed. */
export function isDemoMode(config: Pick<Config, "mode">): boolean {
  return config.mode === "demo";
}

/** Settings that only make sense with the local fakes, refused in production; plus SMTP sign-in pairing. */
function modeProblems(e: Env): string[] {
  const problems: string[] = [];
  if (Boolean(e.SMTP_USER) !== Boolean(e.SMTP_PASSWORD)) problems.push("SMTP_USER and SMTP_PASSWORD: set both or neither");
  if (e.PENDULA_MODE !== "production") return problems;
  if (e.DEV_MAILBOX_DIR) problems.push("DEV_MAILBOX_DIR: the captured-mail folder belongs to demo mode; unset it in production");
  if (e.S3_ACCESS_KEY_ID === S3_FAKE_KEY_ID) problems.push("S3_ACCESS_KEY_ID: the local object-storage fake's key is refused in production");
  if (!e.PUBLIC_URL.startsWith("https:")) problems.push("PUBLIC_URL: production needs the https address patients and staff use (TLS at the reverse proxy)");
  return problems;
}

/** For command-line entry points (server, worker, seed): a bad environment prints every problem and exits 2. */
export function loadConfigOrExit(source: NodeJS.ProcessEnv = process.env): Config {
  try {
    return loadConfig(source);
  } catch (err) {
    if (err instanceof ConfigError) {
      console.error(err.message);
      process.exit(2);
    }
    throw err;
  }
}
