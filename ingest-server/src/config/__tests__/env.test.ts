import { describe, expect, it } from "vitest";
import { ConfigError, isDemoMode, loadConfig } from "../env";

const minimal = {
  DATABASE_URL: "postgres://postgres@127.0.0.1:5432/pendula",
  JWT_SECRET: "j".repeat(32),
  RESEARCH_HMAC_KEY: "r".repeat(32),
  S3_ACCESS_KEY_ID: "key",
  S3_SECRET_ACCESS_KEY: "secret",
  PUBLIC_URL: "https://gait.clinic.example",
};

function problemsOf(source: Record<string, string>): string {
  try {
    loadConfig(source);
  } catch (err) {
    expect(err).toBeInstanceOf(ConfigError);
    return (err as ConfigError).problems.join("\n");
  }
  return expect.unreachable("the environment was accepted") as never;
}

describe("loadConfig", () => {
  it("applies the documented defaults", () => {
    const c = loadConfig(minimal);
    expect(c.port).toBe(8641);
    expect(c.host).toBe("127.0.0.1");
    expect(c.accessTokenTtlS).toBe(900);
    expect(c.bcryptCost).toBe(12);
    expect(c.secureCookies).toBe(true);
    expect(c.devMailboxDir).toBeUndefined();
    expect(c.mode).toBe("production");
    expect(isDemoMode(c)).toBe(false);
    expect(c.smtp.requireTls).toBe(true);
    expect(c.allowedHosts).toEqual(["gait.clinic.example", "127.0.0.1", "localhost"]);
  });

  it("lists every problem at once", () => {
    try {
      loadConfig({ HOST: "0.0.0.0", JWT_SECRET: "short", PORT: "99999", BCRYPT_COST: "2" });
      expect.unreachable();
    } catch (err) {
      expect(err).toBeInstanceOf(ConfigError);
      const problems = (err as ConfigError).problems.join("\n");
      for (const name of ["HOST", "JWT_SECRET", "PORT", "BCRYPT_COST", "DATABASE_URL", "RESEARCH_HMAC_KEY", "S3_ACCESS_KEY_ID", "S3_SECRET_ACCESS_KEY"]) {
        expect(problems).toContain(name);
      }
      expect(problems).toContain("at least 32 characters");
    }
  });

  it("marks cookies Secure when the public URL is https and trims its trailing slash", () => {
    const c = loadConfig({ ...minimal, PUBLIC_URL: "https://gait.clinic.example/" });
    expect(c.secureCookies).toBe(true);
    expect(c.publicUrl).toBe("https://gait.clinic.example");
  });

  it("treats empty strings as unset", () => {
    expect(loadConfig({ ...minimal, PORT: "", DEV_MAILBOX_DIR: "" }).port).toBe(8641);
  });
});

describe("loadConfig: PENDULA_MODE", () => {
  const demo = { ...minimal, PENDULA_MODE: "demo", PUBLIC_URL: "http://127.0.0.1:8641" };

  it("accepts the local fakes' settings in demo mode", () => {
    const c = loadConfig({ ...demo, S3_ACCESS_KEY_ID: "S3RVER", DEV_MAILBOX_DIR: "fakes/mailbox", SMTP_HOST: "127.0.0.1" });
    expect(isDemoMode(c)).toBe(true);
    expect(c.devMailboxDir).toBe("fakes/mailbox");
    expect(c.smtp.requireTls).toBe(false);
    expect(c.secureCookies).toBe(false);
  });

  it("refuses every local-fake setting in production, all listed at once", () => {
    const problems = problemsOf({
      ...minimal,
      PENDULA_MODE: "production",
      DEV_MAILBOX_DIR: "fakes/mailbox",
      S3_ACCESS_KEY_ID: "S3RVER",
      PUBLIC_URL: "http://gait.clinic.example",
    });
    expect(problems).toContain("DEV_MAILBOX_DIR");
    expect(problems).toContain("S3_ACCESS_KEY_ID");
    expect(problems).toContain("PUBLIC_URL");
  });

  it("refuses an unknown mode", () => {
    expect(problemsOf({ ...minimal, PENDULA_MODE: "staging" })).toContain("PENDULA_MODE must be demo or production");
  });

  it("demands STARTTLS from any relay but the local fake in demo mode", () => {
    expect(loadConfig({ ...demo, SMTP_HOST: "localhost" }).smtp.requireTls).toBe(false);
    expect(loadConfig({ ...demo, SMTP_HOST: "smtp.clinic.example" }).smtp.requireTls).toBe(true);
    expect(loadConfig({ ...minimal, SMTP_HOST: "127.0.0.1" }).smtp.requireTls).toBe(true);
  });

  it("takes an SMTP sign-in only as a pair", () => {
    expect(loadConfig({ ...minimal, SMTP_USER: "pendula", SMTP_PASSWORD: "pw" }).smtp.auth).toEqual({ user: "pendula", pass: "pw" });
    expect(problemsOf({ ...minimal, SMTP_USER: "pendula" })).toContain("SMTP_USER and SMTP_PASSWORD");
  });
});

describe("loadConfig: ALLOWED_HOSTS", () => {
  it("adds lower-cased names to PUBLIC_URL's and loopback's, without duplicates", () => {
    const c = loadConfig({ ...minimal, ALLOWED_HOSTS: " Gait.Clinic.Example, intranet.clinic.example ," });
    expect(c.allowedHosts).toEqual(["gait.clinic.example", "127.0.0.1", "localhost", "intranet.clinic.example"]);
  });

  it("refuses entries with a port or a scheme", () => {
    expect(problemsOf({ ...minimal, ALLOWED_HOSTS: "gait.clinic.example:443" })).toContain("ALLOWED_HOSTS");
    expect(problemsOf({ ...minimal, ALLOWED_HOSTS: "https://gait.clinic.example" })).toContain("ALLOWED_HOSTS");
  });
});
