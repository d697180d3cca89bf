import { cardOutcome, type CardOutcome } from "./cards.js";
import { invalidParam, resourceMissing, StripeFakeError } from "./errors.js";
import type { EventHub } from "./events.js";
import {
  currencyCode,
  httpUrl,
  optionalEmail,
  optionalPositiveInteger,
  optionalString,
  readList,
  readMetadata,
  rejectUnknown,
  requiredPositiveInteger,
  requiredString,
  type Params,
} from "./params.js";
import {
  nowSeconds,
  randomId,
  type Account,
  type Charge,
  type CheckoutSession,
  type LineItem,
  type PaymentIntent,
  type Refund,
  type RefundReason,
  type SessionRecord,
  type Store,
} from "./store.js";

// What the API and the payment page do. Every function here is synchronous: an idempotent request checks its
// key, runs, and stores its answer without yielding, so two requests with one key cannot both create an object.

export interface FakeContext {
  store: Store;
  hub: EventHub;
  /** e.g. http://127.0.0.1:4242 (no trailing slash); known once the server listens. */
  baseUrl(): string;
}

const SESSION_LIFETIME_S = 24 * 60 * 60;
const MIN_SESSION_LIFETIME_S = 30 * 60;
/** expires_at computed by the app a moment before the request still counts as 30 minutes ahead (seconds). */
const CLOCK_SLACK_S = 60;

/** Parameters the real API takes that this stand-in accepts and ignores, so the app may send them. */
const IGNORED_SESSION_PARAMS = [
  "expand",
  "payment_method_types",
  "locale",
  "submit_type",
  "billing_address_collection",
  "allow_promotion_codes",
  "customer_creation",
];
const SESSION_PARAMS = new Set([
  "mode",
  "success_url",
  "cancel_url",
  "line_items",
  "client_reference_id",
  "metadata",
  "customer_email",
  "payment_intent_data",
  "expires_at",
  ...IGNORED_SESSION_PARAMS,
]);
const REFUND_PARAMS = new Set(["payment_intent", "amount", "reason", "metadata", "expand"]);
const REFUND_REASONS: readonly RefundReason[] = ["duplicate", "fraudulent", "requested_by_customer"];

export function createCheckoutSession(ctx: FakeContext, account: Account, params: Params): CheckoutSession {
  rejectUnknown(params, SESSION_PARAMS);
  const mode = requiredString(params.mode, "mode");
  if (mode !== "payment") throw invalidParam("mode", "mode must be payment: this stand-in takes one-off payments only.");
  const successUrl = httpUrl(params.success_url, "success_url");
  const cancelUrl = httpUrl(params.cancel_url, "cancel_url");
  const lineItems = readLineItems(params.line_items);
  const clientReferenceId = optionalString(params.client_reference_id, "client_reference_id", 200);
  const metadata = readMetadata(params.metadata, "metadata");
  const customerEmail = optionalEmail(params.customer_email, "customer_email");
  const paymentIntentMetadata = readPaymentIntentMetadata(params.payment_intent_data);
  const created = nowSeconds();
  const expiresAt = readExpiresAt(params.expires_at, created);

  let total = 0;
  for (const item of lineItems) total += item.unitAmount * item.quantity;
  if (!Number.isSafeInteger(total)) throw invalidParam("line_items", "The total of line_items is too large.");

  const id = randomId("cs_test_");
  const session: CheckoutSession = {
    id,
    object: "checkout.session",
    amount_subtotal: total,
    amount_total: total,
    currency: lineItems[0].currency,
    mode: "payment",
    status: "open",
    payment_status: "unpaid",
    payment_intent: null,
    client_reference_id: clientReferenceId || null,
    metadata,
    customer_email: customerEmail ?? null,
    customer_details: null,
    success_url: successUrl,
    cancel_url: cancelUrl,
    url: `${ctx.baseUrl()}/pay/${id}`,
    created,
    expires_at: expiresAt,
    livemode: false,
  };
  ctx.store.addSession(account, { session, lineItems, paymentIntentMetadata });
  return session;
}

