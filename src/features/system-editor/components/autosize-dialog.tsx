import type { LoadStatus } from "../../../../shared/engine/system";
import { Dialog } from "../../../components/ui/dialog";
import { LoadStatusLabel } from "../../../components/ui/load-status";
import { primaryButtonClass, secondaryButtonClass } from "../../../components/ui/form";
import type { AutosizeAnswer, AutosizeProposal } from "../../systems/api/autosize-system";
import { fixed, formatMoney, formatSize } from "../lib/format";

const asStatus = (s: string): LoadStatus | null => (s === "within" || s === "near" || s === "over" ? s : null);

function Status({ value }: { value: string }) {
  const s = asStatus(value);
  return s ? <LoadStatusLabel status={s} /> : <span>{value}</span>;
}

export interface AutosizeDialogProps {
  answer: AutosizeAnswer;
  onApply(): void;
  onDiscard(): void;
}

/** The proposal itself: the runs it changes, every load before → after, and what it costs. */
function Proposal({ answer, changed }: { answer: AutosizeProposal; changed: AutosizeProposal["runs"] }) {
  const currency = answer.currency;
  const difference = answer.costDifference;
  return (
    <>
      {!answer.passes ? (
        <p role="alert" className="mb-3 rounded-md border border-over-100 bg-over-50 px-3 py-2 font-semibold text-over-700">
          No set of the priced sizes makes every load pass every case. The proposal below is the closest it found; look at the layout itself (shorter runs,
          a higher system voltage, another feed point).
        </p>
      ) : null}
      <h3 className="font-semibold text-ink-900">Runs changed ({changed.length})</h3>
      {changed.length === 0 ? (
        <p className="mt-1 text-ink-600">No run needs a different size.</p>
      ) : (
        <ul className="mt-1 space-y-1 tabular-nums">
          {changed.map((r) => (
            <li key={r.id} data-run-id={r.id} className="flex flex-wrap justify-between gap-2">
              <span className="font-medium">
                {r.id}: {formatSize(r.before)} → {formatSize(r.after)}
              </span>
              <span className="text-ink-600">
                {r.costBefore === null ? "not priced" : formatMoney(r.costBefore, currency)} → {formatMoney(r.costAfter, currency)}
              </span>
            </li>
          ))}
        </ul>
      )}
      <h3 className="mt-4 font-semibold text-ink-900">Loads, worst case</h3>
      <table className="mt-1 w-full text-left tabular-nums">
        <thead className="text-xs uppercase tracking-wide text-ink-500">
          <tr>
            <th scope="col" className="py-1 pr-2">Load</th>
            <th scope="col" className="py-1 pr-2">Before</th>
            <th scope="col" className="py-1">After</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-ink-100">
          {answer.loads.map((l) => (
            <tr key={l.id} data-load-id={l.id}>
              <td className="py-1 pr-2 font-medium">{l.id}</td>
              <td className="py-1 pr-2">
                {l.before ? (
                  <span className="flex flex-wrap items-center gap-2">
                    {fixed(l.before.dropPercent, 2)} % <Status value={l.before.status} />
                  </span>
                ) : (
                  "—"
                )}
              </td>
              <td className="py-1">
                <span className="flex flex-wrap items-center gap-2">
                  {fixed(l.after.dropPercent, 2)} % <Status value={l.after.status} />
                </span>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      <div className="mt-4 rounded-md bg-ink-50 px-3 py-2 tabular-nums">
        <p className="font-semibold text-ink-900">
          Cable cost: {answer.costBefore === null ? "not priced before" : formatMoney(answer.costBefore, currency)} → {formatMoney(answer.costAfter, currency)}
          {difference !== null ? ` (${difference >= 0 ? "+" : "−"}${formatMoney(Math.abs(difference), currency)})` : ""}
        </p>
        {answer.costNote ? <p className="mt-1 text-xs text-ink-600">{answer.costNote}</p> : null}
      </div>
      {answer.messages.length > 0 ? (
        <ul className="mt-3 list-disc space-y-1 pl-5 text-ink-600">
          {answer.messages.map((m) => (
            <li key={m}>{m}</li>
          ))}
        </ul>
      ) : null}
    </>
  );
}

/** "Auto-size proposal": the runs it changes, every load before → after, and what it costs. Nothing is saved. */
export function AutosizeDialog({ answer, onApply, onDiscard }: AutosizeDialogProps) {
  const changed = answer.ok ? answer.runs.filter((r) => r.changed) : [];
  return (
    <Dialog
      title="Auto-size proposal"
      size={answer.ok ? "lg" : "sm"}
      onClose={onDiscard}
      footer={
        <>
          <button type="button" onClick={onDiscard} className={secondaryButtonClass}>
            Discard
          </button>
          {answer.ok ? (
            <button type="button" onClick={onApply} disabled={changed.length === 0} className={primaryButtonClass}>
              Apply proposal
            </button>
          ) : null}
        </>
      }
    >
      {answer.ok ? (
        <Proposal answer={answer} changed={changed} />
      ) : (
        <>
          <p role="alert" className="font-medium text-over-700">
            No proposal: the layout cannot be auto-sized as it is.
          </p>
          <ul className="mt-2 list-disc space-y-1 pl-5">
            {answer.errors.map((e, i) => (
              <li key={`${e.code}-${i}`}>{e.message}</li>
            ))}
          </ul>
        </>
      )}
    </Dialog>
  );
}
