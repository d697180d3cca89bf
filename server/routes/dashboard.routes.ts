import { Router } from "express";
import { can, requireAuth } from "../auth/context.js";
import { dashboardFor } from "../services/dashboard.service.js";
import type { AccountDeps } from "./deps.js";

export function dashboardRoutes({ db }: AccountDeps): Router {
  const router = Router();
  router.get("/", can("jobs:read"), async (req, res) => {
    res.json(await dashboardFor(db, requireAuth(req).companyId));
  });
  return router;
}
