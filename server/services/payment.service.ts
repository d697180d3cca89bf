import type { Logger } from "pino";
import Stripe from "stripe";
import { In, IsNull, type DataSource, type EntityManager } from "typeorm";
import type { z } from "zod";
import { formatMoney } from "../../shared/money.js";
import type { DepositTotals, Payment as PaymentView, PublicDeposit, RefundInput } from "../../shared/schemas/payments.js";
import { DepositCheckout, Job, Payment, PaymentRefund, Quote, StripeEvent, User } from "../db/entities/index.js";
import { AppError } from "../errors.js";
import type { JobQueue } from "../jobs/queue.js";
import type { Mailer } from "../mail/mailer.js";
import { depositNoticeMail, depositReceiptMail } from "../mail/templates.js";
import type { Payments } from "../payments/stripe-client.js";
import { renderReceiptPdf } from "../pdf/receipt-pdf.js";
import { clientUrl, lockJobAndRevisions, quoteForToken, quoteLabel, recordQuoteEvent } from "./quote.service.js";
import { companyScope, isUuid } from "./tenancy.js";

export interface PaymentDeps {
  db: DataSource;
  mailer: Mailer;
  publicUrl: string;
  logger: Logger;
  /** Stripe; null when online deposits are not set up. */
  payments: Payments | null;
  /** Background jobs: a receipt the mail server refused is sent again later. */
  jobs?: JobQueue | null;
}

// ---------------------------------------------------------------- presenting

async function userNames(manager: EntityManager, ids: Array<string | null>): Promise<Map<string, string>> {
  const wanted = [...new Set(ids.filter((id): id is string => id !== null))];
  if (wanted.length === 0) return new Map();
  const users = await manager.findBy(User, { id: In(wanted) });
  return new Map(users.map((u) => [u.id, u.name]));
}

/** Payments with their refunds and quote labels, as the staff screens show them. */
export async function presentPayments(manager: EntityManager, payments: Payment[]): Promise<PaymentView[]> {
  if (payments.length === 0) return [];
  const refunds = await manager.find(PaymentRefund, { where: { paymentId: In(payments.map((p) => p.id)) }, order: { createdAt: "ASC" } });
  const quotes = await manager.find(Quote, { where: { id: In([...new Set(payments.map((p) => p.quoteId))]) }, select: { id: true, number: true, revision: true } });
  const labels = new Map(quotes.map((q) => [q.id, quoteLabel(q)]));
  const names = await userNames(manager, refunds.map((r) => r.createdById));
  return payments.map((p) => ({
    id: p.id,
    quoteId: p.quoteId,
    jobId: p.jobId,
    quoteLabel: labels.get(p.quoteId) ?? "",
    receiptNumber: p.receiptNumber,
    status: p.status,
    mismatchReason: p.mismatchReason,
    amountMinor: p.amountMinor,
    currency: p.currency,
    expectedAmountMinor: p.expectedAmountMinor,
    expectedCurrency: p.expectedCurrency,
    refundedMinor: p.refundedMinor,
    paidAt: p.paidAt.toISOString(),
    payerName: p.payerName,
    payerEmail: p.payerEmail,
    receiptSentAt: p.receiptSentAt?.toISOString() ?? null,
    receiptError: p.receiptError,
    stripePaymentIntentId: p.stripePaymentIntentId,
    refunds: refunds
      .filter((r) => r.paymentId === p.id)
      .map((r) => ({
        id: r.id,
        amountMinor: r.amountMinor,
        currency: r.currency,
        reason: r.reason,
        status: r.status,
        createdAt: r.createdAt.toISOString(),
        createdBy: r.createdById ? (names.get(r.createdById) ?? null) : null,
      })),
  }));
}

export async function quotePayments(manager: EntityManager, companyId: string, quoteId: string): Promise<PaymentView[]> {
  return presentPayments(manager, await companyScope(manager, companyId).find(Payment, { where: { quoteId }, order: { paidAt: "ASC" } }));
}

export async function jobPayments(manager: EntityManager, companyId: string, jobId: string): Promise<PaymentView[]> {
  await companyScope(manager, companyId).mustFind(Job, { id: jobId }, "Job");
  return presentPayments(manager, await companyScope(manager, companyId).find(Payment, { where: { jobId }, order: { paidAt: "ASC" } }));
}

