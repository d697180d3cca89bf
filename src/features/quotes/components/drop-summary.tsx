import type { SnapshotSystem } from "../../../../shared/schemas/estimates";
import { LoadStatusLabel } from "../../../components/ui/load-status";

const fixed = (n: number, digits: number) => (Number.isFinite(n) ? n.toFixed(digits) : "—");

/** The voltage-drop summary the quote carries: each system's loads at their worst case, with their status in words. */
export function DropSummary({ systems }: { systems: SnapshotSystem[] }) {
  return (
    <section aria-labelledby="drop-heading" className="space-y-3">
      <h2 id="drop-heading" className="text-base font-semibold text-ink-900">
        Voltage drop
      </h2>
      {systems.length === 0 ? <p className="text-sm text-ink-500">The quote carries no systems.</p> : null}
      {systems.map((system) => {
        const over = system.loads.filter((l) => l.status === "over").length;
        return (
          <div key={system.id} className="space-y-2 rounded-lg border border-ink-100 bg-white p-4">
            <div className="flex flex-wrap items-baseline justify-between gap-2">
              <h3 className="text-sm font-semibold text-ink-900">{system.name}</h3>
              <p className="text-xs text-ink-500 tabular-nums">
                {system.nominalVoltage} V · {system.limitProfile.name} (branch {system.limitProfile.branchPercent} %, total {system.limitProfile.totalPercent} %)
              </p>
            </div>
            {!system.solved ? (
              <p className="text-sm font-medium text-over-700">
                <span aria-hidden="true">✕ </span>This system could not be solved when the quote was made.
              </p>
            ) : system.loads.length === 0 ? (
              <p className="text-sm text-ink-500">No loads.</p>
            ) : (
              <div className="overflow-x-auto">
                <table className="w-full min-w-[32rem] text-sm">
                  <caption className="sr-only">Voltage drop per load of {system.name}</caption>
                  <thead className="text-left text-xs font-medium uppercase tracking-wide text-ink-500">
                    <tr>
                      <th scope="col" className="py-1 pr-3">
                        Load
                      </th>
                      <th scope="col" className="py-1 pr-3">
                        Worst case
                      </th>
                      <th scope="col" className="py-1 pr-3 text-right">
                        Voltage
                      </th>
                      <th scope="col" className="py-1 pr-3 text-right">
                        Drop
                      </th>
                      <th scope="col" className="py-1 pr-3 text-right">
                        Limit
                      </th>
                      <th scope="col" className="py-1">
                        Status
                      </th>
                    </tr>
                  </thead>
                  <tbody>
                    {system.loads.map((load) => (
                      <tr key={load.id} className="border-t border-ink-50">
                        <td className="py-1 pr-3 text-ink-900">{load.name}</td>
                        <td className="py-1 pr-3 text-ink-600">{load.worstCase}</td>
                        <td className="whitespace-nowrap py-1 pr-3 text-right tabular-nums">{fixed(load.voltage, 2)} V</td>
                        <td className="whitespace-nowrap py-1 pr-3 text-right tabular-nums">{fixed(load.dropPercent, 2)} %</td>
                        <td className="whitespace-nowrap py-1 pr-3 text-right tabular-nums">{load.limitPercent} %</td>
                        <td className="py-1">
                          <LoadStatusLabel status={load.status} />
                        </td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            )}
            {over > 0 ? (
              <p className="text-xs font-medium text-over-700">
                {over} {over === 1 ? "load was" : "loads were"} over the drop limit when this quote was made.
              </p>
            ) : null}
          </div>
        );
      })}
    </section>
  );
}
