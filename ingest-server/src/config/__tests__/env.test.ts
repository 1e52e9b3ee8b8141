import { describe, expect, it } from "vitest";
import { ConfigError, loadConfig } from "../env";

const minimal = {
  DATABASE_URL: "postgres://postgres@127.0.0.1:5432/pendula",
  JWT_SECRET: "j".repeat(32),
  RESEARCH_HMAC_KEY: "r".repeat(32),
  S3_ACCESS_KEY_ID: "key",
  S3_SECRET_ACCESS_KEY: "secret",
};

describe("loadConfig", () => {
  it("applies the documented defaults", () => {
    const c = loadConfig(minimal);
    expect(c.port).toBe(8641);
    expect(c.host).toBe("127.0.0.1");
    expect(c.accessTokenTtlS).toBe(900);
    expect(c.bcryptCost).toBe(12);
    expect(c.secureCookies).toBe(false);
    expect(c.devMailboxDir).toBeUndefined();
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