/** The deposit as the client's page shows it: due, paid (with its receipt), refunded, or money to check. */
export async function publicDeposit(manager: EntityManager, quote: Quote, online: boolean): Promise<PublicDeposit> {
  const payments = await manager.find(Payment, { where: { quoteId: quote.id }, order: { paidAt: "ASC" } });
  const deposit = payments.find((p) => p.mismatchReason === null);
  const base = { dueMinor: quote.depositMinor, currency: quote.currency, online, paidMinor: null, paidAt: null, receiptNumber: null };
  if (deposit) {
    return { ...base, state: deposit.status === "refunded" ? "refunded" : "paid", paidMinor: deposit.amountMinor, paidAt: deposit.paidAt.toISOString(), receiptNumber: deposit.receiptNumber };
  }
  if (payments.some((p) => p.status === "mismatch")) return { ...base, state: "review" };
  return { ...base, state: quote.depositMinor > 0 ? "due" : "none" };
}

// ---------------------------------------------------------------- the client's "Pay deposit"

/** A flagged payment refunded in full: settled, it neither counts as the deposit nor blocks paying it. */
const settledFlag = (p: Payment) => p.mismatchReason !== null && p.status === "refunded";

function providerError(deps: PaymentDeps, error: unknown, what: string): AppError {
  deps.logger.warn({ err: error }, `Stripe: ${what} failed`);
  return new AppError("payment_failed", "We could not reach the payment service, and nothing was charged. Please try again in a few minutes.");
}

/**
 * The Stripe Checkout page for the deposit of an accepted quote. One open session per quote at a
 * time: the quote row is locked, an open session is reused, and the idempotency key (quote,
 * revision, attempt) makes a retried request return the same session. A new session is made only
 * after the previous one expired.
 */
export async function startDepositCheckout(deps: PaymentDeps, token: string): Promise<string> {
  const { payments } = deps;
  return deps.db.transaction(async (tx) => {
    const found = await quoteForToken(tx, token);
    await lockJobAndRevisions(tx, found.companyId, found.jobId, found.number);
    const quote = await quoteForToken(tx, token);
    if (quote.status === "deposit paid") throw new AppError("conflict", "The deposit for this quote is already paid — thank you");
    if (quote.status !== "accepted") throw new AppError("conflict", "Accept the quote first; the deposit is paid after acceptance");
    if (quote.depositMinor <= 0) throw new AppError("conflict", "No deposit is due on this quote");
    if (!payments) {
      const who = quote.snapshot.company.contactEmail ?? quote.snapshot.company.phone ?? quote.snapshot.company.name;
      throw new AppError("service_unavailable", `Online payment is not set up for this company; please contact ${who} to pay the deposit`);
    }
    // A flagged payment blocks a new one until it is settled; refunded in full, it no longer counts.
    const received = await tx.findBy(Payment, { quoteId: quote.id });
    if (received.some((p) => !settledFlag(p))) {
      throw new AppError("conflict", "A payment for this quote has been received and is being checked; the contractor will be in touch");
    }

    const latest = await tx.findOne(DepositCheckout, { where: { quoteId: quote.id }, order: { attempt: "DESC" } });
    const latestPaid = latest ? received.some((p) => p.stripeCheckoutSessionId === latest.stripeSessionId) : false;
    if (latest?.status === "open") {
      let session: Stripe.Checkout.Session;
      try {
        session = await payments.stripe.checkout.sessions.retrieve(latest.stripeSessionId);
      } catch (error) {
        throw providerError(deps, error, "retrieving a checkout session");
      }
      if (session.status === "open" && session.url) return session.url;
      if (session.status === "complete") {
        throw new AppError("conflict", "Your payment was received and is being confirmed; this page will show it in a moment", { state: "processing" });
      }
      await tx.update(DepositCheckout, { id: latest.id }, { status: "expired" });
    } else if (latest?.status === "complete" && !latestPaid) {
      throw new AppError("conflict", "Your payment was received and is being confirmed; this page will show it in a moment", { state: "processing" });
    }

    const attempt = (latest?.attempt ?? 0) + 1;
    const label = quoteLabel(quote);
    const metadata = { quoteId: quote.id, quoteNumber: quote.number, revision: String(quote.revision), companyId: quote.companyId };
    const back = clientUrl(deps.publicUrl, token);
    // The address the quote went to: the client the contractor is dealing with.
    const email = quote.sentTo ?? quote.snapshot.client.email;
    let session: Stripe.Checkout.Session;
    try {
      session = await payments.stripe.checkout.sessions.create(
        {
          mode: "payment",
          line_items: [
            {
              quantity: 1,
              price_data: {
                currency: quote.currency.toLowerCase(),
                unit_amount: quote.depositMinor,
                product_data: { name: `Deposit on quote ${label} — ${quote.snapshot.job.title}`.slice(0, 250) },
              },
            },
          ],
          client_reference_id: `${quote.id}:${quote.revision}`,
          metadata,
          payment_intent_data: { metadata },
          ...(email ? { customer_email: email } : {}),
          success_url: `${back}?deposit=returned&session_id={CHECKOUT_SESSION_ID}`,
          cancel_url: `${back}?deposit=canceled`,
        },
        { idempotencyKey: `runwright-deposit-${quote.id}-r${quote.revision}-a${attempt}` },
      );
    } catch (error) {
      throw providerError(deps, error, "creating a checkout session");
    }
    if (!session.url) throw providerError(deps, new Error("the session has no url"), "creating a checkout session");
    await tx.insert(DepositCheckout, {
      companyId: quote.companyId,
      quoteId: quote.id,
      attempt,
      stripeSessionId: session.id,
      url: session.url,
      amountMinor: quote.depositMinor,
      currency: quote.currency,
      status: "open",
    });
    return session.url;
  });
}

