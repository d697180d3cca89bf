import { Router, type RequestHandler } from "express";
import { z } from "zod";
import { JobLimits, SaveSystemInput, SolveRequest } from "../../shared/schemas/jobs.js";
import { can, requireAuth } from "../auth/context.js";
import { AppError } from "../errors.js";
import { singleFile } from "../middleware/upload.js";
import { presentSystem } from "../presenters/jobs.presenter.js";
import { runsFromCsv, runsToCsv } from "../services/runs-csv.service.js";
import { autosizeDocument, deleteSystem, documentFor, getSystem, saveSystem, solveDocument, validDocument } from "../services/system.service.js";
import { idParam } from "../services/tenancy.js";
import type { AccountDeps } from "./deps.js";
import type { SystemInput } from "../../shared/engine/schema.js";

const CsvVersion = z.strictObject({
  version: z.coerce.number({ error: "version is required (the version you loaded)" }).int("version must be a whole number").min(1, "version must be 1 or more"),
});

export function systemRoutes({ db }: AccountDeps): Router {
  const router = Router();

  router.get("/:systemId", can("jobs:read"), async (req, res) => {
    res.json(presentSystem(await getSystem(db.manager, requireAuth(req).companyId, idParam(req.params.systemId, "System"))));
  });

  router.put("/:systemId", can("jobs:write"), async (req, res) => {
    const id = idParam(req.params.systemId, "System");
    const input = SaveSystemInput.parse(req.body);
    const auth = requireAuth(req);
    res.json(presentSystem(await saveSystem(db, auth.companyId, auth.userId, id, input)));
  });

  router.delete("/:systemId", can("jobs:write"), async (req, res) => {
    await deleteSystem(db, requireAuth(req).companyId, idParam(req.params.systemId, "System"));
    res.status(204).end();
  });

  // A solve changes nothing, so Installers may run it too (they read results on site).
  router.post("/:systemId/solve", can("jobs:read"), async (req, res) => {
    const id = idParam(req.params.systemId, "System");
    const { document: posted } = SolveRequest.parse(req.body ?? {});
    const { companyId } = requireAuth(req);
    const { system, document } = await documentFor(db, companyId, id, posted);
    res.json(await solveDocument(db.manager, companyId, system.limitProfileId, document));
  });

  router.post("/:systemId/autosize", can("jobs:write"), async (req, res) => {
    const id = idParam(req.params.systemId, "System");
    const { document: posted } = SolveRequest.parse(req.body ?? {});
    const { companyId } = requireAuth(req);
    const { system, document } = await documentFor(db, companyId, id, posted);
    res.json(await autosizeDocument(db, companyId, system.limitProfileId, document));
  });

  router.get("/:systemId/runs.csv", can("jobs:read"), async (req, res) => {
    const system = await getSystem(db.manager, requireAuth(req).companyId, idParam(req.params.systemId, "System"));
    const fileName = `${system.name.replace(/[^A-Za-z0-9 ._-]+/g, "").trim() || "system"} runs.csv`;
    res.attachment(fileName);
    res.type("text/csv; charset=utf-8");
    // The byte-order mark makes spreadsheet programs read the file as UTF-8 (mm², Ω).
    res.send(`\uFEFF${runsToCsv(system.document as unknown as SystemInput)}`);
  });

  // The system is looked up before the upload is read: an unknown system is a 404 whatever was sent.
  const systemExists: RequestHandler = async (req, _res, next) => {
    await getSystem(db.manager, requireAuth(req).companyId, idParam(req.params.systemId, "System"));
    next();
  };

  router.post("/:systemId/runs.csv", can("jobs:write"), systemExists, singleFile("file", JobLimits.csvMaxBytes, "CSV file"), async (req, res) => {
    const id = idParam(req.params.systemId, "System");
    const auth = requireAuth(req);
    const system = await getSystem(db.manager, auth.companyId, id);
    const { version } = CsvVersion.parse(req.body ?? {});
    if (!req.file) throw new AppError("invalid_input", 'file: choose a CSV file (multipart field "file")', { field: "file" });
    const current = system.document as unknown as SystemInput;
    const runs = await runsFromCsv(req.file.buffer, current);
    // The whole network must still be valid with the new runs (e.g. a load on a point no run reaches is fine, a bad field is not).
    const document = await validDocument({ ...current, runs });
    res.json(presentSystem(await saveSystem(db, auth.companyId, auth.userId, id, { version, document })));
  });

  return router;
}
