import { Link } from "react-router-dom";
import { QUOTE_STATUSES, type Dashboard } from "../../../../shared/schemas/estimates";
import { formatMoney } from "../../../../shared/money";
import { EmptyState } from "../../../components/ui/empty-state";
import { GaugeIcon } from "../../../components/ui/icons";
import { LoadFailed } from "../../../components/ui/load-failed";
import { LoadStatusIcon } from "../../../components/ui/load-status";
import { PageHeader } from "../../../components/ui/page-header";
import { paths } from "../../../config/paths";
import { QuoteStatusBadge } from "../../quotes/components/quote-status";
import { daysSince, formatDay, formatWhen, quoteEventLabel } from "../../quotes/lib/format";
import { useDashboard } from "../api/get-dashboard";
import { StatusChart } from "./status-chart";

const linkClass = "font-medium text-ink-900 underline-offset-2 hover:text-copper-700 hover:underline";
const panelHeading = "text-base font-semibold text-ink-900";

/** "2026-12" → "December 2026"; anything else as it is. */
function monthName(month: string): string {
  const m = /^(\d{4})-(\d{2})/.exec(month);
  if (!m) return month;
  return new Intl.DateTimeFormat(undefined, { month: "long", year: "numeric" }).format(new Date(Number(m[1]), Number(m[2]) - 1, 1));
}

function isEmpty(d: Dashboard) {
  const { receivedThisMonth, outstanding, flagged } = d.deposits;
  const noDeposits = receivedThisMonth.count === 0 && receivedThisMonth.refundedMinor === 0 && outstanding.count === 0 && flagged.length === 0;
  return d.byStatus.every((s) => s.count === 0) && d.awaiting.length === 0 && d.activity.length === 0 && d.overLimitSystems.length === 0 && noDeposits;
}

function StatusTiles({ dashboard }: { dashboard: Dashboard }) {
  return (
    <ul aria-label="Quotes this month by status" className="grid grid-cols-2 gap-3 sm:grid-cols-4 xl:grid-cols-7">
      {QUOTE_STATUSES.map((status) => {
        const row = dashboard.byStatus.find((b) => b.status === status);
        const count = row?.count ?? 0;
        return (
          <li key={status} className="space-y-1 rounded-lg border border-ink-100 bg-white p-3">
            <QuoteStatusBadge status={status} />
            <p className="text-2xl font-semibold tabular-nums text-ink-900">
              {count} <span className="sr-only">{count === 1 ? "quote" : "quotes"}</span>
            </p>
            <p className="text-sm tabular-nums text-ink-600">{formatMoney(row?.totalMinor ?? 0, dashboard.currency)}</p>
          </li>
        );
      })}
    </ul>
  );
}

const tileClass = "space-y-1 rounded-lg border border-ink-100 bg-white p-3";
const tileTitle = "text-sm font-medium text-ink-700";