// ---------------------------------------------------------------- webhooks

/** The event, if its signature is Stripe's (or the fake's, signed the same way); 400 otherwise. */
export function verifyStripeEvent(payments: Payments, rawBody: unknown, signature: string | undefined): Stripe.Event {
  if (!Buffer.isBuffer(rawBody) || rawBody.length === 0) throw new AppError("invalid_input", "The webhook body must be Stripe's JSON event");
  if (!signature) throw new AppError("invalid_input", "Stripe-Signature header is missing");
  let event: Stripe.Event;
  try {
    event = payments.stripe.webhooks.constructEvent(rawBody, signature, payments.webhookSecret);
  } catch {
    throw new AppError("invalid_input", "Stripe-Signature does not match this body; the event was not recorded");
  }
  // Signed, but not in Stripe's shape: refused, nothing recorded.
  const shape = event as unknown as { id?: unknown; type?: unknown; created?: unknown; data?: { object?: unknown } } | null;
  if (
    !shape ||
    typeof shape !== "object" ||
    typeof shape.id !== "string" ||
    !/^[A-Za-z0-9_]{1,255}$/.test(shape.id) ||
    typeof shape.type !== "string" ||
    shape.type.length > 100 ||
    typeof shape.created !== "number" ||
    typeof shape.data?.object !== "object" ||
    shape.data.object === null
  ) {
    throw new AppError("invalid_input", "The event is not in Stripe's shape (id, type, created, data.object); it was not recorded");
  }
  return event;
}

type Outcome = { outcome: string; notify?: string };

/** Serialises everything about one PaymentIntent (its payment and its refunds), whatever order the events come in. */
async function lockPaymentIntent(tx: EntityManager, paymentIntentId: string): Promise<void> {
  await tx.query(`SELECT pg_advisory_xact_lock(hashtext('stripe-pi:' || $1))`, [paymentIntentId]);
}

/** Adds up a payment's refunds and sets its status; a full refund also settles a flagged payment. */
async function refreshRefunds(tx: EntityManager, payment: Payment): Promise<Payment> {
  const [{ sum }]: Array<{ sum: string }> = await tx.query(`SELECT coalesce(sum(amount_minor), 0) AS sum FROM payment_refund WHERE payment_id = $1 AND status IN ('succeeded', 'pending')`, [payment.id]);
  const refundedMinor = Math.min(Number(sum), payment.amountMinor);
  const status: Payment["status"] =
    refundedMinor >= payment.amountMinor && payment.amountMinor > 0 ? "refunded" : payment.mismatchReason ? "mismatch" : refundedMinor > 0 ? "partially refunded" : "paid";
  await tx.update(Payment, { id: payment.id }, { refundedMinor, status });
  return { ...payment, refundedMinor, status };
}

