import { memo, useMemo } from "react";
import type { SystemInput } from "../../../../shared/engine/schema";
import type { CaseResult, Finding } from "../../../../shared/engine/system";
import { cn } from "../../../utils/cn";
import { RowCapNote, useRowCap } from "./row-cap";
import { isSelected, SelectButton, selectedRowClass } from "./select-button";
import type { Selection } from "../selection";
import { fixed, formatSize, lengthUnit } from "../lib/format";
import { fuseFindingsByRun } from "../lib/results";

export interface ResultsRunsTableProps {
  doc: SystemInput;
  /** The case shown. */
  kase: CaseResult;
  findings: readonly Finding[];
  selection: Selection | null;
  onSelect(selection: Selection): void;
}

const th = "px-2 py-2 text-left font-semibold whitespace-nowrap";
const td = "px-2 py-1.5 align-top whitespace-nowrap";

/** Ampacity use as a bar and a number; "—" when the reference table has no value for the size. */
function AmpacityUse({ percent }: { percent: number | null }) {
  if (percent === null) return <span title="Not checked: the ampacity table has no value for this size">—</span>;
  const tone = percent > 100 ? "bg-over-500" : percent > 80 ? "bg-near-500" : "bg-within-500";
  return (
    <span className="flex items-center gap-2">
      <span aria-hidden="true" className="relative h-2 w-16 overflow-hidden rounded-full bg-ink-100">
        <span className={cn("absolute inset-y-0 left-0", tone)} style={{ width: `${Math.min(percent, 100)}%` }} />
      </span>
      <span className={cn("tabular-nums", percent > 100 && "font-bold text-over-700")}>
        {Math.round(percent)} %{percent > 100 ? " (over ampacity)" : ""}
      </span>
    </span>
  );
}

/** Every run in one case: current, drop, loss, ampacity use and the fuse check. */
export const ResultsRunsTable = memo(function ResultsRunsTable({ doc, kase, findings, selection, onSelect }: ResultsRunsTableProps) {
  const fuse = useMemo(() => fuseFindingsByRun(findings), [findings]);
  const byId = useMemo(() => new Map(kase.runs.map((r) => [r.id, r])), [kase]);
  const cap = useRowCap(doc.runs, selection?.kind === "run" ? selection.id : null);
  if (doc.runs.length === 0) return <p className="text-sm text-ink-500">No runs yet: add one in the Runs table.</p>;
  return (
    <div className="overflow-x-auto rounded-md border border-ink-100">
      <table className="min-w-full text-sm tabular-nums">
        <caption className="sr-only">Runs in the case {kase.name}</caption>
        <thead className="border-b border-ink-100 bg-ink-50 text-xs uppercase tracking-wide text-ink-500">
          <tr>
            <th scope="col" className={th}>Run</th>
            <th scope="col" className={th}>From → to</th>
            <th scope="col" className={th}>Size</th>
            <th scope="col" className={cn(th, "text-right")}>Length ({lengthUnit(doc.units)})</th>
            <th scope="col" className={cn(th, "text-right")}>Current (A)</th>
            <th scope="col" className={cn(th, "text-right")}>Drop (V)</th>
            <th scope="col" className={cn(th, "text-right")}>Loss (W)</th>
            <th scope="col" className={th}>Ampacity use</th>
            <th scope="col" className={th}>Fuse check</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-ink-100">
          {cap.shown.map((run) => {
            const rr = byId.get(run.id);
            const problems = fuse.get(run.id) ?? [];
            const selected = isSelected(selection, "run", run.id);
            return (
              <tr
                key={run.id}
                data-run-id={run.id}
                onClick={() => onSelect({ kind: "run", id: run.id })}
                className={cn("cursor-pointer", selectedRowClass(selected))}
              >
                <td className={td}>
                  <SelectButton kind="run" id={run.id} selected={selected} onSelect={onSelect} className="text-left font-medium">
                    {run.id}
                  </SelectButton>
                </td>
                <td className={cn(td, "whitespace-nowrap")}>
                  {run.from} → {run.to}
                </td>
                <td className={cn(td, "whitespace-nowrap")}>
                  {formatSize(run.size)}
                  {(run.parallel ?? 1) > 1 ? ` × ${run.parallel}` : ""}
                </td>
                <td className={cn(td, "text-right")}>{typeof run.length === "number" ? (Number.isInteger(run.length) ? run.length : fixed(run.length, 1)) : run.length}</td>
                <td className={cn(td, "text-right")}>{rr ? fixed(Math.abs(rr.current), 2) : "—"}</td>
                <td className={cn(td, "text-right")}>{rr ? fixed(rr.dropV, 3) : "—"}</td>
                <td className={cn(td, "text-right")}>{rr ? fixed(rr.lossW, 1) : "—"}</td>
                <td className={td}>{rr ? <AmpacityUse percent={rr.utilizationPercent} /> : "—"}</td>
                <td className={td}>
                  {problems.length === 0 ? (
                    run.fuseA !== undefined ? (
                      <span className="text-within-700">OK</span>
                    ) : (
                      <span className="text-ink-500" title="No fuse is entered for this run; the engine asks for one only where a run leaves a battery">No fuse</span>
                    )
                  ) : (
                    <ul className="space-y-1">
                      {problems.map((f) => (
                        <li key={f.code} className={cn("min-w-[14rem] max-w-xs whitespace-normal", f.severity === "error" ? "font-semibold text-over-700" : "text-near-700")}>
                          {f.message}
                        </li>
                      ))}
                    </ul>
                  )}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      <RowCapNote cap={cap} noun="runs" />
    </div>
  );
});
