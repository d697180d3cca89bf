import { memo, useMemo } from "react";
import { Bar, CartesianGrid, Cell, ComposedChart, Line, LineChart, ReferenceLine, Tooltip, XAxis, YAxis } from "recharts";
import type { SystemInput } from "../../../../shared/engine/schema";
import type { CaseResult, SolveSuccess } from "../../../../shared/engine/system";
import { useElementWidth } from "../hooks/use-element-width";
import { checkedDrop, COPPER, fixed, INK, lengthUnit, limitText, STATUS_COLOUR, STATUS_LABEL } from "../lib/format";
import { limitVoltage, loadRows, voltageAlongPath } from "../lib/results";

const CHART_HEIGHT = 240;
/** Bars beyond this many become unreadable; the chart shows the worst ones and says so. */
const MAX_BARS = 40;

const tooltipBox = "rounded-md border border-ink-200 bg-white px-3 py-2 text-xs text-ink-800 shadow-sm tabular-nums";

export interface PathVoltageChartProps {
  doc: SystemInput;
  kase: CaseResult;
  /** The load at the end of the path. */
  loadId: string;
}

/** "Voltage along the path": each point from the primary source to the load, against the one-way length. */
export const PathVoltageChart = memo(function PathVoltageChart({ doc, kase, loadId }: PathVoltageChartProps) {
  const [ref, width] = useElementWidth<HTMLDivElement>();
  const path = useMemo(() => voltageAlongPath(doc, kase, loadId), [doc, kase, loadId]);
  const lr = kase.loads.find((l) => l.id === loadId);
  const unit = lengthUnit(doc.units);
  const limit = lr ? limitVoltage(lr, doc.nominalVoltage) : null;
  const loadName = doc.loads.find((l) => l.id === loadId)?.name ?? loadId;
  // The load sits on its point: one line through the points, the load named at the end.
  const data = path.filter((p) => p.kind === "point").map((p) => ({ distance: p.distance, voltage: p.voltage, name: p.name, id: p.id }));
  const volts = data.map((d) => d.voltage).filter((v): v is number => v !== null);
  const low = Math.min(...volts, limit ?? Infinity);
  const high = Math.max(...volts);
  const pad = Math.max((high - low) * 0.15, 0.1);
  return (
    <figure className="space-y-2">
      <figcaption className="text-sm font-semibold text-ink-900">
        Voltage along the path <span className="font-normal text-ink-600">to {loadName}, case {kase.name}</span>
      </figcaption>
      {path.length === 0 ? (
        <p className="text-sm text-ink-500">This load has no path through runs to the primary source.</p>
      ) : (
        <>
          <div ref={ref} style={{ height: CHART_HEIGHT }} className="w-full">
            {width > 0 ? (
              <LineChart width={width} height={CHART_HEIGHT} data={data} margin={{ top: 12, right: 24, bottom: 20, left: 8 }}>
                <CartesianGrid stroke={INK[100]} />
                <XAxis type="number" dataKey="distance" domain={[0, "dataMax"]} unit={` ${unit}`} tick={{ fontSize: 11, fill: INK[500] }} label={{ value: `One-way length (${unit})`, position: "insideBottom", offset: -12, fontSize: 11, fill: INK[500] }} />
                <YAxis type="number" domain={[Math.floor((low - pad) * 10) / 10, Math.ceil((high + pad) * 10) / 10]} unit=" V" width={64} tick={{ fontSize: 11, fill: INK[500] }} />
                {limit !== null && lr ? (
                  <ReferenceLine y={limit} stroke={STATUS_COLOUR.over.stroke} strokeDasharray="6 4" label={{ value: `Limit (${limitText(lr.governingLimit, lr.limitPercent)})`, position: "insideBottomRight", fontSize: 11, fill: STATUS_COLOUR.over.text }} />
                ) : null}
                <Tooltip
                  content={({ active, payload }) => {
                    const d = active ? (payload?.[0]?.payload as (typeof data)[number] | undefined) : undefined;
                    if (!d) return null;
                    return (
                      <div className={tooltipBox}>
                        <p className="font-semibold">{d.name}</p>
                        <p>
                          {fixed(d.distance, 1)} {unit} · {d.voltage === null ? "—" : `${fixed(d.voltage, 2)} V`}
                        </p>
                      </div>
                    );
                  }}
                />
                <Line type="linear" dataKey="voltage" stroke={COPPER[600]} strokeWidth={2} dot={{ r: 3, fill: COPPER[600] }} isAnimationActive={false} name="Voltage" />
              </LineChart>
            ) : null}
          </div>
          <table className="sr-only">
            <caption>Voltage at each point from the source to {loadName}</caption>
            <thead>
              <tr>
                <th scope="col">Point</th>
                <th scope="col">Length from the source ({unit})</th>
                <th scope="col">Voltage (V)</th>
              </tr>
            </thead>
            <tbody>
              {path.map((p) => (
                <tr key={`${p.kind}-${p.id}`}>
                  <td>{p.kind === "load" ? `Load ${p.name}` : p.name}</td>
                  <td>{fixed(p.distance, 1)}</td>
                  <td>{p.voltage === null ? "—" : fixed(p.voltage, 2)}</td>
                </tr>
              ))}
            </tbody>
          </table>
          {limit !== null ? <p className="text-xs text-ink-500 tabular-nums">Dashed line: {fixed(limit, 2)} V, where this load would reach its limit in this case.</p> : null}
        </>
      )}
    </figure>
  );
});

