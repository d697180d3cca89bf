import { CATEGORY_LABELS, PRICE_CATEGORIES, type GeneratedLine, type ManualLine, type PricedLine } from "../../../../shared/schemas/estimates";
import { formatMoney } from "../../../../shared/money";
import { dangerButtonClass, secondaryButtonClass } from "../../../components/ui/form";
import { cn } from "../../../utils/cn";
import { formatPercent, formatQuantity, numberText, parseMarkup, parseQuantity, UNIT_LABELS } from "../lib/format";
import { CommitInput } from "./commit-input";

const MANUAL_PREFIX = "manual:";

interface LinesTableProps {
  lines: PricedLine[];
  generated: GeneratedLine[];
  manual: ManualLine[];
  currency: string;
  canWrite: boolean;
  onQuantity: (key: string, quantity: number | null) => void;
  onMarkup: (key: string, markupPercent: number | null) => void;
  onReset: (key: string) => void;
  onEditManual: (line: ManualLine) => void;
  onRemoveManual: (line: ManualLine) => void;
}

const cell = "px-2 py-1.5 align-top";
const num = "px-2 py-1.5 text-right align-top tabular-nums whitespace-nowrap";
const blank = <span className="text-ink-400">—</span>;

/** Tags beside a line's description: the estimator's adjustments, and lines added by hand. */
function Tag({ children, tone }: { children: string; tone: "copper" | "ink" }) {
  return (
    <span
      className={cn(
        "inline-flex items-center rounded border px-1.5 text-[11px] font-medium",
        tone === "copper" ? "border-copper-200 bg-copper-50 text-copper-800" : "border-ink-200 bg-ink-50 text-ink-700",
      )}
    >
      {children}
    </span>
  );
}

/**
 * The estimate's lines by category: description and how its quantity was reached, SKU, quantity,
 * unit cost, markup, cost and sell. Writers adjust the quantity and markup of lines made from the
 * layout in place, and edit or remove the lines they added.
 */
