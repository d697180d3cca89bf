import { existsSync } from "node:fs";
import path from "node:path";
import express, { type Express } from "express";
import helmet from "helmet";
import { pino, type Logger } from "pino";
import { pinoHttp } from "pino-http";
import type { DataSource } from "typeorm";
import { randomBytes } from "node:crypto";
import { MAX_JSON_BODY_BYTES } from "../shared/limits.js";
import { resolveAuth } from "./auth/context.js";
import { createPassport } from "./auth/passport.js";
import { sessionMiddleware } from "./auth/session.js";
import { unconfiguredMailer, type Mailer } from "./mail/mailer.js";
import { csrfGuard } from "./middleware/csrf.js";
import { apiNotFound, errorHandler } from "./middleware/error-handler.js";
import { AUTH_RATE_LIMIT, type RateLimitSettings } from "./middleware/rate-limit.js";
import { authRoutes } from "./routes/auth.routes.js";
import { companyRoutes } from "./routes/company.routes.js";
import type { AccountDeps } from "./routes/deps.js";
import { healthRoutes } from "./routes/health.routes.js";
import { invitationRoutes } from "./routes/invitations.routes.js";
import { memberRoutes } from "./routes/members.routes.js";
import { attachmentRoutes } from "./routes/attachments.routes.js";
import { clientRoutes } from "./routes/clients.routes.js";
import { jobRoutes } from "./routes/jobs.routes.js";
import { limitProfileRoutes } from "./routes/limit-profiles.routes.js";
import { systemRoutes } from "./routes/systems.routes.js";
import { priceListRoutes } from "./routes/price-list.routes.js";
import { estimatingSettingsRoutes, jobEstimateRoutes, quoteRoutes } from "./routes/estimates.routes.js";
import { quoteLinkRoutes } from "./routes/quote-links.routes.js";
import { dashboardRoutes } from "./routes/dashboard.routes.js";
import { jobPaymentRoutes, paymentRoutes, stripeWebhookRoute } from "./routes/payments.routes.js";
import type { Payments } from "./payments/stripe-client.js";
import type { JobQueue } from "./jobs/queue.js";

export interface AppOptions {
  db: DataSource;
  /** The built client (vite build output); when absent the app serves the API only. */
  clientDir?: string;
  logger?: Logger;
  /** How long /api/health waits for the database (ms). */
  dbTimeoutMs?: number;
  /** Signs the session cookie; a random one per app when absent (sessions then end with the process). */
  sessionSecret?: string;
  cookieSecure?: "auto" | "true" | "false";
  /** Base of links in e-mails (no trailing slash). */
  publicUrl?: string;
  mailer?: Mailer;
  /** Sign-in and reset limits; 10 per 15 minutes unless a test needs more room. */
  authRateLimit?: RateLimitSettings;
  /** Express's "trust proxy" setting; default: proxies on loopback only. */
  trustProxy?: string | number;
  /** Delete expired sessions periodically (the running server does). */
  pruneSessions?: boolean;
  /** Stripe (or the local fake) for deposits; absent: online deposits are off. */
  payments?: Payments | null;
  /** Background jobs (started by the caller, with workers registered); absent: a refused e-mail answers 502. */
  jobs?: JobQueue | null;
}

/**
 * JSON keys that name JavaScript's conversion methods. No field of the API is called so, and an
 * object carrying them as plain values ({"name": {"length": {"valueOf": 0, "toString": 0}}})
 * cannot be turned into a number: zod's length checks, which read `length` before the type check
 * has refused the value, then threw a TypeError (a 500) instead of naming the field. Found by the
 * solve endpoint's fuzz test. They are left out of every parsed body, so the field that held them
 * is refused by its own schema, by name.
 */
const CONVERSION_KEYS = ["valueOf", "toString", "toLocaleString", "toJSON"];
/**
 * Removes those keys from a parsed body, walking it with a stack of its own rather than recursion
 * (JSON.parse's reviver recurses, and a body nested a few thousand deep then overflowed the stack).
 */
const dropConversionKeys: express.RequestHandler = (req, _res, next) => {
  const pending: unknown[] = [req.body];
  while (pending.length > 0) {
    const value = pending.pop();
    if (typeof value !== "object" || value === null) continue;
    if (Array.isArray(value)) {
      for (const item of value) if (typeof item === "object" && item !== null) pending.push(item);
      continue;
    }
    const record = value as Record<string, unknown>;
    for (const key of CONVERSION_KEYS) if (Object.hasOwn(record, key)) delete record[key];
    for (const item of Object.values(record)) if (typeof item === "object" && item !== null) pending.push(item);
  }
  next();
};

