import { formatMoney, minorToPlain } from "../../../../shared/money";
import { controlClass, Field } from "../../../components/ui/form";
import { formatPercent, numberText, parseAmount, parseMarkup, parsePercent } from "../lib/format";
import type { EstimateDraft } from "../lib/draft";
import { CommitInput } from "./commit-input";

interface SettingsPanelProps {
  draft: EstimateDraft;
  currency: string;
  canWrite: boolean;
  onChange: (patch: Partial<EstimateDraft>) => void;
}

const inputClass = "w-full";

/** Markup, discount, tax rate and deposit of this estimate. */
export function SettingsPanel({ draft, currency, canWrite, onChange }: SettingsPanelProps) {
  if (!canWrite) {
    return (
      <section aria-labelledby="settings-heading" className="space-y-2">
        <h2 id="settings-heading" className="text-base font-semibold text-ink-900">
          Pricing
        </h2>
        <dl className="grid grid-cols-2 gap-x-4 gap-y-2 rounded-lg border border-ink-100 bg-white p-4 text-sm">
          <dt className="text-ink-500">Markup on cost</dt>
          <dd className="tabular-nums">{formatPercent(draft.markupPercent)}</dd>
          <dt className="text-ink-500">Discount</dt>
          <dd className="tabular-nums">{formatMoney(draft.discountMinor, currency)}</dd>
          <dt className="text-ink-500">Tax rate</dt>
          <dd className="tabular-nums">{formatPercent(draft.taxRatePercent)}</dd>
          <dt className="text-ink-500">Deposit</dt>
          <dd className="tabular-nums">{draft.depositMode === "percent" ? `${formatPercent(draft.depositPercent)} of the total` : formatMoney(draft.depositFixedMinor, currency)}</dd>
        </dl>
      </section>
    );
  }
  return (
    <section aria-labelledby="settings-heading" className="space-y-2">
      <h2 id="settings-heading" className="text-base font-semibold text-ink-900">
        Pricing
      </h2>
      <div className="grid gap-4 rounded-lg border border-ink-100 bg-white p-4 sm:grid-cols-2">
        <Field label="Markup on cost (%)" hint="For every line without its own markup.">
          {(c) => (
            <CommitInput
              {...c}
              value={numberText(draft.markupPercent)}
              parse={parseMarkup}
              onCommit={(v) => onChange({ markupPercent: v ?? 0 })}
              className={inputClass}
            />
          )}
        </Field>
        <Field label={`Discount (${currency})`} hint="Taken off the subtotal, before tax.">
          {(c) => (
            <CommitInput
              {...c}
              value={minorToPlain(draft.discountMinor, currency)}
              parse={(text) => (text.trim() === "" ? { ok: true, value: 0 } : parseAmount(text, currency, "discount"))}
              onCommit={(v) => onChange({ discountMinor: v ?? 0 })}
              className={inputClass}
            />
          )}
        </Field>
        <Field label="Tax rate (%)">
          {(c) => (
            <CommitInput
              {...c}
              value={numberText(draft.taxRatePercent)}
              parse={(text) => parsePercent(text, "tax rate", 100)}
              onCommit={(v) => onChange({ taxRatePercent: v ?? 0 })}
              className={inputClass}
            />
          )}
        </Field>
        <Field label="Deposit">
          {(c) => (
            <select
              {...c}
              value={draft.depositMode}
              onChange={(event) => onChange({ depositMode: event.target.value === "fixed" ? "fixed" : "percent" })}
              className={controlClass}
            >
              <option value="percent">A percentage of the total</option>
              <option value="fixed">A fixed amount</option>
            </select>
          )}
        </Field>
        {draft.depositMode === "percent" ? (
          <Field label="Deposit (%)" className="sm:col-start-2">
            {(c) => (
              <CommitInput
                {...c}
                value={numberText(draft.depositPercent)}
                parse={(text) => parsePercent(text, "deposit", 100)}
                onCommit={(v) => onChange({ depositPercent: v ?? 0 })}
                className={inputClass}
              />
            )}
          </Field>
        ) : (
          <Field label={`Deposit amount (${currency})`} hint="At most the total." className="sm:col-start-2">
            {(c) => (
              <CommitInput
                {...c}
                value={minorToPlain(draft.depositFixedMinor, currency)}
                parse={(text) => parseAmount(text, currency, "deposit")}
                onCommit={(v) => onChange({ depositFixedMinor: v ?? 0 })}
                className={inputClass}
              />
            )}
          </Field>
        )}
      </div>
    </section>
  );
}