/** Text from Stripe for our columns: no control characters (PostgreSQL refuses NUL), trimmed to the column. */
function cleanText(value: unknown, max: number): string | null {
  if (typeof value !== "string") return null;
  const text = value.replace(/[\u0000-\u001f\u007f]/g, " ").trim().slice(0, max);
  return text || null;
}

const idOf = (value: string | { id: string } | null | undefined): string | null => (typeof value === "string" ? value : (value?.id ?? null));

async function recordCheckoutPayment(tx: EntityManager, event: Stripe.Event, session: Stripe.Checkout.Session): Promise<Outcome> {
  if (session.mode !== "payment" || session.payment_status !== "paid") return { outcome: "ignored: not paid yet" };
  const checkout = await tx.findOneBy(DepositCheckout, { stripeSessionId: session.id });
  const quoteId = checkout?.quoteId ?? (isUuid(session.metadata?.quoteId) ? session.metadata.quoteId : null);
  const known = quoteId ? await tx.findOneBy(Quote, { id: quoteId }) : null;
  if (!known) return { outcome: "ignored: not a deposit of a quote here" };
  // The quote's lock order (job, then its revisions), then the PaymentIntent's.
  await lockJobAndRevisions(tx, known.companyId, known.jobId, known.number);
  const paymentIntentId = idOf(session.payment_intent);
  if (paymentIntentId) await lockPaymentIntent(tx, paymentIntentId);
  if (await tx.findOneBy(Payment, { stripeCheckoutSessionId: session.id })) return { outcome: "ignored: payment already recorded" };
  const quote = await tx.findOneByOrFail(Quote, { id: known.id });

  const amount = typeof session.amount_total === "number" && Number.isSafeInteger(session.amount_total) && session.amount_total >= 0 ? session.amount_total : 0;
  // ISO 4217's "XXX" (no currency) stands in for a missing or malformed one, so money still formats.
  const given = typeof session.currency === "string" ? session.currency.toUpperCase() : "";
  const currency = /^[A-Z]{3}$/.test(given) ? given : "XXX";
  let mismatch: string | null = null;
  if (currency !== quote.currency) mismatch = `Paid in ${currency === "XXX" ? "an unknown currency" : currency}; the deposit is due in ${quote.currency}`;
  else if (session.amount_total !== amount) mismatch = "Stripe reported no amount for this payment";
  else if (amount !== quote.depositMinor) mismatch = `Paid ${formatMoney(amount, currency)}; the deposit due is ${formatMoney(quote.depositMinor, quote.currency)}`;
  else if (quote.status === "deposit paid") mismatch = "The deposit had already been paid; this is a second payment";
  else if (quote.status !== "accepted") mismatch = `The quote was ${quote.status} when this payment arrived`;

  const count = await tx.countBy(Payment, { quoteId: quote.id });
  const payerName = cleanText(session.customer_details?.name, 200);
  const inserted = await tx.insert(Payment, {
    companyId: quote.companyId,
    quoteId: quote.id,
    jobId: quote.jobId,
    receiptNumber: `${quote.number}-R${quote.revision}-D${count + 1}`,
    status: mismatch ? "mismatch" : "paid",
    mismatchReason: mismatch,
    amountMinor: amount,
    currency,
    expectedAmountMinor: quote.depositMinor,
    expectedCurrency: quote.currency,
    paidAt: new Date((event.created || Date.now() / 1000) * 1000),
    payerName,
    payerEmail: cleanText(session.customer_details?.email ?? session.customer_email, 254),
    stripeCheckoutSessionId: session.id,
    stripePaymentIntentId: paymentIntentId,
    stripeEventId: event.id,
  });
  const paymentId = String(inserted.identifiers[0]?.id);
  if (checkout) await tx.update(DepositCheckout, { id: checkout.id }, { status: "complete" });
  // A refund reported before this payment (events out of order) is attached now.
  if (paymentIntentId) await tx.update(PaymentRefund, { stripePaymentIntentId: paymentIntentId, paymentId: IsNull() }, { paymentId });
  const payment = await refreshRefunds(tx, await tx.findOneByOrFail(Payment, { id: paymentId }));

  const paid = formatMoney(amount, currency);
  if (!mismatch) {
    await tx.update(Quote, { id: quote.id }, { status: "deposit paid" });
    await recordQuoteEvent(tx, quote, "deposit_paid", payerName ?? quote.snapshot.client.name, `${paid} · receipt ${payment.receiptNumber}`);
    return { outcome: "payment recorded", notify: paymentId };
  }
  await recordQuoteEvent(tx, quote, "payment_flagged", payerName ?? quote.snapshot.client.name, `${paid}: ${mismatch}`);
  return { outcome: "payment flagged", notify: paymentId };
}

