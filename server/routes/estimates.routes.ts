import { Router } from "express";
import { CreateQuoteInput, EstimateLimits, SaveEstimateInput, SendQuoteInput, UpdateEstimatingSettingsInput } from "../../shared/schemas/estimates.js";
import { can, requireAuth } from "../auth/context.js";
import { AppError } from "../errors.js";
import { singleFile } from "../middleware/upload.js";
import { LOGO_IMAGES } from "../images.js";
import { PdfCache, quotePdfKey } from "../pdf/pdf-cache.js";
import { presentEstimatingSettings, presentQuoteDetail, presentQuoteSummary, senderNames } from "../presenters/estimates.presenter.js";
import { findEstimate, generateEstimate, presentEstimate, saveEstimate } from "../services/estimate.service.js";
import { deleteLogo, getEstimatingSettings, readLogo, saveLogo, updateEstimatingSettings } from "../services/estimating-settings.service.js";
import { createQuote, getQuote, issueLink, listJobQuotes, quoteEvents, quoteLabel, quotePdf, revokeLink, sendQuote } from "../services/quote.service.js";
import { acceptedQuoteForJob } from "../services/cut-list.service.js";
import { quotePayments } from "../services/payment.service.js";
import { idParam } from "../services/tenancy.js";
import type { AccountDeps } from "./deps.js";
import type { Response } from "express";
import type { DataSource } from "typeorm";
import type { Quote } from "../db/entities/index.js";

function sendPdf(res: Response, pdf: Buffer, fileName: string, download: boolean) {
  res.setHeader("Content-Type", "application/pdf");
  res.setHeader("Content-Disposition", `${download ? "attachment" : "inline"}; filename="${fileName}"`);
  res.setHeader("Cache-Control", "private, no-store");
  res.send(pdf);
}
export { sendPdf };

async function quoteDetail(db: DataSource, quote: Quote) {
  return presentQuoteDetail(quote, await senderNames(db.manager, [quote]), await quoteEvents(db.manager, quote.id), await quotePayments(db.manager, quote.companyId, quote.id));
}

/** Company estimating settings and logo: mounted under /api/company. */
export function estimatingSettingsRoutes({ db }: AccountDeps): Router {
  const router = Router();
  router.get("/estimating", can("company:read"), async (req, res) => {
    const { company, hasLogo } = await getEstimatingSettings(db, requireAuth(req).companyId);
    res.json(presentEstimatingSettings(company, hasLogo));
  });
  router.patch("/estimating", can("company:write"), async (req, res) => {
    const patch = UpdateEstimatingSettingsInput.parse(req.body);
    const { company, hasLogo } = await updateEstimatingSettings(db, requireAuth(req).companyId, patch);
    res.json(presentEstimatingSettings(company, hasLogo));
  });
  router.get("/logo", can("company:read"), async (req, res) => {
    const logo = await readLogo(db, requireAuth(req).companyId);
    res.setHeader("Content-Type", logo.mediaType);
    res.setHeader("Cache-Control", "private, no-cache");
    res.send(logo.content);
  });
  router.post("/logo", can("company:write"), singleFile("file", EstimateLimits.logoMaxBytes, "logo", LOGO_IMAGES), async (req, res) => {
    if (!req.file) throw new AppError("invalid_input", 'file: send the logo in the multipart field "file"', { field: "file" });
    const { company, hasLogo } = await saveLogo(db, requireAuth(req).companyId, req.file.buffer);
    res.json(presentEstimatingSettings(company, hasLogo));
  });
  router.delete("/logo", can("company:write"), async (req, res) => {
    await deleteLogo(db, requireAuth(req).companyId);
    res.status(204).end();
  });
  return router;
}

