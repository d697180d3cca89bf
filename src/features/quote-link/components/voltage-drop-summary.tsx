import type { SnapshotSystem } from "../../../../shared/schemas/estimates";
import { LOAD_STATUS_LABELS, LoadStatusLabel, type LoadStatus } from "../../../components/ui/load-status";
import { fixed, formatPercent, formatSize } from "../utils/format";

const th = "px-2 py-2 text-left sm:px-3 text-xs font-semibold uppercase tracking-wide text-ink-500";
const td = "px-2 py-2 align-top sm:px-3 text-sm text-ink-800";
/** Columns that fold under the first cell on a phone. */
const wide = "hidden sm:table-cell";

/** Per system: the voltage at every load against its limit, and the runs that feed them. */
export function VoltageDropSummary({ systems }: { systems: readonly SnapshotSystem[] }) {
  if (systems.length === 0) return <p className="text-sm text-ink-500">This quote has no DC systems to check.</p>;
  return (
    <div className="space-y-8">
      {systems.map((system) => (
        <SystemSummary key={system.id} system={system} />
      ))}
    </div>
  );
}

/** "3 loads: 2 within limit, 1 over limit". */
function countsText(loads: SnapshotSystem["loads"]): string {
  const order: LoadStatus[] = ["within", "near", "over"];
  const parts = order
    .map((status) => ({ status, count: loads.filter((l) => l.status === status).length }))
    .filter((p) => p.count > 0)
    .map((p) => `${p.count} ${LOAD_STATUS_LABELS[p.status].toLowerCase()}`);
  return `${loads.length} ${loads.length === 1 ? "load" : "loads"}${parts.length ? `: ${parts.join(", ")}` : ""}`;
}

function SystemSummary({ system }: { system: SnapshotSystem }) {
  const headingId = `system-${system.id}`;
  const pointName = new Map(system.points.map((p) => [p.id, p.name]));
  const place = (id: string) => pointName.get(id) ?? id;
  const lengthUnit = system.units === "imperial" ? "ft" : "m";
  const { limitProfile } = system;
  return (
    <section aria-labelledby={headingId} className="break-inside-avoid-page">
      <h3 id={headingId} className="text-base font-semibold text-ink-900">
        {system.name}
      </h3>
      <p className="mt-0.5 text-sm text-ink-600">
        {fixed(system.nominalVoltage, 0)} V nominal · drop limits “{limitProfile.name}”: branch {formatPercent(limitProfile.branchPercent)}, total{" "}
        {formatPercent(limitProfile.totalPercent)}, critical loads {formatPercent(limitProfile.criticalPercent)}
      </p>
      {!system.solved ? (
        <p className="mt-2 text-sm font-medium text-ink-700">This system had not been checked when the quote was made.</p>
      ) : (
        <p className="mt-1 text-sm text-ink-600">
          {countsText(system.loads)}
          {system.caseNames.length > 0 ? `, each at the worst of: ${system.caseNames.join("; ")}.` : "."}
        </p>
      )}

      {system.loads.length > 0 ? (
        <div className="-mx-3 mt-3 overflow-x-auto sm:mx-0">
          <table className="w-full border-collapse">
            <caption className="px-2 pb-1 sm:px-3 text-left text-sm font-semibold text-ink-800">Loads</caption>
            <thead className="border-b border-ink-200">
              <tr>
                <th scope="col" className={th}>
                  Load
                </th>
                <th scope="col" className={`${th} ${wide} text-right`}>
                  Voltage
                </th>
                <th scope="col" className={`${th} ${wide} text-right`}>
                  Drop
                </th>
                <th scope="col" className={`${th} ${wide} text-right`}>
                  Limit
                </th>
                <th scope="col" className={th}>
                  Status
                </th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {system.loads.map((load) => (
                <tr key={load.id}>
                  <th scope="row" className={`${td} text-left font-medium`}>
                    {load.name}
                    <span className="block font-normal text-ink-700 sm:hidden">
                      {fixed(load.voltage, 2)} V · drop {fixed(load.dropPercent, 2)} % · limit {formatPercent(load.limitPercent)}
                    </span>
                    {load.worstCase ? <span className="block text-xs font-normal text-ink-500">Worst case: {load.worstCase}</span> : null}
                  </th>
                  <td className={`${td} ${wide} whitespace-nowrap text-right`}>{fixed(load.voltage, 2)} V</td>
                  <td className={`${td} ${wide} whitespace-nowrap text-right`}>{fixed(load.dropPercent, 2)} %</td>
                  <td className={`${td} ${wide} whitespace-nowrap text-right`}>{formatPercent(load.limitPercent)}</td>
                  <td className={td}>
                    <LoadStatusLabel status={load.status} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}

      {system.runs.length > 0 ? (
        <div className="-mx-3 mt-4 overflow-x-auto sm:mx-0">
          <table className="w-full border-collapse">
            <caption className="px-2 pb-1 sm:px-3 text-left text-sm font-semibold text-ink-800">Runs</caption>
            <thead className="border-b border-ink-200">
              <tr>
                <th scope="col" className={th}>
                  Run
                </th>
                <th scope="col" className={`${th} ${wide}`}>
                  From → to
                </th>
                <th scope="col" className={th}>
                  Size
                </th>
                <th scope="col" className={`${th} text-right`}>
                  Length
                </th>
                <th scope="col" className={`${th} text-right`}>
                  Current
                </th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {system.runs.map((run) => (
                <tr key={run.id}>
                  <th scope="row" className={`${td} text-left font-medium`}>
                    {run.name || run.id}
                    <span className="block text-xs font-normal text-ink-500 sm:hidden">
                      {place(run.from)} → {place(run.to)}
                    </span>
                  </th>
                  <td className={`${td} ${wide}`}>
                    {place(run.from)} → {place(run.to)}
                  </td>
                  <td className={`${td} whitespace-nowrap`}>{sizeText(run)}</td>
                  <td className={`${td} whitespace-nowrap text-right`}>
                    {Number.isInteger(run.length) ? run.length : fixed(run.length, 1)} {lengthUnit}
                  </td>
                  <td className={`${td} whitespace-nowrap text-right`}>{run.maxCurrentA === null ? "—" : `${fixed(run.maxCurrentA, 1)} A`}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
    </section>
  );
}

/** "16 mm²", "2 × 35 mm²", "16 mm², return 10 mm²", "6 AWG aluminum". */
function sizeText(run: SnapshotSystem["runs"][number]): string {
  let text = formatSize(run.size);
  if (run.parallel > 1) text = `${run.parallel} × ${text}`;
  if (run.returnSize && run.returnSize !== run.size) text += `, return ${formatSize(run.returnSize)}`;
  if (run.material === "aluminum") text += " aluminum";
  return text;
}
