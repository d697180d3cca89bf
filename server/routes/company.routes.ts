import { Router } from "express";
import { UpdateCompanyInput } from "../../shared/schemas/company.js";
import { can, requireAuth } from "../auth/context.js";
import { presentCompany } from "../presenters/account.presenter.js";
import { getCompany, updateCompany } from "../services/company.service.js";
import type { AccountDeps } from "./deps.js";

export function companyRoutes({ db }: AccountDeps): Router {
  const router = Router();

  router.get("/", can("company:read"), async (req, res) => {
    res.json(presentCompany(await getCompany(db, requireAuth(req).companyId)));
  });

  router.patch("/", can("company:write"), async (req, res) => {
    const patch = UpdateCompanyInput.parse(req.body);
    res.json(presentCompany(await updateCompany(db, requireAuth(req).companyId, patch)));
  });

  return router;
}
