// How payments are written on the quote screen, the job page and the dashboard.
import { REFUND_REASON_LABELS, type Payment, type PaymentStatus } from "../../../../shared/schemas/payments";

export const PAYMENT_STATUS_LABELS: Record<PaymentStatus, string> = {
  paid: "Paid",
  mismatch: "Check this payment",
  "partially refunded": "Partly refunded",
  refunded: "Refunded",
};

/** A refund's reason in words; Stripe may report one we do not offer, shown as it came. */
export function refundReasonLabel(reason: string | null): string | null {
  if (!reason) return null;
  return reason in REFUND_REASON_LABELS ? REFUND_REASON_LABELS[reason as keyof typeof REFUND_REASON_LABELS] : reason.replace(/_/g, " ");
}

/** What can still be sent back, in the payment's own currency's minor units. */
export const leftToRefund = (payment: Pick<Payment, "amountMinor" | "refundedMinor">) => Math.max(0, payment.amountMinor - payment.refundedMinor);

/** The staff's receipt PDF (session, not the client's token). */
export const paymentReceiptHref = (paymentId: string, download = false) => `/api/payments/${encodeURIComponent(paymentId)}/receipt.pdf${download ? "?download=1" : ""}`;