async function recordRefund(tx: EntityManager, refund: Stripe.Refund, createdById: string | null): Promise<Outcome> {
  const paymentIntentId = idOf(refund.payment_intent);
  if (!paymentIntentId || !refund.amount || refund.amount <= 0) return { outcome: "ignored: refund without a payment" };
  await lockPaymentIntent(tx, paymentIntentId);
  const payment = await tx.findOne(Payment, { where: { stripePaymentIntentId: paymentIntentId }, lock: { mode: "pessimistic_write" } });
  const status = (refund.status ?? "pending").slice(0, 20);
  const existing = await tx.findOneBy(PaymentRefund, { stripeRefundId: refund.id });
  if (existing) {
    if (existing.status === status) return { outcome: "ignored: refund already recorded" };
    await tx.update(PaymentRefund, { id: existing.id }, { status });
  } else {
    await tx.insert(PaymentRefund, {
      paymentId: payment?.id ?? null,
      stripeRefundId: refund.id,
      stripePaymentIntentId: paymentIntentId,
      amountMinor: refund.amount,
      currency: (refund.currency ?? payment?.currency ?? "").toUpperCase().slice(0, 3).padEnd(3, "?"),
      reason: refund.reason ?? null,
      status,
      createdById,
    });
  }
  if (!payment) return { outcome: "refund kept until its payment arrives" };
  const updated = await refreshRefunds(tx, payment);
  if (!existing) {
    const actor = createdById ? ((await tx.findOneBy(User, { id: createdById }))?.name ?? null) : "Stripe";
    await recordQuoteEvent(tx, { id: payment.quoteId, companyId: payment.companyId }, "refunded", actor, `${formatMoney(refund.amount, updated.currency)} of ${formatMoney(updated.amountMinor, updated.currency)}`);
  }
  return { outcome: "refund recorded" };
}

/**
 * One verified event, exactly once: its id goes into stripe_event first (a repeated delivery
 * finds it there and changes nothing), and what it records is written in the same transaction.
 * Mail goes out after the commit; a mail failure is kept on the payment, never undoes it. The
 * receipt also gets a job queued in the same transaction, which sends it later if it has not gone
 * by then (the mail server was down, or the process stopped right after the commit).
 */
