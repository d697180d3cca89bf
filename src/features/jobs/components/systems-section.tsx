import { useState } from "react";
import { Link, useNavigate } from "react-router-dom";
import type { SystemSummary } from "../../../../shared/schemas/jobs";
import { primaryButtonClass } from "../../../components/ui/form";
import { paths } from "../../../config/paths";
import { formatDate } from "../../../utils/format-date";
import { Dialog } from "../../../components/ui/dialog";
import { LoadStatusLabel } from "../../../components/ui/load-status";
import { NewSystemForm } from "./new-system-form";
import { CautionsPanel } from "../../../components/ui/cautions-panel";

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

/** What the last save's solve said, in words: worst status, worst drop and the counts. */
function SolveSummary({ system }: { system: SystemSummary }) {
  const solve = system.lastSolve;
  if (!solve) return <LoadStatusLabel status={null} />;
  if (solve.errors > 0) {
    return (
      <span className="inline-flex items-center gap-1.5 font-medium text-over-700">
        <span aria-hidden="true">✕</span>
        Could not be solved: {plural(solve.errors, "problem", "problems")} to fix
      </span>
    );
  }
  if (solve.worstStatus === null) return <LoadStatusLabel status={null} emptyText="No loads to check" />;
  return (
    <div className="space-y-1">
      <LoadStatusLabel status={solve.worstStatus} />
      {solve.worstDropPercent !== null ? <p className="tabular-nums text-ink-700">Worst drop {solve.worstDropPercent.toFixed(1)} %</p> : null}
      <p className="tabular-nums text-xs text-ink-500">
        {solve.over} over · {solve.near} near · {solve.within} within
      </p>
    </div>
  );
}

interface SystemsSectionProps {
  jobId: string;
  systems: SystemSummary[];
  canWrite: boolean;
}

/** The job's systems, each a card linking to its editor; writers start a new one here. */
export function SystemsSection({ jobId, systems, canWrite }: SystemsSectionProps) {
  const navigate = useNavigate();
  const [creating, setCreating] = useState(false);
  return (
    <section aria-labelledby="systems-heading" className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h2 id="systems-heading" className="text-base font-semibold text-ink-900">
            Systems
          </h2>
          <p className="mt-1 text-sm text-ink-500">Each system is one DC network: its sources, cable runs and loads, checked at every load.</p>
        </div>
        {canWrite ? (
          <button type="button" onClick={() => setCreating(true)} className={primaryButtonClass}>
            New system
          </button>
        ) : null}
      </div>
      {systems.length === 0 ? (
        <p className="rounded-lg border border-dashed border-ink-200 bg-white px-4 py-6 text-center text-sm text-ink-500">
          {canWrite
            ? "No systems yet. Start one to lay out the battery bank, the runs and the loads; the voltage at every load is checked as you go."
            : "No systems have been laid out for this job yet."}
        </p>
      ) : (
        <ul aria-label="Systems" className="grid gap-3 md:grid-cols-2">
          {systems.map((system) => (
            <li key={system.id} className="flex flex-col gap-3 rounded-lg border border-ink-100 bg-white p-4 text-sm">
              <div className="flex flex-wrap items-baseline justify-between gap-2">
                <h3 className="text-base font-semibold">
                  <Link to={paths.system.getHref(jobId, system.id)} className="text-ink-900 underline-offset-2 hover:text-copper-700 hover:underline">
                    {system.name}
                  </Link>
                </h3>
                <span className="text-xs text-ink-500">Updated {formatDate(system.updatedAt)}</span>
              </div>
              <dl className="grid grid-cols-2 gap-x-4 gap-y-1 text-ink-700 sm:grid-cols-4">
                <div>
                  <dt className="text-xs text-ink-500">Nominal voltage</dt>
                  <dd className="tabular-nums">{system.nominalVoltage} V</dd>
                </div>
                <div>
                  <dt className="text-xs text-ink-500">Units</dt>
                  <dd>{system.units === "metric" ? "Metric" : "Imperial"}</dd>
                </div>
                <div>
                  <dt className="text-xs text-ink-500">Loads</dt>
                  <dd className="tabular-nums">{system.loadCount}</dd>
                </div>
                <div>
                  <dt className="text-xs text-ink-500">Runs</dt>
                  <dd className="tabular-nums">{system.runCount}</dd>
                </div>
              </dl>
              <div className="border-t border-ink-100 pt-3">
                <SolveSummary system={system} />
              </div>
            </li>
          ))}
        </ul>
      )}
      {systems.length > 0 ? <CautionsPanel /> : null}
      {creating ? (
        <Dialog size="md" closeButton title="New system" description="It starts with a battery bank on a bus bar at the nominal voltage." onClose={() => setCreating(false)}>
          <NewSystemForm
            jobId={jobId}
            defaultUnits={systems[0]?.units}
            onCreated={(system) => navigate(paths.system.getHref(jobId, system.id))}
            onCancel={() => setCreating(false)}
          />
        </Dialog>
      ) : null}
    </section>
  );
}
