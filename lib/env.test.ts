import { describe, expect, it } from "vitest";
import { EnvError, LOCAL_DEFAULTS, readEnv } from "./env";

describe("readEnv", () => {
  it("fills local defaults so a fresh clone runs without a .env file", () => {
    const e = readEnv({ KINARC_DEPLOYMENT: "local", AUTH_SECRET: "x".repeat(40) });
    expect(e.DATABASE_URL).toBe("file:./data/kinarc.db");
    expect(e.APP_URL).toBe("http://localhost:3000");
    expect(e.LIVEKIT_URL).toMatch(/^ws:\/\//);
  });

  it("refuses production without secrets and names each missing one", () => {
    expect(() => readEnv({ NODE_ENV: "production" })).toThrowError(EnvError);
    try {
      readEnv({ NODE_ENV: "production" });
    } catch (error) {
      const message = (error as Error).message;
      for (const key of ["DATABASE_URL", "AUTH_SECRET", "APP_URL", "SMTP_URL", "LIVEKIT_URL", "LIVEKIT_API_SECRET"]) {
        expect(message).toContain(`${key}: missing`);
      }
    }
  });

  it("rejects a malformed value with the field and what was expected", () => {
    expect(() =>
      readEnv({ KINARC_DEPLOYMENT: "local", AUTH_SECRET: "x".repeat(40), DATABASE_URL: "postgres://db" }),
    ).toThrowError(/DATABASE_URL: must be a file: URL or a libSQL server URL/);
  });

  it("refuses the development media-server secret in production", () => {
    expect(() =>
      readEnv({
        KINARC_DEPLOYMENT: "production",
        DATABASE_URL: "libsql://db.example.org",
        AUTH_SECRET: "s".repeat(40),
        APP_URL: "https://kinarc.example.org",
        SMTP_URL: "smtps://mail.example.org",
        LIVEKIT_URL: "wss://video.example.org",
        LIVEKIT_API_KEY: "key",
        LIVEKIT_API_SECRET: LOCAL_DEFAULTS.DEV_LIVEKIT_SECRET,
        STRIPE_SECRET_KEY: "sk_live_example",
        STRIPE_WEBHOOK_SECRET: "whsec_example",
      }),
    ).toThrowError(/LIVEKIT_API_SECRET/);
  });

  it("refuses the payment stand-in's keys in production and asks for S3 settings when S3 storage is chosen", () => {
    const production = {
      KINARC_DEPLOYMENT: "production",
      DATABASE_URL: "libsql://db.example.org",
      AUTH_SECRET: "s".repeat(40),
      APP_URL: "https://kinarc.example.org",
      SMTP_URL: "smtps://mail.example.org",
      LIVEKIT_URL: "wss://video.example.org",
      LIVEKIT_API_KEY: "key",
      LIVEKIT_API_SECRET: "v".repeat(40),
      STRIPE_SECRET_KEY: LOCAL_DEFAULTS.DEV_STRIPE_SECRET_KEY,
      STRIPE_WEBHOOK_SECRET: "whsec_example",
    };
    expect(() => readEnv(production)).toThrowError(/STRIPE_SECRET_KEY/);
    expect(() => readEnv({ ...production, STRIPE_SECRET_KEY: undefined })).toThrowError(/STRIPE_SECRET_KEY: missing/);
    const ok = readEnv({ ...production, STRIPE_SECRET_KEY: "sk_live_example" });
    expect(ok.STRIPE_API_URL).toBeUndefined();
    expect(() => readEnv({ KINARC_DEPLOYMENT: "local", AUTH_SECRET: "x".repeat(40), STORAGE_DRIVER: "s3", S3_BUCKET: "b" })).toThrowError(
      /S3_ACCESS_KEY_ID: missing/,
    );
  });
});
