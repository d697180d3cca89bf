import { existsSync } from "node:fs";
import path from "node:path";
import express, { type Express } from "express";
import helmet from "helmet";
import { pino, type Logger } from "pino";
import { pinoHttp } from "pino-http";
import type { DataSource } from "typeorm";
import { MAX_JSON_BODY_BYTES } from "../shared/limits.js";
import { apiNotFound, errorHandler } from "./middleware/error-handler.js";
import { healthRoutes } from "./routes/health.routes.js";

export interface AppOptions {
  db: DataSource;
  /** The built client (vite build output); when absent the app serves the API only. */
  clientDir?: string;
  logger?: Logger;
  /** How long /api/health waits for the database (ms). */
  dbTimeoutMs?: number;
}

/** Builds the Express app. No side effects: it neither listens nor connects. */
export function createApp({ db, clientDir, logger = pino({ level: "silent" }), dbTimeoutMs = 5000 }: AppOptions): Express {
  const app = express();
  app.disable("x-powered-by");
  app.set("trust proxy", "loopback");

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
        req: (req: { id: unknown; method: string; url: string }) => ({ id: req.id, method: req.method, url: req.url }),
        res: (res: { statusCode: number }) => ({ status: res.statusCode }),
      },
    }),
  );

  const api = express.Router();
  api.use(express.json({ limit: MAX_JSON_BODY_BYTES }));
  api.use(healthRoutes(db, dbTimeoutMs));
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
