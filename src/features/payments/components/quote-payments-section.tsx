import { useState } from "react";
import { formatMoney } from "../../../../shared/money";
import type { QuoteDetail } from "../../../../shared/schemas/estimates";
import type { Payment } from "../../../../shared/schemas/payments";
import { FormStatus, secondaryButtonClass } from "../../../components/ui/form";
import { formatWhen } from "../../quotes/lib/format";
import { leftToRefund, paymentReceiptHref, refundReasonLabel } from "../lib/format";
import { PaymentStatusBadge } from "./payment-status";
import { RefundDialog } from "./refund-dialog";

/** "Ana Ruiz (ana@example.net)", either alone, or null when Stripe gave neither. */
function payerText(payment: Payment): string | null {
  if (payment.payerName && payment.payerEmail) return `${payment.payerName} (${payment.payerEmail})`;
  return payment.payerName ?? payment.payerEmail;
}

function PaymentItem({ payment, canRefund, onRefund }: { payment: Payment; canRefund: boolean; onRefund: () => void }) {
  const money = (minor: number, currency = payment.currency) => formatMoney(minor, currency);
  const payer = payerText(payment);
  const left = leftToRefund(payment);
  // A payment Stripe never gave an id for cannot be refunded from here (the server answers 409).
  const refundable = canRefund && left > 0 && payment.stripePaymentIntentId !== null;
  return (
    <li aria-label={`Receipt ${payment.receiptNumber}`} className="space-y-2 rounded-lg border border-ink-100 bg-white p-4 text-sm">
      <div className="flex flex-wrap items-start justify-between gap-x-4 gap-y-1">
        <div className="min-w-0 space-y-0.5">
          <p className="flex flex-wrap items-center gap-2">
            <span className="font-semibold text-ink-900">Receipt {payment.receiptNumber}</span>
            <PaymentStatusBadge status={payment.status} />
          </p>
          <p className="text-xs text-ink-500">
            Paid <time dateTime={payment.paidAt}>{formatWhen(payment.paidAt)}</time>
            {payer ? <span className="break-all"> by {payer}</span> : null}
          </p>
        </div>
        <p className="text-base font-semibold tabular-nums text-ink-900">{money(payment.amountMinor)}</p>
      </div>

      {payment.status === "mismatch" ? (
        <p className="flex gap-1.5 rounded-md border border-over-100 bg-over-50 px-3 py-2 text-over-700">
          <span aria-hidden="true" className="font-bold">
            !
          </span>
          <span>
            {payment.mismatchReason ?? "This payment does not match the deposit that was due."} Expected{" "}
            <span className="tabular-nums">{money(payment.expectedAmountMinor, payment.expectedCurrency)}</span>. It is not counted as the deposit.
          </span>
        </p>
      ) : null}

      {payment.refunds.length > 0 ? (
        <div>
          <p className="text-ink-700">
            Refunded <span className="tabular-nums">{money(payment.refundedMinor)}</span> of <span className="tabular-nums">{money(payment.amountMinor)}</span>
          </p>
          <ul aria-label={`Refunds of ${payment.receiptNumber}`} className="mt-1 space-y-0.5 border-l-2 border-ink-100 pl-3 text-xs text-ink-600">
            {payment.refunds.map((refund) => {
              const reason = refundReasonLabel(refund.reason);
              return (
                <li key={refund.id}>
                  <span className="font-medium tabular-nums text-ink-800">{formatMoney(refund.amountMinor, refund.currency)}</span> on{" "}
                  <time dateTime={refund.createdAt}>{formatWhen(refund.createdAt)}</time>
                  {refund.createdBy ? ` by ${refund.createdBy}` : " (made in Stripe)"}
                  {reason ? ` · ${reason}` : ""}
                  {refund.status !== "succeeded" ? ` · ${refund.status}` : ""}
                </li>
              );
            })}
          </ul>
        </div>
      ) : null}

      <p className="text-xs">
        {payment.receiptSentAt ? (
          <span className="text-ink-600">Receipt e-mailed to the client {formatWhen(payment.receiptSentAt)}.</span>
        ) : payment.receiptError ? (
          <span className="font-medium text-over-700">The receipt e-mail failed: {payment.receiptError}</span>
        ) : (
          <span className="text-ink-500">The receipt has not been e-mailed yet.</span>
        )}
      </p>

      <div className="flex flex-wrap gap-2">
        <a href={paymentReceiptHref(payment.id)} target="_blank" rel="noopener" className={secondaryButtonClass}>
          Receipt PDF
        </a>
        {refundable ? (
          <button type="button" onClick={onRefund} className={secondaryButtonClass}>
            Refund
          </button>
        ) : null}
      </div>
    </li>
  );
}

/** The money received for a quote: each payment with its receipt, refunds and, for the Owner, a Refund button. */
export function QuotePaymentsSection({ quote, canRefund }: { quote: QuoteDetail; canRefund: boolean }) {
  const [refunding, setRefunding] = useState<Payment | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const payments = quote.payments;
  return (
    <section aria-labelledby="payments-heading" className="space-y-2">
      <h2 id="payments-heading" className="text-base font-semibold text-ink-900">
        Payments
      </h2>
      <FormStatus message={notice} />
      {payments.length === 0 ? (
        <p className="text-sm text-ink-500">
          No payments yet.
          {quote.status === "accepted" ? " The client can pay the deposit from their quote page." : ""}
        </p>
      ) : (
        <ul aria-label="Payments" className="space-y-3">
          {payments.map((payment) => (
            <PaymentItem
              key={payment.id}
              payment={payment}
              canRefund={canRefund}
              onRefund={() => {
                setNotice(null);
                setRefunding(payment);
              }}
            />
          ))}
        </ul>
      )}
      {refunding ? (
        <RefundDialog
          payment={refunding}
          onClose={() => setRefunding(null)}
          onRefunded={(amountMinor) => {
            setNotice(`${formatMoney(amountMinor, refunding.currency)} refunded to the client on ${refunding.receiptNumber}.`);
            setRefunding(null);
          }}
        />
      ) : null}
    </section>
  );
}
