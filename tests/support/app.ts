import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import type { Express } from "express";
import type { DataSource } from "typeorm";
import { createApp, type AppOptions } from "../../server/app.js";
import type { RateLimitSettings } from "../../server/middleware/rate-limit.js";
import { afterAll, beforeAll, inject } from "vitest";
import type { PaymentsSettings } from "../../server/config/payments.js";
import { connectToStripeFake } from "../../server/payments/local-fake.js";
import { createPayments } from "../../server/payments/stripe-client.js";
import { catcherMailer } from "./mail.js";
import { openTestDb, testDatabaseUrl } from "./test-db.js";
import { JobQueue, uniqueQueuePrefix, type RetryPolicy } from "../../server/jobs/queue.js";
import { startWorkers } from "../../server/jobs/workers.js";
import { pino } from "pino";

export interface TestApp {
  app: Express;
  /** http://127.0.0.1:<port> — also the base of links in the app's e-mails. */
  url: string;
  /** This app's account on the run's Stripe fake (its own key and webhook secret); null with payments off. */
  stripe: (PaymentsSettings & { apiBase: string }) | null;
  /** This app's job queue (its own queue names), or null when the test turned jobs off. */
  jobs: JobQueue | null;
  close(): Promise<void>;
}

/** Room for the many sign-ins of a test file; the rate-limit tests use the real limit. */
export const ROOMY_RATE_LIMIT: RateLimitSettings = { limit: 10_000, windowMs: 60_000 };

/**
 * The app on an ephemeral loopback port, sending mail to the run's catcher.
 * The port is bound first, so the app's e-mailed links point at it.
 */
export async function startTestApp(db: DataSource, options: Partial<AppOptions> & { jobRetry?: RetryPolicy } = {}): Promise<TestApp> {
  const { jobRetry, ...appOptions } = options;
  const server: Server = createServer();
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const mailer = options.mailer ?? catcherMailer();
  // Payments through the run's Stripe fake unless the test says otherwise (payments: null = off).
  const stripe = options.payments === undefined ? ((await connectToStripeFake(inject("stripeFake").url, `${url}/api/webhooks/stripe`)) as PaymentsSettings & { apiBase: string }) : null;
  // Background jobs on queues of this app's own (a prefix), retried after about 1, 2, 4 s, so
  // one test file's workers never take another's jobs. jobs: null runs the app without them.
  const dbUrl = (db.options as { url?: string }).url ?? testDatabaseUrl();
  const jobs = options.jobs === undefined ? new JobQueue({ url: dbUrl, prefix: uniqueQueuePrefix(), retry: jobRetry ?? { retryLimit: 3, retryDelay: 1 }, pollingSeconds: 0.5 }) : options.jobs;
  const payments = appOptions.payments !== undefined ? appOptions.payments : stripe ? createPayments(stripe) : null;
  if (jobs && options.jobs === undefined) {
    await jobs.start();
    await startWorkers(jobs, { db, mailer, publicUrl: url, jobs, logger: appOptions.logger ?? pino({ level: "silent" }), payments });
  }
  const app = createApp({ db, publicUrl: url, mailer, authRateLimit: ROOMY_RATE_LIMIT, ...appOptions, payments, jobs });
  server.on("request", app);
  return {
    app,
    url,
    stripe,
    jobs,
    close: async () => {
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      if (jobs && options.jobs === undefined) await jobs.stop({ dropQueues: true, timeoutMs: 3000 });
      mailer.close();
    },
  };
}

/**
 * The usual setup of an API test file: a test DataSource and a test app for
 * the describe block, closed afterwards. Read `t.db` and `t.app` inside tests.
 */
export function useTestApp(options: Partial<AppOptions> = {}): { db: DataSource; app: TestApp } {
  const t = {} as { db: DataSource; app: TestApp };
  beforeAll(async () => {
    t.db = await openTestDb();
    t.app = await startTestApp(t.db, options);
  });
  afterAll(async () => {
    await t.app?.close();
    await t.db?.destroy();
  });
  return t;
}
