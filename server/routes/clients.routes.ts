import { Router } from "express";
import { ClientListQuery, CreateClientInput, UpdateClientInput } from "../../shared/schemas/jobs.js";
import { can, requireAuth } from "../auth/context.js";
import { presentClient } from "../presenters/jobs.presenter.js";
import { createClient, deleteClient, getClient, listClients, updateClient } from "../services/client.service.js";
import { idParam } from "../services/tenancy.js";
import type { AccountDeps } from "./deps.js";

export function clientRoutes({ db }: AccountDeps): Router {
  const router = Router();

  router.get("/", can("jobs:read"), async (req, res) => {
    const page = await listClients(db, requireAuth(req).companyId, ClientListQuery.parse(req.query));
    res.json({ ...page, items: page.items.map(presentClient) });
  });

  router.post("/", can("jobs:write"), async (req, res) => {
    const input = CreateClientInput.parse(req.body);
    res.status(201).json(presentClient(await createClient(db, requireAuth(req).companyId, input)));
  });

  router.get("/:clientId", can("jobs:read"), async (req, res) => {
    res.json(presentClient(await getClient(db, requireAuth(req).companyId, idParam(req.params.clientId, "Client"))));
  });

  router.patch("/:clientId", can("jobs:write"), async (req, res) => {
    const id = idParam(req.params.clientId, "Client");
    const patch = UpdateClientInput.parse(req.body);
    res.json(presentClient(await updateClient(db, requireAuth(req).companyId, id, patch)));
  });

  router.delete("/:clientId", can("jobs:write"), async (req, res) => {
    await deleteClient(db, requireAuth(req).companyId, idParam(req.params.clientId, "Client"));
    res.status(204).end();
  });

  return router;
}
