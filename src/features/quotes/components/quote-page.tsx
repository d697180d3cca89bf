import { useState } from "react";
import { Link } from "react-router-dom";
import type { QuoteDetail } from "../../../../shared/schemas/estimates";
import { formatMoney } from "../../../../shared/money";
import { CautionsPanel } from "../../../components/ui/cautions-panel";
import { ConfirmDialog } from "../../../components/ui/confirm-dialog";
import { EmptyState } from "../../../components/ui/empty-state";
import { dangerButtonClass, FormAlert, FormStatus, primaryButtonClass, secondaryButtonClass } from "../../../components/ui/form";
import { LoadFailed } from "../../../components/ui/load-failed";
import { paths } from "../../../config/paths";
import { ApiError } from "../../../lib/api-client";
import { QuotePaymentsSection } from "../../payments/components/quote-payments-section";
import { useCreateClientLink, useStopClientLink } from "../api/client-link";
import { useQuote } from "../api/get-quote";
import { cutListHref, formatDay, formatWhen, isAcceptedStatus, quotePdfHref } from "../lib/format";
import { ClientLinkDialog } from "./client-link-dialog";
import { DropSummary } from "./drop-summary";
import { QuoteEvents } from "./quote-events";
import { QuoteLines, QuoteTotals } from "./quote-lines";
import { QuoteStatusBadge, SendPendingBadge, SupersededBadge } from "./quote-status";
import { SendQuoteDialog } from "./send-quote-dialog";

const term = "text-xs font-medium uppercase tracking-wide text-ink-500";

function Detail({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div>
      <dt className={term}>{label}</dt>
      <dd className="mt-0.5 text-ink-900">{children}</dd>
    </div>
  );
}

/** "Accepted by … on …": the record the client left when accepting. */
function AcceptanceRecord({ quote }: { quote: QuoteDetail }) {
  return (
    <section aria-labelledby="acceptance-heading" className="space-y-3 rounded-lg border border-copper-200 bg-copper-50 p-4 text-sm">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id="acceptance-heading" className="text-base font-semibold text-ink-900">
          Acceptance
        </h2>
        <a href={cutListHref(quote.jobId)} target="_blank" rel="noopener" className={secondaryButtonClass}>
          Cut list PDF
        </a>
      </div>
      <dl className="grid gap-x-6 gap-y-2 sm:grid-cols-2">
        <Detail label="Accepted by">{quote.acceptedName ?? "—"}</Detail>
        <Detail label="When">{quote.acceptedAt ? formatWhen(quote.acceptedAt) : "—"}</Detail>
        <Detail label="IP address">
          <span className="font-mono text-xs">{quote.acceptedIp ?? "Not recorded"}</span>
        </Detail>
        <Detail label="Browser">
          <span className="break-all text-xs">{quote.acceptedUserAgent ?? "Not recorded"}</span>
        </Detail>
      </dl>
    </section>
  );
}

