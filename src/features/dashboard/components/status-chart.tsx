import { lazy, Suspense } from "react";
import { QUOTE_STATUSES, type QuoteStatus } from "../../../../shared/schemas/estimates";
import { currencyDigits, formatMoney } from "../../../../shared/money";
import { QUOTE_STATUS_LABELS } from "../../quotes/lib/format";

const StatusBars = lazy(() => import("./status-bars"));

const CHART_HEIGHT = 200;

/** Money quoted this month by status, one bar each; the words are on the axis and in a table for screen readers. */
export function StatusChart({ byStatus, currency }: { byStatus: Array<{ status: QuoteStatus; count: number; totalMinor: number }>; currency: string }) {
  const scale = 10 ** currencyDigits(currency);
  const data = QUOTE_STATUSES.map((status) => {
    const row = byStatus.find((b) => b.status === status);
    return { status, label: QUOTE_STATUS_LABELS[status], totalMinor: row?.totalMinor ?? 0, total: (row?.totalMinor ?? 0) / scale, count: row?.count ?? 0 };
  });
  return (
    <figure className="space-y-2 rounded-lg border border-ink-100 bg-white p-4">
      <figcaption className="text-sm font-semibold text-ink-900">Money by status this month</figcaption>
      <Suspense fallback={<div aria-hidden="true" style={{ height: CHART_HEIGHT }} className="w-full animate-pulse rounded bg-ink-50" />}>
        <StatusBars data={data} currency={currency} height={CHART_HEIGHT} />
      </Suspense>
      <table className="sr-only">
        <caption>Money by status this month</caption>
        <thead>
          <tr>
            <th scope="col">Status</th>
            <th scope="col">Quotes</th>
            <th scope="col">Money</th>
          </tr>
        </thead>
        <tbody>
          {data.map((d) => (
            <tr key={d.status}>
              <td>{d.label}</td>
              <td>{d.count}</td>
              <td>{formatMoney(d.totalMinor, currency)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </figure>
  );
}
