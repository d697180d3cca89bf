import { CATEGORY_LABELS, PRICE_CATEGORIES, type ClientSnapshot } from "../../../../shared/schemas/estimates";
import { formatMoney } from "../../../../shared/money";
import { formatPercent, formatQuantity } from "../utils/format";

const th = "px-3 py-2 text-left text-xs font-semibold uppercase tracking-wide text-ink-500";
const td = "px-3 py-2 align-top text-sm text-ink-800";

/**
 * The priced lines by category and the totals. The client sees what each line is, how much and
 * what it costs them: never the contractor's cost, markup, SKU or how a quantity was worked out.
 */
export function PricedLines({ lines, totals, currency }: { lines: ClientSnapshot["lines"]; totals: ClientSnapshot["totals"]; currency: string }) {
  const money = (minor: number) => formatMoney(minor, currency);
  const groups = PRICE_CATEGORIES.map((category) => ({ category, lines: lines.filter((l) => l.category === category) })).filter((g) => g.lines.length > 0);
  return (
    <div className="-mx-3 overflow-x-auto sm:mx-0">
      <table className="w-full border-collapse">
        <caption className="sr-only">Priced lines by category, with the totals</caption>
        <thead className="border-b border-ink-200">
          <tr>
            <th scope="col" className={th}>
              Description
            </th>
            <th scope="col" className={`${th} text-right`}>
              Quantity
            </th>
            <th scope="col" className={`${th} text-right`}>
              Amount
            </th>
          </tr>
        </thead>
        {groups.length === 0 ? (
          <tbody>
            <tr>
              <td colSpan={3} className={`${td} text-ink-500`}>
                This quote has no priced lines.
              </td>
            </tr>
          </tbody>
        ) : (
          groups.map((group) => (
            <tbody key={group.category} className="border-b border-ink-100">
              <tr>
                <th scope="colgroup" colSpan={3} className="bg-ink-50 px-3 py-1.5 text-left text-sm font-semibold text-ink-900 print:bg-white">
                  {CATEGORY_LABELS[group.category]}
                </th>
              </tr>
              {group.lines.map((line) => (
                <tr key={line.key}>
                  <td className={td}>{line.description}</td>
                  <td className={`${td} whitespace-nowrap text-right`}>{formatQuantity(line.quantity, line.unit)}</td>
                  <td className={`${td} whitespace-nowrap text-right`}>{money(line.sellMinor)}</td>
                </tr>
              ))}
            </tbody>
          ))
        )}
        <tfoot className="text-sm">
          <TotalRow label="Subtotal" amount={money(totals.subtotalMinor)} />
          {totals.discountMinor > 0 ? <TotalRow label="Discount" amount={`−${money(totals.discountMinor)}`} /> : null}
          <TotalRow label={`Tax (${formatPercent(totals.taxRatePercent)})`} amount={money(totals.taxMinor)} />
          <TotalRow label="Total" amount={money(totals.totalMinor)} strong />
          <TotalRow label="Deposit due on acceptance" amount={money(totals.depositMinor)} accent />
        </tfoot>
      </table>
    </div>
  );
}

function TotalRow({ label, amount, strong = false, accent = false }: { label: string; amount: string; strong?: boolean; accent?: boolean }) {
  const tone = accent ? "text-copper-700 font-semibold" : strong ? "text-ink-900 font-semibold text-base" : "text-ink-700";
  return (
    <tr className={strong ? "border-t-2 border-ink-900" : undefined}>
      <th scope="row" colSpan={2} className={`px-3 py-1.5 text-right font-medium ${tone}`}>
        {label}
      </th>
      <td className={`whitespace-nowrap px-3 py-1.5 text-right ${tone}`}>{amount}</td>
    </tr>
  );
}
