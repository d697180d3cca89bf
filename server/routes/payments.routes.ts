import express, { Router } from "express";
import { RefundInput } from "../../shared/schemas/payments.js";
import { can, publicRoute, requireAuth } from "../auth/context.js";
import { Payment } from "../db/entities/index.js";
import { AppError } from "../errors.js";
import { handleStripeEvent, jobPayments, receiptPdf, refundPayment, verifyStripeEvent } from "../services/payment.service.js";
import { companyScope, idParam } from "../services/tenancy.js";
import type { AccountDeps } from "./deps.js";
import { sendPdf } from "./estimates.routes.js";

/** Payments of a job: mounted under /api/jobs. */
export function jobPaymentRoutes({ db }: AccountDeps): Router {
  const router = Router();
  router.get("/:jobId/payments", can("jobs:read"), async (req, res) => {
    res.json({ items: await jobPayments(db.manager, requireAuth(req).companyId, idParam(req.params.jobId, "Job")) });
  });
  return router;
}

/** One payment: mounted under /api/payments. */
export function paymentRoutes(deps: AccountDeps): Router {
  const { db } = deps;
  const router = Router();

  router.get("/:paymentId/receipt.pdf", can("jobs:read"), async (req, res) => {
    const payment = await companyScope(db.manager, requireAuth(req).companyId).mustFind(Payment, { id: idParam(req.params.paymentId, "Payment") }, "Payment");
    sendPdf(res, await receiptPdf(db.manager, payment), `receipt-${payment.receiptNumber}.pdf`, req.query.download !== undefined);
  });

  router.post("/:paymentId/refunds", can("payments:refund"), async (req, res) => {
    const auth = requireAuth(req);
    const id = idParam(req.params.paymentId, "Payment");
    const input = RefundInput.parse(req.body ?? {});
    res.status(201).json(await refundPayment(deps, auth.companyId, auth.userId, id, input));
  });

  return router;
}

/**
 * Stripe's webhook, mounted on the app before the API's JSON parser and CSRF guard: the signature
 * is over the raw bytes, and Stripe's request carries no session or Origin (the signature is its
 * proof). Bad or missing signature → 400 and nothing recorded; a repeated event → 200, ignored.
 */
export function stripeWebhookRoute(deps: AccountDeps): Router {
  const router = Router();
  router.post("/", publicRoute, express.raw({ type: "application/json", limit: "1mb" }), async (req, res) => {
    if (!deps.payments) throw new AppError("not_found", "Online payments are not set up here");
    const event = verifyStripeEvent(deps.payments, req.body, req.get("stripe-signature"));
    const result = await handleStripeEvent(deps, event);
    deps.logger.info({ event: event.id, type: event.type, ...result }, "stripe event");
    res.json({ received: true, ...result });
  });
  return router;
}
