import { Link } from "react-router-dom";
import { formatMoney } from "../../../../shared/money";
import { LoadFailed } from "../../../components/ui/load-failed";
import { paths } from "../../../config/paths";
import { formatDay } from "../../quotes/lib/format";
import { useJobPayments } from "../api/get-job-payments";
import { paymentReceiptHref } from "../lib/format";
import { PaymentStatusBadge } from "./payment-status";

/** The money received on the job's quotes: which quote, how much, in what state, when, and its receipt. */
export function JobPaymentsSection({ jobId }: { jobId: string }) {
  const { data, error, isPending, isFetching, refetch } = useJobPayments(jobId);
  return (
    <section aria-labelledby="job-payments-heading" className="space-y-3">
      <div>
        <h2 id="job-payments-heading" className="text-base font-semibold text-ink-900">
          Payments
        </h2>
        <p className="mt-1 text-sm text-ink-500">Deposits the client paid from their quote page, with their receipts and refunds.</p>
      </div>
      {isPending ? (
        <p className="text-sm text-ink-500">Loading the payments…</p>
      ) : error ? (
        <LoadFailed message={`The payments could not be loaded. ${error.message}`} retrying={isFetching} onRetry={() => void refetch()} />
      ) : data.items.length === 0 ? (
        <p className="rounded-lg border border-dashed border-ink-200 bg-white px-4 py-6 text-center text-sm text-ink-500">
          No payments yet. Once a quote is accepted, the client can pay its deposit from their quote page; it is listed here with its receipt.
        </p>
      ) : (
        <div className="overflow-x-auto rounded-lg border border-ink-100 bg-white">
          <table className="w-full min-w-[36rem] text-sm">
            <caption className="sr-only">Payments of this job, with their receipts</caption>
            <thead className="border-b border-ink-100 bg-ink-50 text-left text-xs font-medium uppercase tracking-wide text-ink-500">
              <tr>
                <th scope="col" className="px-3 py-2">
                  Quote
                </th>
                <th scope="col" className="px-3 py-2">
                  Status
                </th>
                <th scope="col" className="px-3 py-2 text-right">
                  Amount
                </th>
                <th scope="col" className="px-3 py-2">
                  Paid
                </th>
                <th scope="col" className="px-3 py-2">
                  Receipt
                </th>
              </tr>
            </thead>
            <tbody>
              {data.items.map((payment) => (
                <tr key={payment.id} className="border-t border-ink-50 align-top">
                  <td className="px-3 py-2">
                    <Link to={paths.quote.getHref(payment.jobId, payment.quoteId)} className="font-medium text-ink-900 underline-offset-2 hover:text-copper-700 hover:underline">
                      {payment.quoteLabel}
                    </Link>
                  </td>
                  <td className="px-3 py-2">
                    <PaymentStatusBadge status={payment.status} />
                    {payment.status === "mismatch" && payment.mismatchReason ? <span className="mt-0.5 block text-xs text-over-700">{payment.mismatchReason}</span> : null}
                  </td>
                  <td className="whitespace-nowrap px-3 py-2 text-right tabular-nums">
                    {formatMoney(payment.amountMinor, payment.currency)}
                    {payment.refundedMinor > 0 ? <span className="block text-xs text-ink-500">{formatMoney(payment.refundedMinor, payment.currency)} refunded</span> : null}
                  </td>
                  <td className="whitespace-nowrap px-3 py-2 text-ink-700">
                    <time dateTime={payment.paidAt}>{formatDay(payment.paidAt)}</time>
                  </td>
                  <td className="px-3 py-2">
                    <a
                      href={paymentReceiptHref(payment.id)}
                      target="_blank"
                      rel="noopener"
                      aria-label={`Receipt ${payment.receiptNumber} (PDF)`}
                      className="font-medium text-copper-700 underline decoration-copper-300 underline-offset-2 hover:text-copper-800"
                    >
                      {payment.receiptNumber}
                    </a>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </section>
  );
}