function QuoteView({ quote, canWrite, canRefund }: { quote: QuoteDetail; canWrite: boolean; canRefund: boolean }) {
  const { snapshot } = quote;
  const currency = quote.currency;
  const [sending, setSending] = useState(false);
  const [stopping, setStopping] = useState(false);
  const [linkUrl, setLinkUrl] = useState<string | null>(null);
  const [alert, setAlert] = useState<string | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const newLink = useCreateClientLink();
  const stopLink = useStopClientLink();

  const canSend = canWrite && quote.status === "draft" && !quote.superseded;
  const canLink = canWrite && !quote.superseded && quote.status !== "draft" && quote.status !== "expired";
  const accepted = isAcceptedStatus(quote.status);

  const makeLink = () => {
    setAlert(null);
    setNotice(null);
    newLink.mutate(quote.id, { onSuccess: ({ url }) => setLinkUrl(url), onError: (error) => setAlert(`No new link was made. ${error.message}`) });
  };
  const confirmStop = () =>
    stopLink.mutate(quote.id, {
      onSuccess: () => {
        setStopping(false);
        setNotice("The client link no longer works.");
      },
      onError: (error) => {
        setStopping(false);
        setAlert(`The link still works. ${error.message}`);
      },
    });

  return (
    <div className="space-y-6">
      <div className="space-y-4 border-b border-ink-100 pb-5">
        <Link to={paths.job.getHref(quote.jobId)} className="text-sm text-ink-500 hover:text-ink-900">
          <span aria-hidden="true">←</span> {snapshot.job.title}
        </Link>
        <header className="flex flex-wrap items-start justify-between gap-4">
          <div className="min-w-0 space-y-1">
            <div className="flex flex-wrap items-center gap-2">
              <h1 className="text-xl font-semibold tracking-tight text-ink-900">{quote.label}</h1>
              <QuoteStatusBadge status={quote.status} />
              {quote.sendPendingSince ? <SendPendingBadge /> : null}
              {quote.superseded ? <SupersededBadge /> : null}
            </div>
            <p className="text-sm text-ink-600">
              {snapshot.job.title} for {snapshot.client.name}
            </p>
          </div>
          <div className="flex flex-wrap gap-2">
            <a href={quotePdfHref(quote.id)} target="_blank" rel="noopener" className={secondaryButtonClass}>
              Open PDF
            </a>
            <a href={quotePdfHref(quote.id, true)} download className={secondaryButtonClass}>
              Download PDF
            </a>
            {canSend ? (
              <button type="button" onClick={() => setSending(true)} className={primaryButtonClass}>
                Send to client
              </button>
            ) : null}
          </div>
        </header>
        {quote.sendPendingSince ? (
          <div role="status" className="rounded-md border border-copper-300 bg-copper-50 px-3 py-2 text-sm text-copper-900">
            <p className="font-medium">Send pending since {formatWhen(quote.sendPendingSince)}</p>
            <p>
              The mail server has not taken the e-mail yet{quote.sendError ? ` (${quote.sendError.replace(/^The e-mail could not be sent yet(?: \(attempt \d+\))?: /, "")})` : ""}. Runwright keeps trying, waiting longer
              each time, and marks the quote sent once it goes. Send to client tries again now.
            </p>
          </div>
        ) : quote.sendError ? (
          <FormAlert message={`The last attempt to send this quote failed: ${quote.sendError}`} />
        ) : null}
        {quote.superseded ? <p className="text-sm text-ink-600">A later revision of this quote exists; the client's link to this one no longer opens it.</p> : null}
        <dl className="grid gap-x-6 gap-y-3 text-sm sm:grid-cols-2 lg:grid-cols-4">
          <Detail label="Client">
            {snapshot.client.name}
            {snapshot.client.email ? <span className="block text-xs text-ink-500">{snapshot.client.email}</span> : null}
          </Detail>
          <Detail label="Valid until">{formatDay(quote.validUntil)}</Detail>
          <Detail label="Sent">
            {quote.sentAt ? (
              <>
                {formatWhen(quote.sentAt)}
                <span className="block text-xs text-ink-500">
                  {quote.sentTo ? `to ${quote.sentTo}` : ""}
                  {quote.sentBy ? ` by ${quote.sentBy}` : ""}
                </span>
              </>
            ) : (
              <span className="text-ink-500">Not sent yet</span>
            )}
          </Detail>
          <Detail label="Total">
            <span className="tabular-nums">{formatMoney(quote.totalMinor, currency)}</span>
            <span className="block text-xs text-ink-500 tabular-nums">Deposit {formatMoney(quote.depositMinor, currency)}</span>
          </Detail>
          {quote.viewedAt ? <Detail label="Opened by the client">{formatWhen(quote.viewedAt)}</Detail> : null}
          {quote.declinedAt ? (
            <Detail label="Declined">
              {formatWhen(quote.declinedAt)}
              {quote.declineReason ? <span className="block whitespace-pre-line text-xs text-ink-600">“{quote.declineReason}”</span> : null}
            </Detail>
          ) : null}
        </dl>
        {canWrite ? (
          <div className="flex flex-wrap items-center gap-2">
            <span className="text-sm text-ink-600">Client link: {quote.linkActive ? "works" : "none working"}</span>
            {canLink ? (
              <button type="button" onClick={makeLink} disabled={newLink.isPending} className={secondaryButtonClass}>
                {newLink.isPending ? "Making a link…" : "New client link"}
              </button>
            ) : null}
            {quote.linkActive ? (
              <button type="button" onClick={() => setStopping(true)} className={dangerButtonClass}>
                Stop the client link
              </button>
            ) : null}
          </div>
        ) : null}
        <FormAlert message={alert} />
        <FormStatus message={notice} />
      </div>

      {accepted && quote.acceptedAt ? <AcceptanceRecord quote={quote} /> : null}

      <div className="grid gap-6 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="space-y-6">
          <section aria-labelledby="quote-lines-heading" className="space-y-2">
            <h2 id="quote-lines-heading" className="text-base font-semibold text-ink-900">
              Lines
            </h2>
            <QuoteLines lines={snapshot.lines} currency={currency} />
          </section>
          <DropSummary systems={snapshot.systems} />
        </div>
        <div className="space-y-6">
          <QuoteTotals totals={snapshot.totals} currency={currency} />
          <QuotePaymentsSection quote={quote} canRefund={canRefund} />
          <CautionsPanel extra={snapshot.cautions} />
          <QuoteEvents events={quote.events} />
        </div>
      </div>

      {sending ? <SendQuoteDialog quote={quote} onSent={() => setSending(false)} onClose={() => setSending(false)} /> : null}
      {linkUrl ? <ClientLinkDialog url={linkUrl} onClose={() => setLinkUrl(null)} /> : null}
      {stopping ? (
        <ConfirmDialog title="Stop the client link?" confirmLabel="Stop the link" pending={stopLink.isPending} onConfirm={confirmStop} onCancel={() => setStopping(false)}>
          The client can no longer open, accept or pay this quote through the link they have. You can make a new link later.
        </ConfirmDialog>
      ) : null}
    </div>
  );
}

export function QuoteNotFound({ jobId }: { jobId?: string }) {
  return (
    <EmptyState
      title="Quote not found"
      action={
        <Link to={jobId ? paths.job.getHref(jobId) : paths.jobs.getHref()} className={secondaryButtonClass}>
          {jobId ? "Back to the job" : "Back to jobs"}
        </Link>
      }
    >
      This quote does not exist in your company. The link may belong to another company.
    </EmptyState>
  );
}

/** The Quote screen: loading, not found, failed, or the quote. */
export function QuotePage({ jobId, quoteId, canWrite, canRefund }: { jobId: string; quoteId: string; canWrite: boolean; canRefund: boolean }) {
  const { data, error, isPending, isFetching, refetch } = useQuote(quoteId);
  if (isPending) return <p className="text-sm text-ink-500">Loading the quote…</p>;
  if (error) {
    if (error instanceof ApiError && error.status === 404) return <QuoteNotFound jobId={jobId} />;
    return <LoadFailed className="max-w-xl" message={`The quote could not be loaded. ${error.message}`} retrying={isFetching} onRetry={() => void refetch()} />;
  }
  return <QuoteView quote={data} canWrite={canWrite} canRefund={canRefund} />;
}
