// The drawn chart, in its own module: recharts is loaded after the dashboard's figures are on screen.
import { Bar, BarChart, CartesianGrid, Tooltip, XAxis, YAxis } from "recharts";
import { formatMoney } from "../../../../shared/money";
import { useElementWidth } from "../../system-editor/hooks/use-element-width";
import { COPPER, INK } from "../../system-editor/lib/format";

export interface StatusBar {
  label: string;
  count: number;
  totalMinor: number;
  /** Major units, for the axis. */
  total: number;
}

const compact = new Intl.NumberFormat("en-US", { notation: "compact", maximumFractionDigits: 1 });

export default function StatusBars({ data, currency, height }: { data: StatusBar[]; currency: string; height: number }) {
  const [ref, width] = useElementWidth<HTMLDivElement>();
  return (
    <div ref={ref} style={{ height }} className="w-full">
      {width > 0 ? (
        <BarChart width={width} height={height} data={data} margin={{ top: 8, right: 8, bottom: 4, left: 8 }}>
          <CartesianGrid stroke={INK[100]} vertical={false} />
          <XAxis dataKey="label" tick={{ fontSize: 11, fill: INK[500] }} interval={0} />
          <YAxis width={56} tick={{ fontSize: 11, fill: INK[500] }} tickFormatter={(v: number) => compact.format(v)} />
          <Tooltip
            cursor={{ fill: COPPER[50] }}
            content={({ active, payload }) => {
              const d = active ? (payload?.[0]?.payload as StatusBar | undefined) : undefined;
              if (!d) return null;
              return (
                <div className="rounded-md border border-ink-200 bg-white px-3 py-2 text-xs text-ink-800 shadow-sm tabular-nums">
                  <p className="font-semibold">{d.label}</p>
                  <p>
                    {d.count} {d.count === 1 ? "quote" : "quotes"} · {formatMoney(d.totalMinor, currency)}
                  </p>
                </div>
              );
            }}
          />
          <Bar dataKey="total" name="Money" fill={COPPER[500]} isAnimationActive={false} radius={[3, 3, 0, 0]} />
        </BarChart>
      ) : null}
    </div>
  );
}