export async function handleStripeEvent(deps: PaymentDeps, event: Stripe.Event): Promise<{ duplicate: boolean; outcome: string }> {
  const result = await deps.db.transaction(async (tx): Promise<Outcome & { duplicate: boolean }> => {
    // PostgreSQL's jsonb cannot hold NUL characters: they are dropped from the stored copy only.
    const stored = JSON.stringify(event, (_key, value: unknown) => (typeof value === "string" ? value.replace(/\u0000/g, "") : value));
    const inserted: unknown[] = await tx.query(`INSERT INTO stripe_event (id, type, payload) VALUES ($1, $2, $3) ON CONFLICT (id) DO NOTHING RETURNING id`, [
      event.id.slice(0, 255),
      event.type.slice(0, 100),
      stored,
    ]);
    if (inserted.length === 0) return { duplicate: true, outcome: "duplicate" };
    const object = event.data.object as unknown as { id?: unknown; object?: unknown };
    const hasId = typeof object.id === "string" && object.id.length > 0;
    let handled: Outcome;
    switch (event.type) {
      case "checkout.session.completed":
      case "checkout.session.async_payment_succeeded":
        handled = hasId ? await recordCheckoutPayment(tx, event, event.data.object) : { outcome: "ignored: malformed session" };
        break;
      case "checkout.session.expired":
        if (hasId) await tx.update(DepositCheckout, { stripeSessionId: String(object.id), status: "open" }, { status: "expired" });
        handled = { outcome: hasId ? "session expired" : "ignored: malformed session" };
        break;
      case "refund.created":
      case "refund.updated":
        handled = hasId ? await recordRefundFromStripe(deps, tx, String(object.id)) : { outcome: "ignored: malformed refund" };
        break;
      case "charge.refunded": {
        const outcomes: string[] = [];
        const listed = (event.data.object.refunds?.data ?? []) as Array<{ id?: unknown }>;
        for (const refund of listed) if (typeof refund?.id === "string") outcomes.push((await recordRefundFromStripe(deps, tx, refund.id)).outcome);
        handled = { outcome: outcomes.length > 0 ? outcomes.join("; ").slice(0, 200) : "ignored: no refunds listed" };
        break;
      }
      default:
        handled = { outcome: "ignored: not used" };
    }
    await tx.update(StripeEvent, { id: event.id }, { outcome: handled.outcome });
    if (handled.notify && deps.jobs) await deps.jobs.enqueue(tx, "payment-receipt", { paymentId: handled.notify });
    return { duplicate: false, ...handled };
  });
  // After the commit: a failure here is logged and kept on the payment, never fails the webhook.
  if (result.notify) await sendPaymentMails(deps, result.notify).catch((error: unknown) => deps.logger.warn({ err: error }, "could not send the payment's e-mails"));
  return { duplicate: result.duplicate, outcome: result.outcome };
}

/**
 * A refund as Stripe has it now, not as the event carried it: events about one refund can come
 * late and out of order (created after updated), and the current state is the one to record.
 */
async function recordRefundFromStripe(deps: PaymentDeps, tx: EntityManager, refundId: string): Promise<Outcome> {
  if (!deps.payments) return { outcome: "ignored: payments are off" };
  let refund: Stripe.Refund;
  try {
    refund = await deps.payments.stripe.refunds.retrieve(refundId);
  } catch (error) {
    if (error instanceof Stripe.errors.StripeInvalidRequestError) return { outcome: "ignored: Stripe does not know this refund" };
    // Stripe unreachable: answer 503 so that Stripe delivers the event again later.
    deps.logger.warn({ err: error }, "Stripe: retrieving a refund failed");
    throw new AppError("service_unavailable", "Stripe could not be reached to check this refund; deliver the event again later");
  }
  return recordRefund(tx, refund, null);
}

// ---------------------------------------------------------------- receipts and notices

export async function receiptPdf(manager: EntityManager, payment: Payment): Promise<Buffer> {
  const quote = await manager.findOneByOrFail(Quote, { id: payment.quoteId });
  return renderReceiptPdf({
    company: quote.snapshot.company,
    client: quote.snapshot.client,
    jobTitle: quote.snapshot.job.title,
    siteAddress: quote.snapshot.job.siteAddress,
    quoteLabel: quoteLabel(quote),
    receiptNumber: payment.receiptNumber,
    amountMinor: payment.amountMinor,
    refundedMinor: payment.refundedMinor,
    currency: payment.currency,
    paidAt: payment.paidAt,
    payerName: payment.payerName,
    reference: payment.stripePaymentIntentId ?? payment.stripeCheckoutSessionId,
    quoteTotalMinor: quote.totalMinor,
  });
}

