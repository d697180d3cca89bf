import { mkdtempSync, readFileSync, rmSync, statSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { readEnv } from "../../../server/config/env.js";
import { MissingSessionSecretError, resolveSessionSecret } from "../../../server/config/session-secret.js";

describe("the session secret", () => {
  const dir = mkdtempSync(path.join(os.tmpdir(), "runwright-secret-"));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it("production refuses to start without SESSION_SECRET", () => {
    const env = readEnv({ NODE_ENV: "production" });
    expect(() => resolveSessionSecret(env, dir)).toThrow(MissingSessionSecretError);
    expect(() => resolveSessionSecret(env, dir)).toThrow(/SESSION_SECRET is not set/);
  });

  it("uses SESSION_SECRET when set, and refuses a short one", () => {
    const secret = "x".repeat(40);
    expect(resolveSessionSecret(readEnv({ NODE_ENV: "production", SESSION_SECRET: secret }), dir)).toBe(secret);
    expect(() => readEnv({ SESSION_SECRET: "short" })).toThrow(/SESSION_SECRET: must be at least 32 characters/);
  });

  it("development generates a random one once, keeps it in the data folder (mode 600) and reuses it", () => {
    const env = readEnv({ NODE_ENV: "development" });
    const first = resolveSessionSecret(env, dir);
    expect(first.length).toBeGreaterThanOrEqual(32);
    const file = path.join(dir, "session-secret");
    expect(readFileSync(file, "utf8").trim()).toBe(first);
    expect(statSync(file).mode & 0o777).toBe(0o600);
    expect(resolveSessionSecret(env, dir)).toBe(first);
    const elsewhere = mkdtempSync(path.join(os.tmpdir(), "runwright-secret-"));
    try {
      expect(resolveSessionSecret(env, elsewhere)).not.toBe(first);
    } finally {
      rmSync(elsewhere, { recursive: true, force: true });
    }
  });

  it("reads the cookie and mail settings with their defaults", () => {
    const env = readEnv({});
    expect(env.COOKIE_SECURE).toBe("auto");
    expect(env.RUNWRIGHT_MAIL_SMTP_PORT).toBe(1025);
    expect(env.RUNWRIGHT_MAIL_WEB_PORT).toBe(1080);
    expect(() => readEnv({ COOKIE_SECURE: "sometimes" })).toThrow(/COOKIE_SECURE/);
  });
});
