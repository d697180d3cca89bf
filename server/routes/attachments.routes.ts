import { Router } from "express";
import { can, requireAuth } from "../auth/context.js";
import { deleteAttachment, readAttachment } from "../services/attachment.service.js";
import { idParam } from "../services/tenancy.js";
import type { AccountDeps } from "./deps.js";

export function attachmentRoutes({ db }: AccountDeps): Router {
  const router = Router();

  router.get("/:attachmentId/file", can("jobs:read"), async (req, res) => {
    const row = await readAttachment(db, requireAuth(req).companyId, idParam(req.params.attachmentId, "Attachment"));
    // res.attachment() writes an RFC 6266 Content-Disposition with the name safely encoded;
    // without ?download the browser shows the file in place (thumbnails, the PDF viewer).
    res.attachment(row.fileName);
    if (req.query.download === undefined) res.setHeader("Content-Disposition", String(res.getHeader("Content-Disposition")).replace(/^attachment/, "inline"));
    res.setHeader("Content-Type", row.mediaType);
    res.setHeader("Cache-Control", "private, max-age=3600");
    res.send(row.content);
  });

  router.delete("/:attachmentId", can("jobs:write"), async (req, res) => {
    await deleteAttachment(db, requireAuth(req).companyId, idParam(req.params.attachmentId, "Attachment"));
    res.status(204).end();
  });

  return router;
}
