import { loadFonts } from "./pdf/fonts.js";
import type { Server } from "node:http";
import { pino } from "pino";
import type { DataSource } from "typeorm";
import { createApp } from "./app.js";
import { publicUrl, type Env } from "./config/env.js";
import { resolveSessionSecret } from "./config/session-secret.js";
import { createMailer, smtpSettingsFromEnv } from "./mail/mailer.js";
import { createDataSource } from "./db/data-source.js";
import { seedDemo } from "./db/seed.js";
import { closeServer, listen } from "./http-server.js";
import type { PaymentsSettings } from "./config/payments.js";
import { createPayments } from "./payments/stripe-client.js";
import { JobQueue } from "./jobs/queue.js";
import { startWorkers } from "./jobs/workers.js";

export interface StartOptions {
  env: Env;
  databaseUrl: string;
  clientDir?: string;
  /** Seed the demo company (npm start does; a production deployment would not). */
  seed?: boolean;
  /** The data folder (keeps the development session secret). */
  dataDir: string;
  /** SMTP port of the local mail catcher, when SMTP_HOST is unset. */
  mailCatcherPort?: number;
  /** Stripe, or the local fake npm start runs; null: online deposits are off. */
  payments?: PaymentsSettings | null;
}

export interface RunningServer {
  server: Server;
  db: DataSource;
  url: string;
  /** Finishes in-flight requests, closes the pool. */
  stop(): Promise<void>;
}

/**
 * Runs the pending migrations under a PostgreSQL advisory lock, so instances starting together on one
 * database migrate one after another (the second finds nothing left to run).
 */
async function migrateOnce(db: DataSource) {
  const runner = db.createQueryRunner();
  await runner.connect();
  try {
    await runner.query("SELECT pg_advisory_lock($1)", [MIGRATION_LOCK]);
    try {
      return await db.runMigrations({ transaction: "all" });
    } finally {
      await runner.query("SELECT pg_advisory_unlock($1)", [MIGRATION_LOCK]);
    }
  } finally {
    await runner.release();
  }
}
/** Any fixed number of ours: the key of the migration lock. */
const MIGRATION_LOCK = 4_179_522_031;

/** Connects, migrates, seeds, builds the app and listens: the server's only side effects. */
export async function startServer({ env, databaseUrl, clientDir, seed = true, dataDir, mailCatcherPort, payments = null }: StartOptions): Promise<RunningServer> {
  const logger = pino({ level: env.LOG_LEVEL });
  // Before anything connects: production refuses to start without SESSION_SECRET.
  const sessionSecret = resolveSessionSecret(env, dataDir);
  const mailer = createMailer(smtpSettingsFromEnv(env, mailCatcherPort));
  const db = createDataSource({ url: databaseUrl, connectTimeoutMs: env.DB_CONNECT_TIMEOUT_MS });
  await db.initialize();
  const jobs = new JobQueue({ url: databaseUrl, logger, retry: { retryLimit: env.JOB_RETRY_LIMIT, retryDelay: env.JOB_RETRY_DELAY_SECONDS }, pollingSeconds: env.JOB_POLL_SECONDS });
  try {
    const ran = await migrateOnce(db);
    if (ran.length > 0) logger.info({ migrations: ran.map((m) => m.name) }, "migrations ran");
    if (seed) await seedDemo(db);
    // Parse the PDF fonts now, so the first quote PDF does not pay for it (about 1 s here).
    loadFonts();
    await jobs.start();
    const publicBase = publicUrl(env);
    const stripe = payments ? createPayments(payments) : null;
    await startWorkers(jobs, { db, mailer, publicUrl: publicBase, jobs, logger, payments: stripe });
    const app = createApp({
      db,
      clientDir,
      logger,
      dbTimeoutMs: env.DB_CONNECT_TIMEOUT_MS,
      sessionSecret,
      cookieSecure: env.COOKIE_SECURE,
      trustProxy: /^\d+$/.test(env.TRUST_PROXY) ? Number(env.TRUST_PROXY) : env.TRUST_PROXY,
      publicUrl: publicBase,
      mailer,
      pruneSessions: true,
      payments: stripe,
      jobs,
    });
    const server = await listen(app, env.HOST, env.PORT);
    return {
      server,
      db,
      url: `http://${env.HOST}:${env.PORT}`,
      async stop() {
        await closeServer(server);
        // Running jobs finish (or are retried later by another instance); no new ones start.
        await jobs.stop();
        mailer.close();
        await db.destroy();
      },
    };
  } catch (error) {
    await jobs.stop().catch(() => {});
    mailer.close();
    await db.destroy();
    throw error;
  }
}
