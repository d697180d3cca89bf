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
import { openTestDb } from "./test-db.js";

export interface TestApp {
  app: Express;
  /** http://127.0.0.1:<port> — also the base of links in the app's e-mails. */
  url: string;
  /** This app's account on the run's Stripe fake (its own key and webhook secret); null with payments off. */
  stripe: (PaymentsSettings & { apiBase: string }) | null;
  close(): Promise<void>;
}

/** Room for the many sign-ins of a test file; the rate-limit tests use the real limit. */
export const ROOMY_RATE_LIMIT: RateLimitSettings = { limit: 10_000, windowMs: 60_000 };

/**
 * The app on an ephemeral loopback port, sending mail to the run's catcher.
 * The port is bound first, so the app's e-mailed links point at it.
 */
export async function startTestApp(db: DataSource, options: Partial<AppOptions> = {}): Promise<TestApp> {
  const server: Server = createServer();
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const mailer = catcherMailer();
  // Payments through the run's Stripe fake unless the test says otherwise (payments: null = off).
  const stripe = options.payments === undefined ? ((await connectToStripeFake(inject("stripeFake").url, `${url}/api/webhooks/stripe`)) as PaymentsSettings & { apiBase: string }) : null;
  const app = createApp({ db, publicUrl: url, mailer, authRateLimit: ROOMY_RATE_LIMIT, ...(stripe ? { payments: createPayments(stripe) } : {}), ...options });
  server.on("request", app);
  return {
    app,
    url,
    stripe,
    close: () =>
      new Promise((resolve) => {
        mailer.close();
        server.closeAllConnections();
        server.close(() => resolve());
      }),
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
