import { randomBytes } from "node:crypto";
import { chmodSync, existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import type { Env } from "./env.js";

export class MissingSessionSecretError extends Error {
  override name = "MissingSessionSecretError";
}

/**
 * SESSION_SECRET when set. In production it must be set: a secret made up at
 * start would sign everyone out on every restart and differ between servers.
 * In development and test a random one is generated once and kept in
 * `<data folder>/session-secret` (mode 600), so sign-ins survive restarts.
 */
export function resolveSessionSecret(env: Env, dataDir: string): string {
  if (env.SESSION_SECRET) return env.SESSION_SECRET;
  if (env.NODE_ENV === "production") {
    throw new MissingSessionSecretError(
      "SESSION_SECRET is not set; production needs a random secret of at least 32 characters (e.g. `openssl rand -base64 48`).",
    );
  }
  const file = path.join(dataDir, "session-secret");
  if (existsSync(file)) {
    const kept = readFileSync(file, "utf8").trim();
    if (kept.length >= 32) return kept;
  }
  mkdirSync(dataDir, { recursive: true });
  const secret = randomBytes(48).toString("base64url");
  writeFileSync(file, `${secret}\n`, { mode: 0o600 });
  chmodSync(file, 0o600);
  return secret;
}