/** The client's receipt (with its PDF) for a deposit, and a notice to whoever sent the quote. */
async function sendPaymentMails(deps: PaymentDeps, paymentId: string): Promise<void> {
  await sendReceipt(deps, paymentId);
  const payment = await deps.db.manager.findOneByOrFail(Payment, { id: paymentId });
  const quote = await deps.db.manager.findOneByOrFail(Quote, { id: payment.quoteId });
  const { company, client, job } = quote.snapshot;
  const amount = formatMoney(payment.amountMinor, payment.currency);
  const label = quoteLabel(quote);
  const sender = quote.sentById ? await deps.db.manager.findOneBy(User, { id: quote.sentById }) : null;
  const to = sender?.email ?? company.contactEmail;
  if (!to) return;
  await deps.mailer
    .send(
      depositNoticeMail({
        to,
        companyName: company.name,
        label,
        jobTitle: job.title,
        clientName: client.name,
        amount,
        mismatchReason: payment.mismatchReason,
        url: `${deps.publicUrl}/jobs/${quote.jobId}/quotes/${quote.id}`,
      }),
    )
    .catch((error: unknown) => deps.logger.warn({ err: error }, "could not e-mail the deposit notice"));
}

/**
 * E-mails the receipt of a paid deposit unless it went already, with the payment row locked so the
 * send right after the webhook and the queued job never both send it. Returns why it failed, or
 * null (sent now, sent before, or nothing to send).
 */
export async function sendReceipt(deps: PaymentDeps, paymentId: string): Promise<string | null> {
  return deps.db.transaction(async (tx) => {
    const [locked] = (await tx.query(`SELECT id FROM payment WHERE id = $1 FOR UPDATE`, [paymentId])) as unknown[];
    if (!locked) return null;
    const payment = await tx.findOneByOrFail(Payment, { id: paymentId });
    const quote = await tx.findOneByOrFail(Quote, { id: payment.quoteId });
    const { company, client, job } = quote.snapshot;
    // The receipt goes where the quote went (the client's own address for this quote).
    const clientEmail = quote.sentTo ?? client.email;
    if (payment.status !== "paid" || !clientEmail || payment.receiptSentAt) return null;
    try {
      const pdf = await receiptPdf(tx, payment);
      await deps.mailer.send({
        ...depositReceiptMail({
          to: clientEmail,
          companyName: company.name,
          companyContact: [company.contactEmail, company.phone].filter(Boolean).join(" · "),
          clientName: client.name,
          label: quoteLabel(quote),
          jobTitle: job.title,
          amount: formatMoney(payment.amountMinor, payment.currency),
          paidAt: payment.paidAt,
          receiptNumber: payment.receiptNumber,
          balance: formatMoney(Math.max(quote.totalMinor - payment.amountMinor, 0), quote.currency),
        }),
        attachments: [{ filename: `receipt-${payment.receiptNumber}.pdf`, content: pdf, contentType: "application/pdf" }],
      });
    } catch (error) {
      deps.logger.warn({ err: error }, "could not e-mail a deposit receipt");
      const why = (error instanceof Error ? error.message : String(error)).slice(0, 500);
      await tx.update(Payment, { id: payment.id }, { receiptError: why });
      return why;
    }
    await tx.update(Payment, { id: payment.id }, { receiptSentAt: new Date(), receiptError: null });
    return null;
  });
}

/** The queued receipt (the "payment-receipt" job): a failure throws, so the queue tries again later. */
export async function runQueuedReceipt(deps: PaymentDeps, job: { paymentId: string }): Promise<void> {
  const failure = await sendReceipt(deps, job.paymentId);
  if (failure) throw new Error(`receipt of payment ${job.paymentId}: ${failure}`);
}

// ---------------------------------------------------------------- refunds (Owner)

/**
 * Refunds all or part of a payment through Stripe and records it from Stripe's answer; the
 * refund's webhook later finds it recorded. The payment row is locked, so two presses cannot
 * refund more than was paid, and the idempotency key (payment, refunded so far, amount) makes a
 * retried request return the same refund.
 */
