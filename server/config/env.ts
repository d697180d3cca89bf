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
  /** Signs the session cookie. Required in production; in development a random one is kept in the data folder. */
  SESSION_SECRET: z.string().min(32, "must be at least 32 characters").optional(),
  /** `auto`: the cookie is Secure when the request came over HTTPS (directly or through a proxy on loopback). */
  COOKIE_SECURE: z.enum(["auto", "true", "false"]).default("auto"),
  /** Which proxies' X-Forwarded-* headers to believe (Express "trust proxy": loopback, an address or subnet list, a hop count). */
  TRUST_PROXY: z.string().min(1).default("loopback"),
  /** The address people open, used in e-mailed links; defaults to http://HOST:PORT. */
  PUBLIC_URL: z.string().url().optional(),
  /** An SMTP server for outgoing mail; when unset, npm start runs the local mail catcher and sends to it. */
  SMTP_HOST: z.string().min(1).optional(),
  SMTP_PORT: port.optional(),
  SMTP_SECURE: z.enum(["true", "false"]).default("false"),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  MAIL_FROM: z.string().min(3).default("Runwright <no-reply@runwright.test>"),
  /** Ports of the local mail catcher (SMTP in, web inbox) that npm start runs when SMTP_HOST is unset. */
  RUNWRIGHT_MAIL_SMTP_PORT: port.default(1025),
  RUNWRIGHT_MAIL_WEB_PORT: port.default(1080),
  /** Stripe's secret key (sk_live_… or sk_test_…); when unset, npm start runs the local Stripe fake in development. */
  STRIPE_SECRET_KEY: z.string().regex(/^(sk|rk)_(live|test)_[A-Za-z0-9_]+$/, "must look like sk_live_… or sk_test_…").optional(),
  /** The signing secret of the webhook endpoint (whsec_…); required with STRIPE_SECRET_KEY. */
  STRIPE_WEBHOOK_SECRET: z.string().regex(/^whsec_[A-Za-z0-9_]+$/, "must look like whsec_…").optional(),
  /** Another Stripe-compatible API (a fake) instead of Stripe itself, e.g. http://127.0.0.1:12111. Refused in production. */
  STRIPE_API_BASE: z.string().url().optional(),
  /** Background jobs (queued e-mails): retries after the first failure, the first wait in seconds (then about doubling), and how often an idle worker looks for work. */
  JOB_RETRY_LIMIT: z.coerce.number().int().min(0).max(20).default(6),
  JOB_RETRY_DELAY_SECONDS: z.coerce.number().int().min(1).max(3600).default(30),
  JOB_POLL_SECONDS: z.coerce.number().min(0.5).max(60).default(2),
  /** Port of the local Stripe fake that npm start runs when STRIPE_SECRET_KEY is unset. */
  RUNWRIGHT_STRIPE_FAKE_PORT: port.default(12111),
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

/** The base of links in e-mails, without a trailing slash. */
export function publicUrl(env: Env): string {
  return (env.PUBLIC_URL ?? `http://${env.HOST}:${env.PORT}`).replace(/\/+$/, "");
}

/** Absolute path of the project's data folder (database cluster, later uploads). */
export function dataDirectory(env: Env, projectRoot: string): string {
  return path.resolve(projectRoot, env.RUNWRIGHT_DATA_DIR);
}
