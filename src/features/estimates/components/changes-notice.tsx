import type { GeneratedLine, LineChange } from "../../../../shared/schemas/estimates";
import { formatMoney } from "../../../../shared/money";
import { secondaryButtonClass } from "../../../components/ui/form";
import { formatAmount } from "../lib/format";

const CHANGE_WORDS: Record<LineChange["change"], string> = { added: "Added", removed: "Removed", changed: "Changed" };

/** What a rebuild from the layout changed, line by line, until dismissed. */
export function ChangesNotice({ changes, generated, currency, onDismiss }: { changes: LineChange[]; generated: GeneratedLine[]; currency: string; onDismiss: () => void }) {
  const unitOf = new Map(generated.map((g) => [g.key, g.unit]));
  return (
    <section aria-labelledby="changes-heading" className="rounded-lg border border-copper-200 bg-copper-50 px-4 py-3 text-sm">
      <div className="flex flex-wrap items-start justify-between gap-2">
        <h2 id="changes-heading" className="font-semibold text-ink-900">
          {changes.length === 0
            ? "Rebuilt from the layout: nothing changed"
            : `Rebuilt from the layout: ${changes.length} ${changes.length === 1 ? "line" : "lines"} changed`}
        </h2>
        <button type="button" onClick={onDismiss} className={secondaryButtonClass}>
          Dismiss
        </button>
      </div>
      {changes.length > 0 ? (
        <ul aria-label="Changed lines" className="mt-2 space-y-1 text-ink-800">
          {changes.map((c) => {
            const unit = unitOf.get(c.key);
            const costChanged = c.before && c.after && c.before.unitCostMinor !== c.after.unitCostMinor;
            return (
              <li key={`${c.change}-${c.key}`} className="flex flex-wrap gap-x-2 tabular-nums">
                <span className="w-20 shrink-0 font-medium">{CHANGE_WORDS[c.change]}</span>
                <span className="min-w-0 flex-1">
                  {c.description}
                  {c.change === "added" && c.after ? <span className="text-ink-600"> · {formatAmount(c.after.quantity, unit)}</span> : null}
                  {c.change === "removed" && c.before ? <span className="text-ink-600"> · was {formatAmount(c.before.quantity, unit)}</span> : null}
                  {c.change === "changed" && c.before && c.after ? (
                    <span className="text-ink-600">
                      {" "}
                      · {formatAmount(c.before.quantity, unit)} → {formatAmount(c.after.quantity, unit)}
                      {costChanged ? `, unit cost ${formatMoney(c.before.unitCostMinor, currency)} → ${formatMoney(c.after.unitCostMinor, currency)}` : ""}
                    </span>
                  ) : null}
                </span>
              </li>
            );
          })}
        </ul>
      ) : null}
    </section>
  );
}