/** Deposits received this month (and refunded), deposits still owed on accepted quotes, and payments the Owner must check. */
function Deposits({ dashboard }: { dashboard: Dashboard }) {
  const { receivedThisMonth: received, outstanding, flagged } = dashboard.deposits;
  const money = (minor: number) => formatMoney(minor, dashboard.currency);
  const deposits = (n: number) => (n === 1 ? "deposit" : "deposits");
  return (
    <section aria-labelledby="deposits-heading" className="space-y-3">
      <h2 id="deposits-heading" className={panelHeading}>
        Deposits
      </h2>
      <ul aria-label="Deposits" className="grid gap-3 sm:grid-cols-2">
        <li className={tileClass}>
          <h3 className={tileTitle}>Deposits received this month</h3>
          <p className="text-2xl font-semibold tabular-nums text-ink-900">
            {received.count} <span className="sr-only">{deposits(received.count)}</span>
          </p>
          <p className="text-sm tabular-nums text-ink-600">{money(received.amountMinor)}</p>
          {received.refundedMinor > 0 ? <p className="text-xs tabular-nums text-ink-500">{money(received.refundedMinor)} refunded</p> : null}
        </li>
        <li className={tileClass}>
          <h3 className={tileTitle}>Deposits outstanding</h3>
          <p className="text-2xl font-semibold tabular-nums text-ink-900">
            {outstanding.count} <span className="sr-only">{deposits(outstanding.count)}</span>
          </p>
          <p className="text-sm tabular-nums text-ink-600">{money(outstanding.amountMinor)}</p>
          <p className="text-xs text-ink-500">Accepted quotes waiting for their deposit</p>
        </li>
      </ul>
      {flagged.length > 0 ? (
        <div className="space-y-2">
          <h3 id="flagged-heading" className="flex items-center gap-1.5 text-sm font-semibold text-over-700">
            <span aria-hidden="true">!</span>
            Payments to check
          </h3>
          <ul aria-labelledby="flagged-heading" className="divide-y divide-ink-100 rounded-lg border border-over-100 bg-white text-sm">
            {flagged.map((p) => (
              <li key={p.id} className="flex flex-wrap items-start justify-between gap-x-4 gap-y-1 px-3 py-2">
                <div className="min-w-0">
                  <Link to={paths.quote.getHref(p.jobId, p.quoteId)} className={linkClass}>
                    {p.quoteLabel}
                  </Link>
                  <span className="text-xs text-ink-500"> · receipt {p.receiptNumber}</span>
                  <p className="text-over-700">{p.mismatchReason ?? "This payment does not match the deposit that was due."}</p>
                </div>
                <div className="text-right">
                  <p className="tabular-nums text-ink-900">{formatMoney(p.amountMinor, p.currency)}</p>
                  <p className="text-xs text-ink-500">Paid {formatDay(p.paidAt)}</p>
                </div>
              </li>
            ))}
          </ul>
        </div>
      ) : null}
    </section>
  );
}

function Awaiting({ dashboard }: { dashboard: Dashboard }) {
  return (
    <section aria-labelledby="awaiting-heading" className="space-y-2">
      <h2 id="awaiting-heading" className={panelHeading}>
        Waiting for an answer for more than 7 days
      </h2>
      {dashboard.awaiting.length === 0 ? (
        <p className="text-sm text-ink-500">No quote has been waiting that long.</p>
      ) : (
        <ul aria-label="Waiting for an answer" className="divide-y divide-ink-100 rounded-lg border border-ink-100 bg-white text-sm">
          {dashboard.awaiting.map((q) => {
            const days = q.sentAt ? daysSince(q.sentAt) : null;
            return (
              <li key={q.id} className="flex flex-wrap items-center justify-between gap-x-4 gap-y-1 px-3 py-2">
                <div className="min-w-0">
                  <Link to={paths.quote.getHref(q.jobId, q.id)} className={linkClass}>
                    {q.label}
                  </Link>{" "}
                  <QuoteStatusBadge status={q.status} className="ml-1" />
                  <p className="text-xs text-ink-500">
                    {q.clientName} · {q.jobTitle}
                  </p>
                </div>
                <div className="text-right">
                  <p className="tabular-nums text-ink-900">{formatMoney(q.totalMinor, q.currency)}</p>
                  <p className="text-xs text-ink-500">
                    {q.sentAt ? `Sent ${formatDay(q.sentAt)}${days !== null ? `, ${days} days ago` : ""}` : "Not sent"}
                  </p>
                </div>
              </li>
            );
          })}
        </ul>
      )}
    </section>
  );
}

