import { Link } from "react-router-dom";
import { formatMoney } from "../../../../shared/money";
import { secondaryButtonClass } from "../../../components/ui/form";
import { LoadFailed } from "../../../components/ui/load-failed";
import { paths } from "../../../config/paths";
import { useJobQuotes } from "../api/get-job-quotes";
import { cutListHref, formatDay, isAcceptedStatus } from "../lib/format";
import { QuoteStatusBadge, SupersededBadge } from "./quote-status";

/** The job's quotes, newest first, with the way to its estimate and, once a quote is accepted, the installer's cut list. */
export function JobQuotesSection({ jobId }: { jobId: string }) {
  const { data, error, isPending, isFetching, refetch } = useJobQuotes(jobId);
  const accepted = data?.items.some((q) => isAcceptedStatus(q.status)) ?? false;
  return (
    <section aria-labelledby="quotes-heading" className="space-y-3">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h2 id="quotes-heading" className="text-base font-semibold text-ink-900">
            Quotes
          </h2>
          <p className="mt-1 text-sm text-ink-500">Each quote is a frozen revision (R1, R2, …) of the estimate, with the client's answer.</p>
        </div>
        <div className="flex flex-wrap gap-2">
          <Link to={paths.estimate.getHref(jobId)} className={secondaryButtonClass}>
            Estimate
          </Link>
          {accepted ? (
            <a href={cutListHref(jobId)} target="_blank" rel="noopener" className={secondaryButtonClass}>
              Cut list PDF
            </a>
          ) : null}
        </div>
      </div>
      {isPending ? (
        <p className="text-sm text-ink-500">Loading the quotes…</p>
      ) : error ? (
        <LoadFailed message={`The quotes could not be loaded. ${error.message}`} retrying={isFetching} onRetry={() => void refetch()} />
      ) : data.items.length === 0 ? (
        <p className="rounded-lg border border-dashed border-ink-200 bg-white px-4 py-6 text-center text-sm text-ink-500">
          No quotes yet. Build the estimate from this job's systems, then create a quote from it; every quote you send is kept here with the client's answer.
        </p>
      ) : (
        <div className="overflow-x-auto rounded-lg border border-ink-100 bg-white">
          <table className="w-full min-w-[36rem] text-sm">
            <caption className="sr-only">Quotes of this job, newest first</caption>
            <thead className="border-b border-ink-100 bg-ink-50 text-left text-xs font-medium uppercase tracking-wide text-ink-500">
              <tr>
                <th scope="col" className="px-3 py-2">
                  Quote
                </th>
                <th scope="col" className="px-3 py-2">
                  Status
                </th>
                <th scope="col" className="px-3 py-2 text-right">
                  Total
                </th>
                <th scope="col" className="px-3 py-2">
                  Sent
                </th>
              </tr>
            </thead>
            <tbody>
              {data.items.map((quote) => (
                <tr key={quote.id} className="border-t border-ink-50">
                  <td className="px-3 py-2">
                    <Link to={paths.quote.getHref(jobId, quote.id)} className="font-medium text-ink-900 underline-offset-2 hover:text-copper-700 hover:underline">
                      {quote.label}
                    </Link>
                  </td>
                  <td className="px-3 py-2">
                    <span className="inline-flex flex-wrap gap-1">
                      <QuoteStatusBadge status={quote.status} />
                      {quote.superseded ? <SupersededBadge /> : null}
                    </span>
                  </td>
                  <td className="whitespace-nowrap px-3 py-2 text-right tabular-nums">{formatMoney(quote.totalMinor, quote.currency)}</td>
                  <td className="px-3 py-2 text-ink-700">
                    {quote.sentAt ? (
                      <>
                        {formatDay(quote.sentAt)}
                        {quote.sentTo ? <span className="block text-xs text-ink-500">{quote.sentTo}</span> : null}
                      </>
                    ) : quote.sendPendingSince ? (
                      <span className="font-medium text-copper-800">Send pending: retrying</span>
                    ) : quote.sendError ? (
                      <span className="font-medium text-over-700">Not sent: the e-mail failed</span>
                    ) : (
                      <span className="text-ink-500">Not sent</span>
                    )}
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
