import { CATEGORY_LABELS, PRICE_CATEGORIES, type EstimateTotals, type PricedLine } from "../../../../shared/schemas/estimates";
import { formatMoney } from "../../../../shared/money";
import { formatPercent, formatQuantity, UNIT_LABELS } from "../../estimates/lib/format";

/** The quote's priced lines by category, at sell prices as the client sees them. */
export function QuoteLines({ lines, currency }: { lines: PricedLine[]; currency: string }) {
  const groups = PRICE_CATEGORIES.map((category) => ({ category, lines: lines.filter((l) => l.category === category) })).filter((g) => g.lines.length > 0);
  if (lines.length === 0) return <p className="text-sm text-ink-500">This quote has no lines.</p>;
  return (
    <div className="overflow-x-auto rounded-lg border border-ink-100 bg-white">
      <table className="w-full min-w-[36rem] text-sm">
        <caption className="sr-only">Quoted lines by category</caption>
        <thead className="border-b border-ink-100 bg-ink-50 text-left text-xs font-medium uppercase tracking-wide text-ink-500">
          <tr>
            <th scope="col" className="px-3 py-2">
              Description
            </th>
            <th scope="col" className="px-3 py-2 text-right">
              Quantity
            </th>
            <th scope="col" className="px-3 py-2 text-right">
              Amount
            </th>
          </tr>
        </thead>
        {groups.map((group) => (
          <tbody key={group.category} aria-label={CATEGORY_LABELS[group.category]}>
            <tr className="bg-ink-50/60">
              <th scope="rowgroup" colSpan={2} className="px-3 pt-3 pb-1 text-left text-xs font-semibold uppercase tracking-wide text-ink-700">
                {CATEGORY_LABELS[group.category]}
              </th>
              <td className="px-3 pt-3 pb-1 text-right text-xs font-semibold tabular-nums text-ink-700">{formatMoney(group.lines.reduce((s, l) => s + l.sellMinor, 0), currency)}</td>
            </tr>
            {group.lines.map((line) => (
              <tr key={line.key} className="border-t border-ink-50">
                <td className="px-3 py-1.5">
                  <span className="text-ink-900">{line.description}</span>
                  {line.sku ? <span className="ml-2 text-xs text-ink-500">{line.sku}</span> : null}
                </td>
                <td className="whitespace-nowrap px-3 py-1.5 text-right tabular-nums">
                  {formatQuantity(line.quantity)} {UNIT_LABELS[line.unit]}
                </td>
                <td className="whitespace-nowrap px-3 py-1.5 text-right tabular-nums">{formatMoney(line.sellMinor, currency)}</td>
              </tr>
            ))}
          </tbody>
        ))}
      </table>
    </div>
  );
}

/** Subtotal, discount, tax, total and deposit due of a quote. */
export function QuoteTotals({ totals, currency }: { totals: EstimateTotals; currency: string }) {
  const money = (minor: number) => formatMoney(minor, currency);
  const rows: Array<[string, string, boolean?]> = [
    ["Subtotal", money(totals.subtotalMinor)],
    ...(totals.discountMinor > 0 ? ([["Discount", `−${money(totals.discountMinor)}`]] as Array<[string, string]>) : []),
    [`Tax (${formatPercent(totals.taxRatePercent)})`, money(totals.taxMinor)],
    ["Total", money(totals.totalMinor), true],
    ["Deposit due", money(totals.depositMinor)],
  ];
  return (
    <section aria-labelledby="quote-totals-heading" className="rounded-lg border border-ink-100 bg-white p-4 text-sm">
      <h2 id="quote-totals-heading" className="mb-2 text-base font-semibold text-ink-900">
        Totals
      </h2>
      <dl>
        {rows.map(([label, value, strong]) => (
          <div key={label} className={strong ? "flex justify-between gap-4 border-t border-ink-200 py-2 text-base font-semibold text-ink-900" : "flex justify-between gap-4 py-1"}>
            <dt className={strong ? undefined : "text-ink-600"}>{label}</dt>
            <dd className="tabular-nums">{value}</dd>
          </div>
        ))}
      </dl>
    </section>
  );
}