function Activity({ dashboard }: { dashboard: Dashboard }) {
  return (
    <section aria-labelledby="activity-heading" className="space-y-2">
      <h2 id="activity-heading" className={panelHeading}>
        Recent activity
      </h2>
      {dashboard.activity.length === 0 ? (
        <p className="text-sm text-ink-500">Nothing has happened to your quotes lately.</p>
      ) : (
        <ul aria-label="Recent activity" className="divide-y divide-ink-100 rounded-lg border border-ink-100 bg-white text-sm">
          {dashboard.activity.map((a, i) => (
            <li key={`${a.quoteId}-${a.type}-${a.at}-${i}`} className="px-3 py-2">
              <p className="flex flex-wrap items-baseline justify-between gap-x-3">
                <span className="font-medium text-ink-900">{quoteEventLabel(a.type)}</span>
                <time dateTime={a.at} className="text-xs text-ink-500">
                  {formatWhen(a.at)}
                </time>
              </p>
              <p className="text-ink-700">
                <Link to={paths.quote.getHref(a.jobId, a.quoteId)} className={linkClass}>
                  {a.label}
                </Link>{" "}
                · <Link to={paths.job.getHref(a.jobId)} className="underline-offset-2 hover:text-copper-700 hover:underline">{a.jobTitle}</Link> · {a.clientName}
                {a.actor ? <span className="text-ink-500"> · {a.actor}</span> : null}
              </p>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

function OverLimit({ dashboard }: { dashboard: Dashboard }) {
  return (
    <section aria-labelledby="over-heading" className="space-y-2">
      <h2 id="over-heading" className={panelHeading}>
        Systems with loads over the limit
      </h2>
      {dashboard.overLimitSystems.length === 0 ? (
        <p className="text-sm text-ink-500">Every solved system is within its drop limits.</p>
      ) : (
        <ul aria-label="Systems with loads over the limit" className="divide-y divide-ink-100 rounded-lg border border-ink-100 bg-white text-sm">
          {dashboard.overLimitSystems.map((s) => (
            <li key={s.systemId} className="flex flex-wrap items-center justify-between gap-2 px-3 py-2">
              <div className="min-w-0">
                <Link to={paths.system.getHref(s.jobId, s.systemId)} className={linkClass}>
                  {s.systemName}
                </Link>
                <p className="text-xs text-ink-500">{s.jobTitle}</p>
              </div>
              <span className="inline-flex items-center gap-1.5 font-bold text-over-700">
                <LoadStatusIcon status="over" />
                {s.over} {s.over === 1 ? "load" : "loads"} over limit
              </span>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

/** The dashboard: this month's quotes by status, deposits in and owed, what waits for an answer, what happened lately, and systems to fix. */
export function DashboardPage() {
  const { data, error, isPending, isFetching, refetch } = useDashboard();
  const header = <PageHeader title="Dashboard" description={data ? `What needs your attention. Figures for ${monthName(data.month)}.` : "What needs your attention today."} />;
  if (isPending) {
    return (
      <>
        {header}
        <p className="mt-6 text-sm text-ink-500">Loading the dashboard…</p>
      </>
    );
  }
  if (error) {
    return (
      <>
        {header}
        <LoadFailed className="mt-6 max-w-xl" message={`The dashboard could not be loaded. ${error.message}`} retrying={isFetching} onRetry={() => void refetch()} />
      </>
    );
  }
  if (isEmpty(data)) {
    return (
      <>
        {header}
        <EmptyState title="Nothing to follow up yet" icon={<GaugeIcon />}>
          Quotes waiting for an answer, deposits that have arrived and systems with a load over its drop limit will gather here as soon as you start pricing jobs.
        </EmptyState>
      </>
    );
  }
  return (
    <div className="space-y-6">
      {header}
      <section aria-labelledby="month-heading" className="space-y-3">
        <h2 id="month-heading" className={panelHeading}>
          Quotes in {monthName(data.month)}
        </h2>
        <StatusTiles dashboard={data} />
        <StatusChart byStatus={data.byStatus} currency={data.currency} />
      </section>
      <Deposits dashboard={data} />
      <div className="grid gap-6 lg:grid-cols-2">
        <Awaiting dashboard={data} />
        <Activity dashboard={data} />
      </div>
      <OverLimit dashboard={data} />
    </div>
  );
}
