import type { Logger } from "pino";
import type { DataSource } from "typeorm";
import type { JobQueue } from "../jobs/queue.js";
import type { Mailer } from "../mail/mailer.js";
import type { RateLimitSettings } from "../middleware/rate-limit.js";
import type { Payments } from "../payments/stripe-client.js";

/** What the account routes need from the app. */
export interface AccountDeps {
  db: DataSource;
  mailer: Mailer;
  /** Base of links in e-mails, no trailing slash. */
  publicUrl: string;
  logger: Logger;
  rateLimit: RateLimitSettings;
  /** Stripe (or the local fake); null when online deposits are not set up. */
  payments: Payments | null;
  /** Background jobs in PostgreSQL (queued sends); null in apps that run none. */
  jobs: JobQueue | null;
}
