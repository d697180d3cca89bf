import { Router } from "express";
import { CreateLimitProfileInput, LimitProfileListQuery, UpdateLimitProfileInput } from "../../shared/schemas/jobs.js";
import { can, requireAuth } from "../auth/context.js";
import { presentLimitProfile } from "../presenters/jobs.presenter.js";
import { createLimitProfile, deleteLimitProfile, getLimitProfile, listLimitProfiles, updateLimitProfile } from "../services/limit-profile.service.js";
import { idParam } from "../services/tenancy.js";
import type { AccountDeps } from "./deps.js";

export function limitProfileRoutes({ db }: AccountDeps): Router {
  const router = Router();

  router.get("/", can("jobs:read"), async (req, res) => {
    const page = await listLimitProfiles(db, requireAuth(req).companyId, LimitProfileListQuery.parse(req.query));
    res.json({ ...page, items: page.items.map(presentLimitProfile) });
  });

  router.post("/", can("limits:write"), async (req, res) => {
    const input = CreateLimitProfileInput.parse(req.body);
    res.status(201).json(presentLimitProfile(await createLimitProfile(db, requireAuth(req).companyId, input)));
  });

  router.get("/:profileId", can("jobs:read"), async (req, res) => {
    res.json(presentLimitProfile(await getLimitProfile(db, requireAuth(req).companyId, idParam(req.params.profileId, "Limit profile"))));
  });

  router.patch("/:profileId", can("limits:write"), async (req, res) => {
    const id = idParam(req.params.profileId, "Limit profile");
    const patch = UpdateLimitProfileInput.parse(req.body);
    res.json(presentLimitProfile(await updateLimitProfile(db, requireAuth(req).companyId, id, patch)));
  });

  router.delete("/:profileId", can("limits:write"), async (req, res) => {
    await deleteLimitProfile(db, requireAuth(req).companyId, idParam(req.params.profileId, "Limit profile"));
    res.status(204).end();
  });

  return router;
}
