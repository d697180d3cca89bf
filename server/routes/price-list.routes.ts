import { Router } from "express";
import { EstimateLimits, PriceItemInput } from "../../shared/schemas/estimates.js";
import { can, requireAuth } from "../auth/context.js";
import { singleFile } from "../middleware/upload.js";
import { presentPriceItem } from "../presenters/estimates.presenter.js";
import { companyCurrency, createPriceItem, deletePriceItem, importPriceList, listPriceItems, priceListToCsv, updatePriceItem } from "../services/price-list.service.js";
import { idParam } from "../services/tenancy.js";
import type { AccountDeps } from "./deps.js";

export function priceListRoutes({ db }: AccountDeps): Router {
  const router = Router();

  router.get("/", can("jobs:read"), async (req, res) => {
    const { companyId } = requireAuth(req);
    const [items, currency] = await Promise.all([listPriceItems(db.manager, companyId), companyCurrency(db.manager, companyId)]);
    res.json({ items: items.map(presentPriceItem), currency });
  });

  router.post("/", can("prices:write"), async (req, res) => {
    const input = PriceItemInput.parse(req.body);
    res.status(201).json(presentPriceItem(await createPriceItem(db, requireAuth(req).companyId, input)));
  });

  router.get("/export.csv", can("jobs:read"), async (req, res) => {
    const { companyId } = requireAuth(req);
    const [items, currency] = await Promise.all([listPriceItems(db.manager, companyId), companyCurrency(db.manager, companyId)]);
    res.attachment("price-list.csv");
    res.type("text/csv; charset=utf-8");
    res.send(priceListToCsv(items, currency));
  });

  router.post("/import.csv", can("prices:write"), singleFile("file", EstimateLimits.csvMaxBytes, "CSV file"), async (req, res) => {
    const apply = req.query.apply === "1" || req.query.apply === "true";
    if (!req.file) {
      res.status(400).json({ error: { code: "invalid_input", message: 'file: send the CSV in the multipart field "file"', details: { field: "file" } } });
      return;
    }
    res.json(await importPriceList(db, requireAuth(req).companyId, req.file.buffer, apply));
  });

  router.patch("/:itemId", can("prices:write"), async (req, res) => {
    const id = idParam(req.params.itemId, "Price item");
    res.json(presentPriceItem(await updatePriceItem(db, requireAuth(req).companyId, id, req.body)));
  });

  router.delete("/:itemId", can("prices:write"), async (req, res) => {
    await deletePriceItem(db, requireAuth(req).companyId, idParam(req.params.itemId, "Price item"));
    res.status(204).end();
  });

  return router;
}
