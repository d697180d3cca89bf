import { useId, useMemo, useRef, useState, type KeyboardEvent } from "react";
import type { SystemInput } from "../../../../shared/engine/schema";
import { FormAlert, secondaryButtonClass } from "../../../components/ui/form";
import { cn } from "../../../utils/cn";
import type { LiveSolve } from "../hooks/use-live-solve";
import type { Selection } from "../selection";
import { CaseSelect } from "./case-select";
import { DropChart, PathVoltageChart } from "./results-charts";
import { ResultsFindings } from "./results-findings";
import { ResultsLoadsTable } from "./results-loads-table";
import { ResultsPointsTable } from "./results-points-table";
import { ResultsRunsTable } from "./results-runs-table";
import { SolveErrors } from "./solve-errors";

export type ResultsTab = "loads" | "runs" | "points" | "findings";
const TABS: Array<{ id: ResultsTab; label: string }> = [
  { id: "loads", label: "Loads" },
  { id: "runs", label: "Runs" },
  { id: "points", label: "Points" },
  { id: "findings", label: "Findings" },
];

export interface ResultsPanelProps {
  /** The document as edited now (errors select from it). */
  doc: SystemInput;
  live: LiveSolve;
  selection: Selection | null;
  onSelect(selection: Selection | null): void;
  /** The case the runs, points and path chart show. */
  caseName: string | null;
  onCaseChange(name: string): void;
  /** The load the path chart follows. */
  chartLoadId: string | null;
}

/** "Results": the summary, the loads / runs / points / findings tables and the charts, dimmed while a new solve runs. */
export function ResultsPanel({ doc, live, selection, onSelect, caseName, onCaseChange, chartLoadId }: ResultsPanelProps) {
  const [tab, setTab] = useState<ResultsTab>("loads");
  const base = useId();
  const tabRefs = useRef<Array<HTMLButtonElement | null>>([]);
  const { lastGood, lastGoodDoc, failure, requestError, stale } = live;
  const kase = useMemo(() => lastGood?.cases.find((c) => c.name === caseName) ?? lastGood?.cases[0], [lastGood, caseName]);
  const caseNames = useMemo(() => lastGood?.cases.map((c) => c.name) ?? [], [lastGood]);

  const onTabKey = (event: KeyboardEvent<HTMLButtonElement>, index: number) => {
    const step = event.key === "ArrowRight" ? 1 : event.key === "ArrowLeft" ? -1 : 0;
    if (!step) return;
    event.preventDefault();
    const next = (index + step + TABS.length) % TABS.length;
    setTab(TABS[next].id);
    tabRefs.current[next]?.focus();
  };

  return (
    <section aria-labelledby={`${base}-heading`} aria-busy={stale} className="space-y-3 rounded-lg border border-ink-100 bg-white p-4">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id={`${base}-heading`} className="text-base font-semibold text-ink-900">
          Results
        </h2>
        <p aria-live="polite" className="text-sm text-ink-500">
          {stale ? (
            <span className="inline-flex items-center gap-1">
              <span aria-hidden="true" className="h-2 w-2 animate-pulse rounded-full bg-copper-400" />
              Updating…
            </span>
          ) : null}
        </p>
      </div>

      {requestError ? (
        <div className="flex flex-wrap items-center gap-2">
          <FormAlert message={`The results could not be updated: ${requestError}`} className="flex-1" />
          <button type="button" onClick={live.retry} className={secondaryButtonClass}>
            Try again
          </button>
        </div>
      ) : null}
      {failure ? <SolveErrors doc={doc} errors={failure.errors} onSelect={onSelect} /> : null}
      {failure && lastGood ? (
        <p className="rounded-md border border-near-100 bg-near-50 px-3 py-1.5 text-sm font-medium text-near-700">Results are from the last valid layout</p>
      ) : null}

      {!lastGood || !lastGoodDoc ? (
        failure || requestError ? (
          <p className="text-sm text-ink-500">No results yet: the figures appear as soon as the layout solves.</p>
        ) : (
          <div aria-hidden="true" className="space-y-2">
            <p className="text-sm text-ink-500">Solving…</p>
            <div className="h-4 w-2/3 animate-pulse rounded bg-ink-100" />
            <div className="h-4 w-1/2 animate-pulse rounded bg-ink-100" />
          </div>
        )
      ) : (
        <div className={cn("space-y-4 transition-opacity", stale && "opacity-60")} data-stale={stale ? "true" : undefined}>
          <div role="tablist" aria-label="Results" className="flex gap-1 border-b border-ink-100">
            {TABS.map((t, i) => {
              const count = t.id === "findings" ? lastGood.findings.length : null;
              return (
                <button
                  key={t.id}
                  ref={(el) => {
                    tabRefs.current[i] = el;
                  }}
                  type="button"
                  role="tab"
                  id={`${base}-tab-${t.id}`}
                  aria-selected={tab === t.id}
                  aria-controls={`${base}-panel-${t.id}`}
                  tabIndex={tab === t.id ? 0 : -1}
                  onClick={() => setTab(t.id)}
                  onKeyDown={(event) => onTabKey(event, i)}
                  className={cn(
                    "-mb-px border-b-2 px-3 py-1.5 text-sm font-medium",
                    tab === t.id ? "border-copper-500 text-ink-900" : "border-transparent text-ink-500 hover:text-ink-800",
                  )}
                >
                  {t.label}
                  {count !== null ? ` (${count})` : ""}
                </button>
              );
            })}
          </div>
          <div role="tabpanel" id={`${base}-panel-${tab}`} aria-labelledby={`${base}-tab-${tab}`} className="space-y-2">
            {tab === "loads" ? <ResultsLoadsTable doc={lastGoodDoc} result={lastGood} selection={selection} onSelect={onSelect} /> : null}
            {tab === "runs" && kase ? (
              <>
                <CaseSelect cases={caseNames} value={kase.name} onChange={onCaseChange} />
                <ResultsRunsTable doc={lastGoodDoc} kase={kase} findings={lastGood.findings} selection={selection} onSelect={onSelect} />
              </>
            ) : null}
            {tab === "points" && kase ? (
              <>
                <CaseSelect cases={caseNames} value={kase.name} onChange={onCaseChange} />
                <ResultsPointsTable doc={lastGoodDoc} kase={kase} findings={lastGood.findings} selection={selection} onSelect={onSelect} />
              </>
            ) : null}
            {tab === "findings" ? <ResultsFindings doc={lastGoodDoc} findings={lastGood.findings} onSelect={onSelect} /> : null}
          </div>
          <div className="grid gap-6 border-t border-ink-100 pt-4 lg:grid-cols-2">
            {kase && chartLoadId ? <PathVoltageChart doc={lastGoodDoc} kase={kase} loadId={chartLoadId} /> : <p className="text-sm text-ink-500">Add a load to see the voltage along its path.</p>}
            <DropChart doc={lastGoodDoc} result={lastGood} />
          </div>
        </div>
      )}
    </section>
  );
}
