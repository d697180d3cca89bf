import { Router, type Request } from "express";
import { AcceptQuoteInput, ClientSnapshotSchema, DeclineQuoteInput, type PublicQuote } from "../../shared/schemas/estimates.js";
import { publicRoute } from "../auth/context.js";
import type { Quote } from "../db/entities/index.js";
import { limitBy } from "../middleware/rate-limit.js";
import { answerQuoteLink, openQuoteLink, quoteLabel, quoteLinkPdf } from "../services/quote.service.js";
import type { AccountDeps } from "./deps.js";
import { sendPdf } from "./estimates.routes.js";
import { publicDeposit, publicReceipt, startDepositCheckout } from "../services/payment.service.js";

async function presentPublicQuote(deps: AccountDeps, q: Quote): Promise<PublicQuote> {
  const state = q.status === "accepted" || q.status === "declined" || q.status === "deposit paid" ? q.status : "open";
  return {
    state,
    status: q.status,
    label: quoteLabel(q),
    // Only what the client may see: no cost, markup or margin (the client PDF shows sell prices only too).
    snapshot: ClientSnapshotSchema.parse(q.snapshot),
    acceptedName: q.acceptedName,
    acceptedAt: q.acceptedAt?.toISOString() ?? null,
    declinedAt: q.declinedAt?.toISOString() ?? null,
    deposit: await publicDeposit(deps.db.manager, q, deps.payments !== null),
  };
}

const tokenOf = (req: Request) => String(req.params.token);

/** The client's side of a quote, reached with the e-mailed link's token (no account). */
export function quoteLinkRoutes(deps: AccountDeps): Router {
  const { db, publicUrl, rateLimit, logger } = deps;
  const router = Router();

  router.get("/:token", publicRoute, async (req, res) => {
    res.setHeader("Cache-Control", "no-store");
    res.json(await presentPublicQuote(deps, await openQuoteLink(db, tokenOf(req))));
  });

  router.get("/:token/pdf", publicRoute, async (req, res) => {
    const { quote, pdf } = await quoteLinkPdf(db, tokenOf(req), publicUrl);
    sendPdf(res, pdf, `${quoteLabel(quote).replace(/\s+/g, "-")}.pdf`, req.query.download !== undefined);
  });

  router.post("/:token/accept", publicRoute, ...limitBy("quote answer", rateLimit, ["ip"]), async (req, res) => {
    const input = AcceptQuoteInput.parse(req.body);
    const quote = await answerQuoteLink(deps, tokenOf(req), { kind: "accept", input, ip: req.ip ?? null, userAgent: req.get("user-agent") ?? null }, (error) =>
      logger.warn({ err: error }, "could not e-mail the estimator about an accepted quote"),
    );
    res.json(await presentPublicQuote(deps, quote));
  });

  router.post("/:token/decline", publicRoute, ...limitBy("quote answer", rateLimit, ["ip"]), async (req, res) => {
    const input = DeclineQuoteInput.parse(req.body ?? {});
    const quote = await answerQuoteLink(deps, tokenOf(req), { kind: "decline", reason: input.reason ? input.reason : null }, (error) =>
      logger.warn({ err: error }, "could not e-mail the estimator about a declined quote"),
    );
    res.json(await presentPublicQuote(deps, quote));
  });

  /** "Pay deposit": the Stripe Checkout page to send the client to. */
  router.post("/:token/deposit", publicRoute, ...limitBy("deposit checkout", rateLimit, ["ip"]), async (req, res) => {
    res.setHeader("Cache-Control", "no-store");
    res.json({ url: await startDepositCheckout(deps, tokenOf(req)) });
  });

  router.get("/:token/receipt.pdf", publicRoute, async (req, res) => {
    const { payment, pdf } = await publicReceipt(db, tokenOf(req));
    sendPdf(res, pdf, `receipt-${payment.receiptNumber}.pdf`, req.query.download !== undefined);
  });

  return router;
}
