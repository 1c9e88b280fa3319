import { describe, expect, it } from "vitest";
import { EnvError, parseEnv } from "@/lib/env";

const valid = {
  DATABASE_URL: "postgres://u:p@127.0.0.1:54329/benchclear",
  AUTH_SECRET: "x".repeat(32),
  DECISION_HMAC_KEY: "k".repeat(32),
};

describe("environment validation", () => {
  it("accepts the minimum and fills the documented defaults", () => {
    const env = parseEnv(valid);
    expect(env.APP_URL).toBe("http://localhost:3000");
    expect(env.MAIL_TRANSPORT).toBe("local-inbox");
    expect(env.SMTP_PORT).toBe(1025);
    expect(env.STORAGE_DRIVER).toBe("local");
  });

  it("names every missing or malformed variable", () => {
    try {
      parseEnv({ DATABASE_URL: "mysql://nope", AUTH_SECRET: "short", SMTP_PORT: "99999" });
      expect.unreachable("parseEnv should have thrown");
    } catch (error) {
      expect(error).toBeInstanceOf(EnvError);
      const problems = (error as EnvError).problems.join("\n");
      expect(problems).toMatch(/^DATABASE_URL must be a postgres:\/\/ URL/m);
      expect(problems).toMatch(/^AUTH_SECRET must be at least 32 characters/m);
      expect(problems).toMatch(/^SMTP_PORT /m);
    }
  });

  it("reports a missing DATABASE_URL by name", () => {
    expect(() => parseEnv({ AUTH_SECRET: "y".repeat(40) })).toThrow(/DATABASE_URL is required/);
  });

  it("requires a decision seal key of 32+ characters (issue 14)", () => {
    expect(() => parseEnv({ ...valid, DECISION_HMAC_KEY: undefined })).toThrow(/DECISION_HMAC_KEY is required/);
    expect(() => parseEnv({ ...valid, DECISION_HMAC_KEY: "short" })).toThrow(
      /DECISION_HMAC_KEY must be at least 32 characters/,
    );
  });

  it("treats empty strings as unset", () => {
    expect(parseEnv({ ...valid, APP_URL: "" }).APP_URL).toBe("http://localhost:3000");
  });

  it("requires a bucket when S3 storage is chosen", () => {
    expect(() => parseEnv({ ...valid, STORAGE_DRIVER: "s3" })).toThrow(/S3_BUCKET is required when STORAGE_DRIVER=s3/);
    expect(parseEnv({ ...valid, STORAGE_DRIVER: "s3", S3_BUCKET: "permits" }).S3_BUCKET).toBe("permits");
  });

  it("parses booleans strictly", () => {
    expect(parseEnv({ ...valid, SMTP_SECURE: "true" }).SMTP_SECURE).toBe(true);
    expect(parseEnv({ ...valid, SMTP_SECURE: "0" }).SMTP_SECURE).toBe(false);
    expect(() => parseEnv({ ...valid, SMTP_SECURE: "yes please" })).toThrow(/SMTP_SECURE/);
  });
});
