import type { EstimateTotals } from "../../../../shared/schemas/estimates";
import { formatMoney } from "../../../../shared/money";
import { cn } from "../../../utils/cn";
import { formatPercent } from "../lib/format";

/** Cost, subtotal, discount, tax, total, deposit due and margin. */
export function TotalsPanel({ totals, currency, depositNote }: { totals: EstimateTotals; currency: string; depositNote?: string }) {
  const money = (minor: number) => formatMoney(minor, currency);
  const marginShare = totals.subtotalMinor > 0 ? Math.round((totals.marginMinor / totals.subtotalMinor) * 1000) / 10 : null;
  const row = (label: string, value: string, strong = false, note?: string) => (
    <div className={cn("flex items-baseline justify-between gap-4 py-1", strong && "border-t border-ink-200 pt-2 text-base font-semibold text-ink-900")}>
      <dt className={strong ? undefined : "text-ink-600"}>
        {label}
        {note ? <span className="ml-1 text-xs font-normal text-ink-500">{note}</span> : null}
      </dt>
      <dd className="tabular-nums">{value}</dd>
    </div>
  );
  return (
    <section aria-labelledby="totals-heading" className="rounded-lg border border-ink-100 bg-white p-4 text-sm">
      <h2 id="totals-heading" className="mb-2 text-base font-semibold text-ink-900">
        Totals
      </h2>
      <dl>
        {row("Cost", money(totals.costMinor))}
        {row("Subtotal", money(totals.subtotalMinor))}
        {row("Discount", totals.discountMinor > 0 ? `−${money(totals.discountMinor)}` : money(0))}
        {row("Tax", money(totals.taxMinor), false, formatPercent(totals.taxRatePercent))}
        {row("Total", money(totals.totalMinor), true)}
        {row("Deposit due", money(totals.depositMinor), false, depositNote)}
        {row("Margin", money(totals.marginMinor), false, marginShare === null ? undefined : `${marginShare} % of the subtotal`)}
      </dl>
    </section>
  );
}