/** A job's estimate, quotes and cut list: mounted under /api/jobs. */
export function jobEstimateRoutes({ db }: AccountDeps): Router {
  const router = Router();

  // 204 until the estimate is first built: "not built yet" is a normal state of a job, not an error.
  router.get("/:jobId/estimate", can("jobs:read"), async (req, res) => {
    const { companyId } = requireAuth(req);
    const estimate = await findEstimate(db.manager, companyId, idParam(req.params.jobId, "Job"));
    if (!estimate) {
      res.status(204).end();
      return;
    }
    res.json(await presentEstimate(db.manager, companyId, estimate));
  });

  router.post("/:jobId/estimate/generate", can("quotes:write"), async (req, res) => {
    const { companyId } = requireAuth(req);
    const estimate = await generateEstimate(db, companyId, idParam(req.params.jobId, "Job"));
    res.json(await presentEstimate(db.manager, companyId, estimate));
  });

  router.put("/:jobId/estimate", can("quotes:write"), async (req, res) => {
    const { companyId } = requireAuth(req);
    const jobId = idParam(req.params.jobId, "Job");
    const input = SaveEstimateInput.parse(req.body);
    const estimate = await saveEstimate(db, companyId, jobId, input);
    res.json(await presentEstimate(db.manager, companyId, estimate));
  });

  router.get("/:jobId/quotes", can("jobs:read"), async (req, res) => {
    const quotes = await listJobQuotes(db.manager, requireAuth(req).companyId, idParam(req.params.jobId, "Job"));
    const senders = await senderNames(db.manager, quotes);
    res.json({ items: quotes.map((q) => presentQuoteSummary(q, senders)) });
  });

  router.post("/:jobId/quotes", can("quotes:write"), async (req, res) => {
    const auth = requireAuth(req);
    const jobId = idParam(req.params.jobId, "Job");
    const input = CreateQuoteInput.parse(req.body ?? {});
    const quote = await createQuote(db, auth.companyId, auth.userId, jobId, input);
    res.status(201).json(await quoteDetail(db, quote));
  });

  router.get("/:jobId/cut-list.pdf", can("jobs:read"), async (req, res) => {
    const { quote, pdf } = await acceptedQuoteForJob(db, requireAuth(req).companyId, idParam(req.params.jobId, "Job"));
    sendPdf(res, pdf, `cut-list-${quote.number}-R${quote.revision}.pdf`, req.query.download !== undefined);
  });

  return router;
}

/** One quote: mounted under /api/quotes. */
export function quoteRoutes(deps: AccountDeps): Router {
  const { db } = deps;
  const router = Router();
  // Rendering takes the event loop for ~150 ms; a revision's PDF is the same until its row changes (pdf-cache.ts).
  const renderedPdfs = new PdfCache();

  router.get("/:quoteId", can("jobs:read"), async (req, res) => {
    res.json(await quoteDetail(db, await getQuote(db.manager, requireAuth(req).companyId, idParam(req.params.quoteId, "Quote"))));
  });

  router.get("/:quoteId/pdf", can("jobs:read"), async (req, res) => {
    const quote = await getQuote(db.manager, requireAuth(req).companyId, idParam(req.params.quoteId, "Quote"));
    const pdf = await renderedPdfs.get(quotePdfKey(quote, null), () => quotePdf(quote, null));
    sendPdf(res, pdf, `${quoteLabel(quote).replace(/\s+/g, "-")}.pdf`, req.query.download !== undefined);
  });

  router.post("/:quoteId/send", can("quotes:write"), async (req, res) => {
    const auth = requireAuth(req);
    const id = idParam(req.params.quoteId, "Quote");
    const input = SendQuoteInput.parse(req.body ?? {});
    const { quote, pending } = await sendQuote(deps, auth.companyId, { userId: auth.userId, name: auth.name }, id, input);
    // 202: the mail server did not take it yet; the queued job keeps trying ("send pending").
    res.status(pending ? 202 : 200).json(await quoteDetail(db, quote));
  });

  router.post("/:quoteId/link", can("quotes:write"), async (req, res) => {
    const auth = requireAuth(req);
    res.json({ url: await issueLink(deps, auth.companyId, auth.name, idParam(req.params.quoteId, "Quote")) });
  });

  router.delete("/:quoteId/link", can("quotes:write"), async (req, res) => {
    const auth = requireAuth(req);
    await revokeLink(db, auth.companyId, auth.name, idParam(req.params.quoteId, "Quote"));
    res.status(204).end();
  });

  return router;
}
