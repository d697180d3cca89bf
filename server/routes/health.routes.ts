import { Router } from "express";
import type { DataSource } from "typeorm";
import type { HealthStatus } from "../../shared/schemas/health.js";
import { publicRoute } from "../auth/context.js";
import { pingDatabase } from "../db/ping.js";
import { APP_VERSION } from "../version.js";

export function healthRoutes(db: DataSource, timeoutMs: number): Router {
  const router = Router();
  router.get("/health", publicRoute, async (_req, res) => {
    const up = await pingDatabase(db, timeoutMs);
    const body: HealthStatus = { status: up ? "ok" : "degraded", db: up ? "up" : "down", version: APP_VERSION };
    res.status(up ? 200 : 503).json(body);
  });
  return router;
}