function readLineItems(value: unknown): LineItem[] {
  if (value === undefined || value === "") throw invalidParam("line_items", "line_items is required: give at least one item.");
  const list = readList(value, "line_items");
  if (list.length === 0) throw invalidParam("line_items", "line_items is required: give at least one item.");
  const items: LineItem[] = [];
  for (const { index, item } of list) {
    const param = `line_items[${index}]`;
    if (item === null || typeof item !== "object" || Array.isArray(item)) throw invalidParam(param, `${param} must be an object.`);
    const fields = item as Params;
    if (fields.price !== undefined) {
      throw invalidParam(`${param}[price]`, `${param}[price] is not supported by this stand-in; give ${param}[price_data].`);
    }
    const priceData = fields.price_data;
    if (priceData === undefined) throw invalidParam(`${param}[price_data]`, `${param}[price_data] is required.`);
    if (priceData === null || typeof priceData !== "object" || Array.isArray(priceData)) {
      throw invalidParam(`${param}[price_data]`, `${param}[price_data] must be an object.`);
    }
    const price = priceData as Params;
    const currency = currencyCode(price.currency, `${param}[price_data][currency]`);
    const unitAmount = requiredPositiveInteger(price.unit_amount, `${param}[price_data][unit_amount]`);
    const productData = price.product_data;
    const productParam = `${param}[price_data][product_data]`;
    if (productData === undefined || productData === null || typeof productData !== "object" || Array.isArray(productData)) {
      throw invalidParam(`${productParam}[name]`, `${productParam}[name] is required.`);
    }
    const name = requiredString((productData as Params).name, `${productParam}[name]`, 250);
    if (name.trim() === "") throw invalidParam(`${productParam}[name]`, `${productParam}[name] is required.`);
    const quantity = requiredPositiveInteger(fields.quantity, `${param}[quantity]`);
    if (items.length > 0 && currency !== items[0].currency) {
      throw invalidParam(`${param}[price_data][currency]`, "Every line item must use the same currency.");
    }
    items.push({ name, unitAmount, quantity, currency });
  }
  return items;
}

function readPaymentIntentMetadata(value: unknown) {
  if (value === undefined || value === "") return {};
  if (value === null || typeof value !== "object" || Array.isArray(value)) {
    throw invalidParam("payment_intent_data", "payment_intent_data must be an object.");
  }
  return readMetadata((value as Params).metadata, "payment_intent_data[metadata]");
}

function readExpiresAt(value: unknown, created: number): number {
  if (value === undefined || value === "") return created + SESSION_LIFETIME_S;
  const expiresAt = optionalPositiveInteger(value, "expires_at") as number;
  if (expiresAt < created + MIN_SESSION_LIFETIME_S - CLOCK_SLACK_S || expiresAt > created + SESSION_LIFETIME_S) {
    throw invalidParam("expires_at", "expires_at must be between 30 minutes and 24 hours from now (unix seconds).");
  }
  return expiresAt;
}

/** The session of this account; an open one past its expires_at expires now (with its event). */
export function getSessionRecord(ctx: FakeContext, account: Account, id: string): SessionRecord {
  const record = account.sessions.get(id);
  if (!record) throw resourceMissing("checkout.session", id);
  expireIfDue(ctx, account, record);
  return record;
}

export function expireIfDue(ctx: FakeContext, account: Account, record: SessionRecord): void {
  if (record.session.status === "open" && nowSeconds() >= record.session.expires_at) markExpired(ctx, account, record);
}

export function expireCheckoutSession(ctx: FakeContext, account: Account, id: string, params: Params): CheckoutSession {
  rejectUnknown(params, new Set(["expand"]));
  const record = getSessionRecord(ctx, account, id);
  if (record.session.status !== "open") {
    throw new StripeFakeError(
      400,
      "invalid_request_error",
      `Only an open Checkout Session can be expired; ${id} is ${record.session.status}.`,
      undefined,
      "checkout_session_not_open",
    );
  }
  markExpired(ctx, account, record);
  return record.session;
}

function markExpired(ctx: FakeContext, account: Account, record: SessionRecord): void {
  record.session.status = "expired";
  record.session.url = null;
  ctx.hub.emit(account, "checkout.session.expired", record.session);
}

export interface PayInput {
  card: string;
  /** Charge this instead of the session's amount_total (minor units); for testing the app's mismatch checks. */
  amountTotal?: number;
  currency?: string;
  email?: string | null;
  name?: string | null;
}

export interface PayResult {
  outcome: CardOutcome;
  session: CheckoutSession;
}

/**
 * Pays an open session with a test card. Declines and processing errors change nothing; success creates the
 * PaymentIntent and charge, completes the session and emits checkout.session.completed.
 */
