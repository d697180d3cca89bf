import { memo, useMemo } from "react";
import type { SystemInput } from "../../../../shared/engine/schema";
import type { CaseResult, Finding } from "../../../../shared/engine/system";
import { cn } from "../../../utils/cn";
import { RowCapNote, useRowCap } from "./row-cap";
import { isSelected, SelectButton, selectedRowClass } from "./select-button";
import type { Selection } from "../selection";
import { fixed, formatFault } from "../lib/format";
import { faultFindingsByPoint } from "../lib/results";

export interface ResultsPointsTableProps {
  doc: SystemInput;
  kase: CaseResult;
  findings: readonly Finding[];
  selection: Selection | null;
  onSelect(selection: Selection): void;
}

const th = "px-2 py-2 text-left font-semibold whitespace-nowrap";
const td = "px-2 py-1.5 align-top whitespace-nowrap";

/** Every point in one case: voltage and the available fault current against the interrupting ratings. */
export const ResultsPointsTable = memo(function ResultsPointsTable({ doc, kase, findings, selection, onSelect }: ResultsPointsTableProps) {
  const pointIds = useMemo(() => new Set(doc.points.map((p) => p.id)), [doc.points]);
  const fault = useMemo(() => faultFindingsByPoint(findings, pointIds), [findings, pointIds]);
  const byId = useMemo(() => new Map(kase.points.map((p) => [p.id, p])), [kase]);
  const cap = useRowCap(doc.points, selection?.kind === "point" ? selection.id : null);
  if (doc.points.length === 0) return <p className="text-sm text-ink-500">No points yet: add one in the Points table.</p>;
  return (
    <div className="overflow-x-auto rounded-md border border-ink-100">
      <table className="min-w-full text-sm tabular-nums">
        <caption className="sr-only">Points in the case {kase.name}</caption>
        <thead className="border-b border-ink-100 bg-ink-50 text-xs uppercase tracking-wide text-ink-500">
          <tr>
            <th scope="col" className={th}>Point</th>
            <th scope="col" className={cn(th, "text-right")}>Voltage (V)</th>
            <th scope="col" className={cn(th, "text-right")}>Available fault current</th>
            <th scope="col" className={th}>Interrupting rating</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-ink-100">
          {cap.shown.map((point) => {
            const pr = byId.get(point.id);
            const problems = fault.get(point.id) ?? [];
            const selected = isSelected(selection, "point", point.id);
            return (
              <tr
                key={point.id}
                data-point-id={point.id}
                onClick={() => onSelect({ kind: "point", id: point.id })}
                className={cn("cursor-pointer", selectedRowClass(selected))}
              >
                <td className={td}>
                  <SelectButton kind="point" id={point.id} selected={selected} onSelect={onSelect} className="text-left">
                    <span className="block font-medium">{point.id}</span>
                    {point.name ? <span className="block text-xs text-ink-500">{point.name}</span> : null}
                  </SelectButton>
                </td>
                <td className={cn(td, "text-right")}>{pr ? fixed(pr.voltage, 2) : "—"}</td>
                <td className={cn(td, "text-right")}>{pr ? formatFault(pr.faultCurrentA) : "—"}</td>
                <td className={td}>
                  {problems.length > 0 ? (
                    <ul className="space-y-1">
                      {problems.map((f) => (
                        <li key={f.message} className="min-w-[14rem] max-w-sm whitespace-normal font-semibold text-over-700">
                          {f.message}
                        </li>
                      ))}
                    </ul>
                  ) : point.fuseInterruptingA !== undefined ? (
                    <span className="text-within-700">OK ({formatFault(point.fuseInterruptingA)} rated)</span>
                  ) : (
                    <span className="text-ink-500">—</span>
                  )}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      <RowCapNote cap={cap} noun="points" />
    </div>
  );
});