export function LinesTable({ lines, generated, manual, currency, canWrite, onQuantity, onMarkup, onReset, onEditManual, onRemoveManual }: LinesTableProps) {
  const generatedByKey = new Map(generated.map((g) => [g.key, g]));
  const manualById = new Map(manual.map((m) => [m.id, m]));
  const money = (minor: number) => formatMoney(minor, currency);
  const groups = PRICE_CATEGORIES.map((category) => ({ category, lines: lines.filter((l) => l.category === category) })).filter((g) => g.lines.length > 0);

  if (lines.length === 0) {
    return (
      <p className="rounded-lg border border-dashed border-ink-200 bg-white px-4 py-6 text-center text-sm text-ink-500">
        No lines yet. Lines come from the job's systems (cable, terminations, fuses, labour) when the estimate is built from the layout
        {canWrite ? ", and from lines you add by hand." : "."}
      </p>
    );
  }

  return (
    <div className="overflow-x-auto rounded-lg border border-ink-100 bg-white">
      <table className="w-full min-w-[56rem] text-sm">
        <caption className="sr-only">Estimate lines by category</caption>
        <thead className="border-b border-ink-100 bg-ink-50 text-left text-xs font-medium uppercase tracking-wide text-ink-500">
          <tr>
            <th scope="col" className="px-2 py-2">
              Description
            </th>
            <th scope="col" className="px-2 py-2">
              SKU
            </th>
            <th scope="col" className="px-2 py-2 text-right">
              Quantity
            </th>
            <th scope="col" className="px-2 py-2 text-right">
              Unit cost
            </th>
            <th scope="col" className="px-2 py-2 text-right">
              Markup
            </th>
            <th scope="col" className="px-2 py-2 text-right">
              Cost
            </th>
            <th scope="col" className="px-2 py-2 text-right">
              Sell
            </th>
            {canWrite ? (
              <th scope="col" className="px-2 py-2">
                <span className="sr-only">Actions</span>
              </th>
            ) : null}
          </tr>
        </thead>
        {groups.map((group) => (
          <tbody key={group.category} aria-label={CATEGORY_LABELS[group.category]} className="border-b border-ink-100 last:border-b-0">
            <tr className="bg-ink-50/60">
              <th scope="rowgroup" colSpan={6} className="px-2 pt-3 pb-1 text-left text-xs font-semibold uppercase tracking-wide text-ink-700">
                {CATEGORY_LABELS[group.category]}
              </th>
              <td className="px-2 pt-3 pb-1 text-right text-xs font-semibold tabular-nums text-ink-700">{money(group.lines.reduce((s, l) => s + l.sellMinor, 0))}</td>
              {canWrite ? <td /> : null}
            </tr>
            {group.lines.map((line) => {
              const base = line.source === "layout" ? generatedByKey.get(line.key) : undefined;
              const own = line.source === "manual" ? manualById.get(line.key.slice(MANUAL_PREFIX.length)) : undefined;
              const editable = canWrite && line.source === "layout";
              return (
                <tr key={line.key} className="border-t border-ink-50 hover:bg-copper-50/30">
                  <td className={cn(cell, "min-w-[16rem]")}>
                    <div className="flex flex-wrap items-center gap-1.5">
                      <span className="font-medium text-ink-900">{line.description}</span>
                      {line.source === "manual" ? <Tag tone="ink">Added by hand</Tag> : null}
                      {line.source === "layout" && line.overridden ? <Tag tone="copper">Adjusted</Tag> : null}
                      {editable && line.overridden ? (
                        <button
                          type="button"
                          aria-label={`Reset ${line.description}`}
                          title="Back to the quantity and markup the layout gives"
                          onClick={() => onReset(line.key)}
                          className="rounded px-1 text-xs font-medium text-copper-700 underline underline-offset-2 hover:text-copper-900"
                        >
                          Reset
                        </button>
                      ) : null}
                    </div>
                    {line.detail && line.source === "layout" ? <p className="text-xs text-ink-500">{line.detail}</p> : null}
                    {base && line.overridden && base.quantity !== line.quantity ? (
                      <p className="text-xs text-ink-500">
                        The layout gives {formatQuantity(base.quantity)} {UNIT_LABELS[base.unit]}
                      </p>
                    ) : null}
                  </td>
                  <td className={cn(cell, "whitespace-nowrap text-ink-600")}>{line.sku ?? blank}</td>
                  <td className={num}>
                    {editable ? (
                      <span className="inline-flex items-start justify-end gap-1">
                        <CommitInput
                          aria-label={`Quantity of ${line.description}`}
                          value={numberText(line.quantity)}
                          parse={(text) => (text.trim() === "" ? { ok: true, value: null } : parseQuantity(text))}
                          onCommit={(value) => onQuantity(line.key, value)}
                          className="w-20 text-right"
                          errorClassName="max-w-[9rem] whitespace-normal"
                        />
                        <span className="pt-1 text-ink-600">{UNIT_LABELS[line.unit]}</span>
                      </span>
                    ) : (
                      `${formatQuantity(line.quantity)} ${UNIT_LABELS[line.unit]}`
                    )}
                  </td>
                  <td className={num}>{money(line.unitCostMinor)}</td>
                  <td className={num}>
                    {editable ? (
                      <span className="inline-flex items-start justify-end gap-1">
                        <CommitInput
                          aria-label={`Markup % of ${line.description}`}
                          value={numberText(line.markupPercent)}
                          placeholder="fixed"
                          title={line.markupPercent === null ? "Sold at the price list's sell price; type a markup to price it from cost instead." : undefined}
                          parse={(text) => (text.trim() === "" ? { ok: true, value: null } : parseMarkup(text))}
                          onCommit={(value) => onMarkup(line.key, value)}
                          className="w-16 text-right"
                          errorClassName="max-w-[9rem] whitespace-normal"
                        />
                        <span aria-hidden="true" className="pt-1 text-ink-600">
                          %
                        </span>
                      </span>
                    ) : line.markupPercent === null ? (
                      <span className="text-ink-500">Sell price</span>
                    ) : (
                      formatPercent(line.markupPercent)
                    )}
                  </td>
                  <td className={cn(num, "text-ink-600")}>{money(line.costMinor)}</td>
                  <td className={cn(num, "font-medium text-ink-900")}>{money(line.sellMinor)}</td>
                  {canWrite ? (
                    <td className={cn(cell, "whitespace-nowrap text-right")}>
                      {own ? (
                        <span className="inline-flex gap-1">
                          <button type="button" aria-label={`Edit ${line.description}`} onClick={() => onEditManual(own)} className={cn(secondaryButtonClass, "px-2 py-0.5 text-xs")}>
                            Edit
                          </button>
                          <button type="button" aria-label={`Remove ${line.description}`} onClick={() => onRemoveManual(own)} className={cn(dangerButtonClass, "px-2 py-0.5 text-xs")}>
                            Remove
                          </button>
                        </span>
                      ) : null}
                    </td>
                  ) : null}
                </tr>
              );
            })}
          </tbody>
        ))}
      </table>
    </div>
  );
}