export async function refundPayment(deps: PaymentDeps, companyId: string, userId: string, paymentId: string, input: z.output<typeof RefundInput>): Promise<PaymentView> {
  const { payments } = deps;
  await deps.db.transaction(async (tx) => {
    const found = await companyScope(tx, companyId).mustFind(Payment, { id: paymentId }, "Payment");
    if (!payments) throw new AppError("service_unavailable", "Online payments are not set up, so refunds cannot be made from here");
    if (!found.stripePaymentIntentId) throw new AppError("conflict", "This payment has no Stripe payment to refund");
    // The lock order of the webhooks: the PaymentIntent, then the payment row.
    await lockPaymentIntent(tx, found.stripePaymentIntentId);
    const payment = await tx.findOneOrFail(Payment, { where: { id: found.id }, lock: { mode: "pessimistic_write" } });
    const left = payment.amountMinor - payment.refundedMinor;
    if (left <= 0) throw new AppError("conflict", "This payment has already been refunded in full");
    const amount = input.amountMinor ?? left;
    if (amount > left) {
      const most = formatMoney(left, payment.currency);
      throw new AppError("invalid_input", `amountMinor: at most ${most} is left to refund`, { fields: { amountMinor: `at most ${most} is left to refund` } });
    }
    let refund: Stripe.Refund;
    try {
      refund = await payments.stripe.refunds.create(
        { payment_intent: found.stripePaymentIntentId, amount, ...(input.reason ? { reason: input.reason } : {}), metadata: { paymentId: payment.id } },
        // One key per Refund dialog when the screen sends one (a second press refunds once); otherwise per state.
        { idempotencyKey: input.requestId ? `runwright-refund-${payment.id}-${input.requestId}` : `runwright-refund-${payment.id}-${payment.refundedMinor}-${amount}` },
      );
    } catch (error) {
      if (error instanceof Stripe.errors.StripeInvalidRequestError || error instanceof Stripe.errors.StripeIdempotencyError) {
        deps.logger.warn({ err: error }, "Stripe refused a refund");
        throw new AppError("conflict", `Stripe refused the refund (${error.message}); reload the payment to see what has been refunded`);
      }
      throw providerError(deps, error, "creating a refund");
    }
    await recordRefund(tx, refund, userId);
  });
  const [view] = await presentPayments(deps.db.manager, [await deps.db.manager.findOneByOrFail(Payment, { id: paymentId })]);
  return view as PaymentView;
}

// ---------------------------------------------------------------- the dashboard

export async function depositTotals(db: DataSource, companyId: string, monthStart: Date): Promise<DepositTotals> {
  const [received]: Array<{ n: string; amount: string; refunded: string }> = await db.query(
    `SELECT count(*) AS n, coalesce(sum(amount_minor), 0) AS amount, coalesce(sum(refunded_minor), 0) AS refunded
       FROM payment WHERE company_id = $1 AND mismatch_reason IS NULL AND paid_at >= $2`,
    [companyId, monthStart],
  );
  // Accepted quotes (the live revision) with a deposit due and nothing received for them.
  const [outstanding]: Array<{ n: string; amount: string }> = await db.query(
    `SELECT count(*) AS n, coalesce(sum(q.deposit_minor), 0) AS amount FROM quote q
      WHERE q.company_id = $1 AND q.status = 'accepted' AND q.superseded_at IS NULL AND q.deposit_minor > 0
        AND NOT EXISTS (SELECT 1 FROM payment p WHERE p.quote_id = q.id AND NOT (p.mismatch_reason IS NOT NULL AND p.status = 'refunded'))`,
    [companyId],
  );
  // Flagged and not yet settled (a flagged payment refunded in full is settled).
  const flagged = await db.manager.find(Payment, { where: { companyId, status: "mismatch" }, order: { paidAt: "DESC" }, take: 20 });
  return {
    receivedThisMonth: { count: Number(received?.n ?? 0), amountMinor: Number(received?.amount ?? 0), refundedMinor: Number(received?.refunded ?? 0) },
    outstanding: { count: Number(outstanding?.n ?? 0), amountMinor: Number(outstanding?.amount ?? 0) },
    flagged: await presentPayments(db.manager, flagged),
  };
}

/** The receipt PDF of the deposit paid through a client link. */
export async function publicReceipt(db: DataSource, token: string): Promise<{ payment: Payment; pdf: Buffer }> {
  const quote = await quoteForToken(db.manager, token);
  const payment = await db.manager.findOne(Payment, { where: { quoteId: quote.id, mismatchReason: IsNull() }, order: { paidAt: "ASC" } });
  if (!payment) throw new AppError("not_found", "No deposit has been received for this quote yet");
  return { payment, pdf: await receiptPdf(db.manager, payment) };
}
