import type { Logger } from "pino";
import type { DataSource } from "typeorm";
import type { Mailer } from "../mail/mailer.js";
import type { RateLimitSettings } from "../middleware/rate-limit.js";

/** What the account routes need from the app. */
export interface AccountDeps {
  db: DataSource;
  mailer: Mailer;
  /** Base of links in e-mails, no trailing slash. */
  publicUrl: string;
  logger: Logger;
  rateLimit: RateLimitSettings;
}