/** "Drop % per load": the worst-case drop checked against each load's limit, bars by status (the tooltip names it). */
export const DropChart = memo(function DropChart({ doc, result }: { doc: SystemInput; result: SolveSuccess }) {
  const [ref, width] = useElementWidth<HTMLDivElement>();
  const rows = useMemo(() => loadRows(doc, result), [doc, result]);
  const shown = rows.slice(0, MAX_BARS).map((r) => ({
    id: r.id,
    name: r.name,
    drop: r.inWorstCase ? checkedDrop(r.inWorstCase) : r.worst.dropPercent,
    limit: r.worst.limitPercent,
    limitLabel: r.inWorstCase ? limitText(r.inWorstCase.governingLimit, r.inWorstCase.limitPercent) : `${r.worst.limitPercent} %`,
    status: r.worst.status,
    worstCase: r.worst.worstCase,
  }));
  return (
    <figure className="space-y-2">
      <figcaption className="text-sm font-semibold text-ink-900">
        Drop % per load{" "}
        <span className="font-normal text-ink-600">
          {rows.length > MAX_BARS ? `the ${MAX_BARS} worst of ${rows.length} loads, ` : ""}worst case, against each load's limit
        </span>
      </figcaption>
      {shown.length === 0 ? (
        <p className="text-sm text-ink-500">No loads yet.</p>
      ) : (
        <>
          <div ref={ref} style={{ height: CHART_HEIGHT }} className="w-full">
            {width > 0 ? (
              <ComposedChart width={width} height={CHART_HEIGHT} data={shown} margin={{ top: 12, right: 16, bottom: 8, left: 8 }}>
                <CartesianGrid stroke={INK[100]} vertical={false} />
                <XAxis dataKey="id" tick={{ fontSize: 11, fill: INK[500] }} interval={shown.length > 12 ? "preserveStartEnd" : 0} />
                <YAxis unit=" %" width={52} tick={{ fontSize: 11, fill: INK[500] }} />
                <Tooltip
                  content={({ active, payload }) => {
                    const d = active ? (payload?.[0]?.payload as (typeof shown)[number] | undefined) : undefined;
                    if (!d) return null;
                    return (
                      <div className={tooltipBox}>
                        <p className="font-semibold">{d.name}</p>
                        <p>
                          {fixed(d.drop, 2)} % against {d.limitLabel} in "{d.worstCase}"
                        </p>
                        <p style={{ color: STATUS_COLOUR[d.status].text }} className="font-semibold">
                          {STATUS_LABEL[d.status]}
                        </p>
                      </div>
                    );
                  }}
                />
                <Bar dataKey="drop" name="Drop" isAnimationActive={false}>
                  {shown.map((d) => (
                    <Cell key={d.id} fill={STATUS_COLOUR[d.status].stroke} />
                  ))}
                </Bar>
                {/* Each load's limit as a short dashed mark across its bar (no line between loads: limits differ per load). */}
                <Line
                  dataKey="limit"
                  name="Limit"
                  stroke="none"
                  isAnimationActive={false}
                  activeDot={false}
                  dot={({ cx, cy, index }: { cx?: number; cy?: number; index?: number }) =>
                    cx === undefined || cy === undefined ? <g key={`limit-${index}`} /> : <path key={`limit-${index}`} d={`M${cx - 16},${cy} h32`} stroke={INK[900]} strokeWidth={2.5} strokeDasharray="5 3" />
                  }
                />
              </ComposedChart>
            ) : null}
          </div>
          <p className="text-xs text-ink-500">Bars: drop in the load's worst case (branch drop where the branch limit applies). Dashed marks: each load's limit.</p>
          <table className="sr-only">
            <caption>Drop per load against its limit</caption>
            <thead>
              <tr>
                <th scope="col">Load</th>
                <th scope="col">Drop (%)</th>
                <th scope="col">Limit</th>
                <th scope="col">Status</th>
              </tr>
            </thead>
            <tbody>
              {shown.map((d) => (
                <tr key={d.id}>
                  <td>{d.name}</td>
                  <td>{fixed(d.drop, 2)}</td>
                  <td>{d.limitLabel}</td>
                  <td>{STATUS_LABEL[d.status]}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </>
      )}
    </figure>
  );
});
