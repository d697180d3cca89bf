import { memo, useMemo } from "react";
import type { SystemInput } from "../../../../shared/engine/schema";
import type { SolveSuccess } from "../../../../shared/engine/system";
import { LoadStatusLabel } from "../../../components/ui/load-status";
import { cn } from "../../../utils/cn";
import type { Selection } from "../selection";
import { checkedDrop, fixed, limitText } from "../lib/format";
import { loadRows, statusSummary } from "../lib/results";
import { RowCapNote, useRowCap } from "./row-cap";
import { isSelected, SelectButton, selectedRowClass } from "./select-button";

export interface ResultsLoadsTableProps {
  doc: SystemInput;
  result: SolveSuccess;
  selection: Selection | null;
  onSelect(selection: Selection): void;
}

const th = "px-2 py-2 text-left font-semibold whitespace-nowrap";
const td = "px-2 py-1.5 align-top whitespace-nowrap";

/** One row per load in its worst case, worst first, with the limit it was checked against. */
export const ResultsLoadsTable = memo(function ResultsLoadsTable({ doc, result, selection, onSelect }: ResultsLoadsTableProps) {
  const rows = useMemo(() => loadRows(doc, result), [doc, result]);
  const cap = useRowCap(rows, selection?.kind === "load" ? selection.id : null);
  return (
    <div className="space-y-2">
      <p role="status" className="text-sm font-medium text-ink-800">
        {statusSummary(result.loads)}
      </p>
      {rows.length === 0 ? (
        <p className="text-sm text-ink-500">No loads yet: add one in the Loads table to see its voltage.</p>
      ) : (
        <div className="overflow-x-auto rounded-md border border-ink-100">
          <table className="min-w-full text-sm tabular-nums">
            <caption className="sr-only">Loads in their worst case, worst first</caption>
            <thead className="border-b border-ink-100 bg-ink-50 text-xs uppercase tracking-wide text-ink-500">
              <tr>
                <th scope="col" className={th}>Load</th>
                <th scope="col" className={cn(th, "text-right")}>Voltage (V)</th>
                <th scope="col" className={cn(th, "text-right")}>Drop (%)</th>
                <th scope="col" className={th}>Worst case</th>
                <th scope="col" className={cn(th, "text-right")}>Current (A)</th>
                <th scope="col" className={th}>Status</th>
                <th scope="col" className={th}>Limit</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {cap.shown.map((row) => {
                const selected = isSelected(selection, "load", row.id);
                const over = row.worst.status === "over";
                const lr = row.inWorstCase;
                return (
                  <tr
                    key={row.id}
                    data-load-id={row.id}
                    data-status={row.worst.status}
                    onClick={() => onSelect({ kind: "load", id: row.id })}
                    className={cn(
                      "cursor-pointer border-l-4",
                      over ? "border-l-over-500 bg-over-50 font-bold text-over-700" : row.worst.status === "near" ? "border-l-near-500" : "border-l-transparent",
                      selectedRowClass(selected),
                    )}
                  >
                    <td className={td}>
                      <SelectButton kind="load" id={row.id} selected={selected} onSelect={onSelect} className="text-left">
                        <span className="block">{row.name}</span>
                        {row.name !== row.id ? <span className="block text-xs font-normal text-ink-500">{row.id}</span> : null}
                      </SelectButton>
                    </td>
                    <td className={cn(td, "text-right")}>{fixed(row.worst.voltage, 2)}</td>
                    <td className={cn(td, "text-right")}>{fixed(row.worst.dropPercent, 2)}</td>
                    <td className={td}>{row.worst.worstCase}</td>
                    <td className={cn(td, "text-right")}>{lr ? fixed(lr.current, 2) : "—"}</td>
                    <td className={td}>
                      <LoadStatusLabel status={row.worst.status} />
                      {lr?.underVoltage ? <span className="block text-xs">below its minimum voltage</span> : null}
                    </td>
                    <td className={td}>
                      {lr ? limitText(lr.governingLimit, lr.limitPercent) : `${row.worst.limitPercent} %`}
                      {lr && lr.governingLimit === "branch" ? (
                        <span className="block text-xs font-normal text-ink-500">{fixed(checkedDrop(lr), 2)} % on the branch</span>
                      ) : null}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      )}
      <RowCapNote cap={cap} noun="loads" />
    </div>
  );
});
