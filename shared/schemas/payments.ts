// The API contract of deposits: payments taken through Stripe Checkout, their refunds, and what
// the client's page shows. Money is integer minor units, as everywhere (shared/money.ts).
import { z } from "zod";
import { MAX_MONEY_MINOR } from "../money.js";

/**
 * paid: the amount and currency match the deposit due and the quote was accepted.
 * mismatch: money arrived that does not match what was due (amount, currency, or a quote that was
 * no longer waiting for its deposit) — recorded, flagged for the Owner, never counted as the deposit.
 */
export const PAYMENT_STATUSES = ["paid", "mismatch", "partially refunded", "refunded"] as const;
export const PaymentStatus = z.enum(PAYMENT_STATUSES);
export type PaymentStatus = z.infer<typeof PaymentStatus>;

export const REFUND_REASONS = ["requested_by_customer", "duplicate", "fraudulent"] as const;
export const RefundReason = z.enum(REFUND_REASONS, { error: `reason must be one of ${REFUND_REASONS.join(", ")}` });
export const REFUND_REASON_LABELS: Record<z.infer<typeof RefundReason>, string> = {
  requested_by_customer: "Requested by the client",
  duplicate: "Paid twice",
  fraudulent: "Suspected fraud",
};

export const RefundSchema = z.object({
  id: z.string(),
  amountMinor: z.number().int(),
  currency: z.string(),
  reason: z.string().nullable(),
  status: z.string(),
  createdAt: z.string(),
  /** The member who asked for it; null when Stripe reported a refund made elsewhere. */
  createdBy: z.string().nullable(),
});

export const PaymentSchema = z.object({
  id: z.string(),
  quoteId: z.string(),
  jobId: z.string(),
  /** "Q-2026-0042 R2" */
  quoteLabel: z.string(),
  receiptNumber: z.string(),
  status: PaymentStatus,
  mismatchReason: z.string().nullable(),
  amountMinor: z.number().int(),
  currency: z.string(),
  expectedAmountMinor: z.number().int(),
  expectedCurrency: z.string(),
  refundedMinor: z.number().int(),
  paidAt: z.string(),
  payerName: z.string().nullable(),
  payerEmail: z.string().nullable(),
  receiptSentAt: z.string().nullable(),
  receiptError: z.string().nullable(),
  stripePaymentIntentId: z.string().nullable(),
  refunds: z.array(RefundSchema),
});
export type Payment = z.infer<typeof PaymentSchema>;
export const PaymentListSchema = z.object({ items: z.array(PaymentSchema) });

export const RefundInput = z.strictObject({
  /** Omitted: everything not yet refunded. */
  amountMinor: z
    .number({ error: "amountMinor must be a whole number of cents" })
    .int("amountMinor must be a whole number of cents")
    .positive("amountMinor must be more than zero")
    .max(MAX_MONEY_MINOR, "amountMinor is too large")
    .optional(),
  reason: RefundReason.optional(),
  /** Made once per Refund dialog: a second press or a retried request refunds once. */
  requestId: z.uuid("requestId must be a uuid").optional(),
});

/** The deposit as the client's page shows it. */
export const PublicDepositSchema = z.object({
  /** none: no deposit is due; due: waiting for it; paid; review: money arrived that the contractor must check; refunded. */
  state: z.enum(["none", "due", "paid", "review", "refunded"]),
  dueMinor: z.number().int(),
  currency: z.string(),
  /** Whether "Pay deposit" can take the payment online (Stripe is set up). */
  online: z.boolean(),
  paidMinor: z.number().int().nullable(),
  paidAt: z.string().nullable(),
  receiptNumber: z.string().nullable(),
});
export type PublicDeposit = z.infer<typeof PublicDepositSchema>;

export const DepositCheckoutSchema = z.object({ url: z.string() });

export const DepositTotalsSchema = z.object({
  receivedThisMonth: z.object({ count: z.number().int(), amountMinor: z.number().int(), refundedMinor: z.number().int() }),
  outstanding: z.object({ count: z.number().int(), amountMinor: z.number().int() }),
  /** Payments that need the Owner's attention (status mismatch). */
  flagged: z.array(PaymentSchema),
});
export type DepositTotals = z.infer<typeof DepositTotalsSchema>;