/** Builds the Express app. No side effects: it neither listens nor connects. */
export function createApp(options: AppOptions): Express {
  const { db, clientDir, logger = pino({ level: "silent" }), dbTimeoutMs = 5000 } = options;
  const app = express();
  app.disable("x-powered-by");
  // Whose X-Forwarded-For to believe for the client's IP (rate limits) and protocol (Secure cookie).
  app.set("trust proxy", options.trustProxy ?? "loopback");

  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: true,
        directives: {
          // Everything comes from our own origin; no CDN, no external fonts.
          "default-src": ["'self'"],
          "script-src": ["'self'"],
          "style-src": ["'self'", "'unsafe-inline'"],
          "font-src": ["'self'", "data:"],
          "img-src": ["'self'", "data:", "blob:"],
          // Plain-HTTP development on 127.0.0.1 must not be upgraded to HTTPS.
          "upgrade-insecure-requests": null,
        },
      },
    }),
  );
  app.use(
    pinoHttp({
      logger,
      autoLogging: { ignore: (req) => req.url === "/api/health" },
      // One short line per request: no headers, cookies or bodies in the log.
      serializers: {
        // A client link's token is a password to its quote: it never reaches the log.
        req: (req: { id: unknown; method: string; url: string }) => ({ id: req.id, method: req.method, url: req.url.replace(/\/(q|quote-links)\/[^/?]+/, "/$1/[token]") }),
        res: (res: { statusCode: number }) => ({ status: res.statusCode }),
      },
    }),
  );

  const deps: AccountDeps = {
    db,
    mailer: options.mailer ?? unconfiguredMailer,
    publicUrl: options.publicUrl ?? "http://127.0.0.1:3000",
    logger,
    rateLimit: options.authRateLimit ?? AUTH_RATE_LIMIT,
    payments: options.payments ?? null,
    jobs: options.jobs ?? null,
  };
  const passport = createPassport(db);

  // Before the API's JSON parser and CSRF guard: Stripe signs the raw bytes and sends no Origin.
  app.use("/api/webhooks/stripe", stripeWebhookRoute(deps));

  const api = express.Router();
  api.use(express.json({ limit: MAX_JSON_BODY_BYTES }));
  api.use(dropConversionKeys);
  api.use(healthRoutes(db, dbTimeoutMs));
  api.use(csrfGuard(options.publicUrl));
  api.use(
    sessionMiddleware(db, {
      secret: options.sessionSecret ?? randomBytes(32).toString("base64url"),
      cookieSecure: options.cookieSecure ?? "auto",
      pruneExpired: options.pruneSessions ?? false,
      logger,
    }),
  );
  api.use(passport.initialize());
  api.use(passport.session());
  api.use(resolveAuth(db));
  api.use("/auth", authRoutes({ ...deps, passport }));
  api.use("/company", companyRoutes(deps));
  api.use("/company", estimatingSettingsRoutes(deps));
  api.use("/members", memberRoutes(deps));
  api.use("/invitations", invitationRoutes(deps));
  api.use("/clients", clientRoutes(deps));
  api.use("/jobs", jobRoutes(deps));
  api.use("/jobs", jobEstimateRoutes(deps));
  api.use("/systems", systemRoutes(deps));
  api.use("/limit-profiles", limitProfileRoutes(deps));
  api.use("/attachments", attachmentRoutes(deps));
  api.use("/price-list", priceListRoutes(deps));
  api.use("/quotes", quoteRoutes(deps));
  api.use("/quote-links", quoteLinkRoutes(deps));
  api.use("/dashboard", dashboardRoutes(deps));
  api.use("/jobs", jobPaymentRoutes(deps));
  api.use("/payments", paymentRoutes(deps));
  api.use(apiNotFound);
  app.use("/api", api);

  if (clientDir && existsSync(path.join(clientDir, "index.html"))) {
    app.use(express.static(clientDir, { index: false, maxAge: "1h" }));
    // Client-side routes: every other GET gets the app shell.
    app.get("/{*splat}", (_req, res) => {
      res.sendFile(path.join(clientDir, "index.html"), { headers: { "Cache-Control": "no-cache" } });
    });
  }

  app.use(errorHandler);
  return app;
}