export function paySession(ctx: FakeContext, account: Account, record: SessionRecord, input: PayInput): PayResult {
  const outcome = cardOutcome(input.card);
  if (outcome === undefined) throw invalidParam("card", "card must be one of the test card numbers.", "invalid_number");
  expireIfDue(ctx, account, record);
  const { session } = record;
  if (session.status !== "open") {
    throw new StripeFakeError(400, "invalid_request_error", `Checkout Session ${session.id} is ${session.status}, not open.`, undefined, "checkout_session_not_open");
  }
  if (outcome !== "succeeded") return { outcome, session };

  const amount = input.amountTotal ?? session.amount_total;
  const currency = input.currency ?? session.currency;
  const created = nowSeconds();
  const paymentIntentId = randomId("pi_");
  const chargeId = randomId("ch_");
  const paymentIntent: PaymentIntent = {
    id: paymentIntentId,
    object: "payment_intent",
    amount,
    amount_received: amount,
    currency,
    status: "succeeded",
    latest_charge: chargeId,
    metadata: { ...record.paymentIntentMetadata },
    created,
    livemode: false,
  };
  const charge: Charge = {
    id: chargeId,
    object: "charge",
    amount,
    amount_refunded: 0,
    refunded: false,
    currency,
    payment_intent: paymentIntentId,
    paid: true,
    status: "succeeded",
    created,
  };
  account.paymentIntents.set(paymentIntentId, paymentIntent);
  account.charges.set(chargeId, charge);
  account.chargeRefunds.set(chargeId, []);

  session.amount_total = amount;
  session.currency = currency;
  session.status = "complete";
  session.payment_status = "paid";
  session.payment_intent = paymentIntentId;
  session.customer_details = { email: input.email ?? session.customer_email, name: input.name ?? null };
  session.url = null;
  ctx.hub.emit(account, "checkout.session.completed", session);
  return { outcome, session };
}

export function getPaymentIntent(account: Account, id: string): PaymentIntent {
  const paymentIntent = account.paymentIntents.get(id);
  if (!paymentIntent) throw resourceMissing("payment_intent", id);
  return paymentIntent;
}

export function getRefund(account: Account, id: string): Refund {
  const refund = account.refunds.get(id);
  if (!refund) throw resourceMissing("refund", id);
  return refund;
}

/** The charge with its refunds, newest first, as a list object. */
export function presentCharge(account: Account, id: string) {
  const charge = account.charges.get(id);
  if (!charge) throw resourceMissing("charge", id);
  const refunds = (account.chargeRefunds.get(id) ?? [])
    .map((refundId) => account.refunds.get(refundId) as Refund)
    .reverse();
  return {
    ...charge,
    refunds: { object: "list" as const, data: refunds, has_more: false, total_count: refunds.length, url: `/v1/charges/${id}/refunds` },
  };
}

export function createRefund(ctx: FakeContext, account: Account, params: Params): Refund {
  rejectUnknown(params, REFUND_PARAMS);
  const paymentIntentId = requiredString(params.payment_intent, "payment_intent");
  const paymentIntent = account.paymentIntents.get(paymentIntentId);
  if (!paymentIntent) {
    throw new StripeFakeError(400, "invalid_request_error", `No such payment_intent: '${paymentIntentId}'`, "payment_intent", "resource_missing");
  }
  const charge = account.charges.get(paymentIntent.latest_charge) as Charge;
  const left = charge.amount - charge.amount_refunded;
  const requested = optionalPositiveInteger(params.amount, "amount");
  const reason = optionalString(params.reason, "reason");
  if (reason !== undefined && reason !== "" && !REFUND_REASONS.includes(reason as RefundReason)) {
    throw invalidParam("reason", `reason must be one of: ${REFUND_REASONS.join(", ")}.`);
  }
  const metadata = readMetadata(params.metadata, "metadata");
  if (left === 0) {
    throw new StripeFakeError(400, "invalid_request_error", `Charge ${charge.id} has already been refunded in full.`, undefined, "charge_already_refunded");
  }
  const amount = requested ?? left;
  if (amount > left) {
    throw new StripeFakeError(
      400,
      "invalid_request_error",
      `Refund amount (${amount}) is more than what is left to refund on ${charge.id} (${left}).`,
      "amount",
      "amount_too_large",
    );
  }

  const refund: Refund = {
    id: randomId("re_"),
    object: "refund",
    amount,
    currency: charge.currency,
    payment_intent: paymentIntent.id,
    charge: charge.id,
    status: "succeeded",
    reason: reason ? (reason as RefundReason) : null,
    metadata,
    created: nowSeconds(),
  };
  account.refunds.set(refund.id, refund);
  account.chargeRefunds.get(charge.id)?.push(refund.id);
  charge.amount_refunded += amount;
  charge.refunded = charge.amount_refunded === charge.amount;
  ctx.hub.emit(account, "refund.created", refund);
  ctx.hub.emit(account, "charge.refunded", presentCharge(account, charge.id));
  return refund;
}
