import path from "node:path";
import { z } from "zod";

const port = z.coerce.number().int().min(1).max(65535);

// Every variable the server reads. README.md's configuration table lists the same ones.
const EnvSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  HOST: z.string().min(1).default("127.0.0.1"),
  PORT: port.default(3000),
  /** An external database; when unset, the project starts its own PostgreSQL. */
  DATABASE_URL: z.string().url().optional(),
  RUNWRIGHT_DB_PORT: port.default(5544),
  RUNWRIGHT_DATA_DIR: z.string().min(1).default(".data"),
  LOG_LEVEL: z.enum(["fatal", "error", "warn", "info", "debug", "trace", "silent"]).default("info"),
  /** Milliseconds a database call may wait for a connection before the request answers 503. */
  DB_CONNECT_TIMEOUT_MS: z.coerce.number().int().min(100).max(60000).default(5000),
});

export type Env = z.infer<typeof EnvSchema>;

/** Parses process.env; a bad value stops the start with a line naming the variable. */
export function readEnv(source: NodeJS.ProcessEnv = process.env): Env {
  // An empty variable (`DATABASE_URL=`) counts as unset.
  const given = Object.fromEntries(Object.entries(source).filter(([, value]) => value !== undefined && value !== ""));
  const parsed = EnvSchema.safeParse(given);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((issue) => `${issue.path.join(".")}: ${issue.message}`);
    throw new Error(`Invalid environment: ${problems.join("; ")}`);
  }
  return parsed.data;
}

/** Absolute path of the project's data folder (database cluster, later uploads). */
export function dataDirectory(env: Env, projectRoot: string): string {
  return path.resolve(projectRoot, env.RUNWRIGHT_DATA_DIR);
}
