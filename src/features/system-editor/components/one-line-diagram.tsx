import { memo, useCallback, useEffect, useMemo, useRef, useState, type KeyboardEvent, type PointerEvent as ReactPointerEvent } from "react";
import type { SystemInput } from "../../../../shared/engine/schema";
import type { CaseResult, LoadStatus, SolveSuccess } from "../../../../shared/engine/system";
import { secondaryButtonClass } from "../../../components/ui/form";
import { LoadStatusGlyph } from "../../../components/ui/load-status";
import type { ElementKind, Selection } from "../selection";
import { COPPER, fixed, formatLength, formatSize, INK, STATUS_COLOUR, STATUS_LABEL } from "../lib/format";
import { useElementWidth } from "../hooks/use-element-width";
import { layoutDiagram, topologyOf, type DiagramLayout, type LayoutEdge, type LayoutNode } from "../lib/diagram-layout";

export interface OneLineDiagramProps {
  doc: SystemInput;
  /** The results to label with (the last good ones); null before the first solve. */
  result: SolveSuccess | null;
  /** The case whose currents and voltages label the runs and points. */
  caseName: string | null;
  selection: Selection | null;
  onSelect(selection: Selection | null): void;
}

interface ViewBox {
  x: number;
  y: number;
  w: number;
  h: number;
}

const FONT = "Inter, system-ui, sans-serif";
const ZOOM_STEP = 1.25;
const PAN_STEP = 0.1;

const fitView = (layout: DiagramLayout): ViewBox => ({ x: 0, y: 0, w: Math.max(layout.width, 200), h: Math.max(layout.height, 120) });

/** Below this scale the labels are too small to read: a wider diagram starts at its sources, at this scale, to be panned. */
const MIN_START_SCALE = 0.75;
const DEFAULT_HEIGHT_PX = 448;

/** The scale and height (px) the diagram is first shown at in a box this wide. */
function startScale(layout: DiagramLayout, widthPx: number) {
  if (widthPx <= 0) return { scale: 1, heightPx: DEFAULT_HEIGHT_PX };
  const full = fitView(layout);
  const scale = Math.min(1, Math.max(MIN_START_SCALE, widthPx / full.w));
  return { scale, heightPx: Math.round(Math.min(560, Math.max(220, full.h * scale + 8))) };
}

function startView(layout: DiagramLayout, widthPx: number): ViewBox {
  const full = fitView(layout);
  if (widthPx <= 0) return full;
  const { scale, heightPx } = startScale(layout, widthPx);
  const w = widthPx / scale;
  const h = heightPx / scale;
  const source = layout.nodes.find((n) => n.kind === "source");
  const x = w >= full.w ? (full.w - w) / 2 : 0;
  const y = h >= full.h ? (full.h - h) / 2 : Math.max(0, Math.min((source?.y ?? full.h / 2) - h / 2, full.h - h));
  return { x, y, w, h };
}

const truncate = (text: string, max: number) => (text.length > max ? `${text.slice(0, max - 1)}…` : text);

function download(name: string, blob: Blob) {
  if (typeof URL.createObjectURL !== "function") return;
  const url = URL.createObjectURL(blob);
  const a = document.createElement("a");
  a.href = url;
  a.download = name;
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

/** The whole diagram as a standalone SVG: every style is an attribute already; the focus ring is left out. */
function serialiseSvg(svg: SVGSVGElement, layout: DiagramLayout): string {
  const copy = svg.cloneNode(true) as SVGSVGElement;
  copy.querySelectorAll("[data-export='skip']").forEach((el) => el.remove());
  const view = fitView(layout);
  copy.setAttribute("xmlns", "http://www.w3.org/2000/svg");
  copy.setAttribute("viewBox", `${view.x} ${view.y} ${view.w} ${view.h}`);
  copy.setAttribute("width", String(Math.ceil(view.w)));
  copy.setAttribute("height", String(Math.ceil(view.h)));
  copy.setAttribute("font-family", FONT);
  copy.removeAttribute("class");
  copy.removeAttribute("style");
  copy.removeAttribute("tabindex");
  const background = document.createElementNS("http://www.w3.org/2000/svg", "rect");
  background.setAttribute("x", String(view.x));
  background.setAttribute("y", String(view.y));
  background.setAttribute("width", String(view.w));
  background.setAttribute("height", String(view.h));
  background.setAttribute("fill", "#ffffff");
  copy.insertBefore(background, copy.firstChild);
  return new XMLSerializer().serializeToString(copy);
}

function edgePath(edge: LayoutEdge): string {
  if (edge.points.length === 0) return "";
  return edge.points.map((p, i) => `${i === 0 ? "M" : "L"}${p.x.toFixed(1)},${p.y.toFixed(1)}`).join(" ");
}

interface NodeFigures {
  title: string;
  lines: string[];
  status?: LoadStatus;
  ariaLabel: string;
}

function NodeShape({ node, figures, sourceType, selected }: { node: LayoutNode; figures: NodeFigures; sourceType?: string; selected: boolean }) {
  const left = node.x - node.width / 2;
  const top = node.y - node.height / 2;
  const stroke = selected ? COPPER[500] : INK[700];
  const strokeWidth = selected ? 3 : 1.4;
  if (node.kind === "point") {
    // A bus bar: a thick bar with the point's name over it.
    return (
      <>
        <rect x={left} y={node.y - 3} width={node.width} height={8} rx={2} fill={selected ? COPPER[500] : INK[700]} />
        <text x={node.x} y={top + 8} textAnchor="middle" fontSize={11} fontWeight={600} fill={INK[900]} fontFamily={FONT}>
          {truncate(figures.title, 24)}
        </text>
        {figures.lines[0] ? (
          <text x={node.x} y={node.y + 17} textAnchor="middle" fontSize={10} fill={INK[500]} fontFamily={FONT}>
            {figures.lines[0]}
          </text>
        ) : null}
        <rect x={left - 4} y={top - 4} width={node.width + 8} height={node.height + 8} fill="transparent" stroke={selected ? COPPER[500] : "none"} strokeWidth={selected ? 2 : 0} rx={4} />
      </>
    );
  }
  if (node.kind === "source") {
    // A battery: long and short plates; a supply: a circle with "="; a PV array: a panel with a diagonal.
    const sx = left + 22;
    return (
      <>
        <rect x={left} y={top} width={node.width} height={node.height} rx={6} fill="#ffffff" stroke={stroke} strokeWidth={strokeWidth} />
        {sourceType === "battery" ? (
          <g stroke={INK[900]} strokeWidth={2.2} strokeLinecap="round">
            <path d={`M${sx - 9},${node.y - 11} v22`} />
            <path d={`M${sx - 3},${node.y - 6} v12`} />
            <path d={`M${sx + 3},${node.y - 11} v22`} />
            <path d={`M${sx + 9},${node.y - 6} v12`} />
          </g>
        ) : sourceType === "pvArray" ? (
          <g stroke={INK[900]} strokeWidth={1.6} fill="none">
            <rect x={sx - 11} y={node.y - 10} width={22} height={20} />
            <path d={`M${sx - 11},${node.y + 10} L${sx + 11},${node.y - 10}`} />
          </g>
        ) : (
          <g stroke={INK[900]} strokeWidth={1.6} fill="none">
            <circle cx={sx} cy={node.y} r={11} />
            <path d={`M${sx - 5},${node.y - 2.5} h10 M${sx - 5},${node.y + 2.5} h10`} />
          </g>
        )}
        <text x={left + 42} y={node.y - 6} fontSize={11} fontWeight={600} fill={INK[900]} fontFamily={FONT}>
          {truncate(figures.title, 12)}
        </text>
        <text x={left + 42} y={node.y + 10} fontSize={11} fill={INK[700]} fontFamily={FONT}>
          {figures.lines[0] ?? ""}
        </text>
      </>
    );
  }
  const colours = figures.status ? STATUS_COLOUR[figures.status] : { stroke: INK[500], fill: "#ffffff", text: INK[900] };
  return (
    <>
      <rect x={left} y={top} width={node.width} height={node.height} rx={6} fill={colours.fill} stroke={selected ? COPPER[500] : colours.stroke} strokeWidth={selected ? 3 : figures.status === "over" ? 2.4 : 1.4} />
      <text x={left + 10} y={top + 17} fontSize={11} fontWeight={600} fill={INK[900]} fontFamily={FONT}>
        {truncate(figures.title, 24)}
      </text>
      <text x={left + 10} y={top + 34} fontSize={11} fill={INK[700]} fontFamily={FONT}>
        {figures.lines[0] ?? "not solved yet"}
      </text>
      {figures.status ? (
        <>
          <LoadStatusGlyph status={figures.status} x={left + 18} y={top + 50} stroke={STATUS_COLOUR[figures.status].stroke} />
          <text x={left + 30} y={top + 54} fontSize={11} fontWeight={figures.status === "over" ? 700 : 500} fill={colours.text} fontFamily={FONT}>
            {STATUS_LABEL[figures.status]}
          </text>
        </>
      ) : null}
    </>
  );
}

const KIND_WORD: Record<ElementKind, string> = { point: "Point", run: "Run", source: "Source", load: "Load", case: "Case" };

/** The one-line diagram: sources, bus bars, runs and loads, laid out by dagre (or in columns when large), drawn as our SVG. */
export const OneLineDiagram = memo(function OneLineDiagram({ doc, result, caseName, selection, onSelect }: OneLineDiagramProps) {
  // Only ids and connections lay the diagram out: a new length or size keeps the layout.
  const topology = useMemo(() => topologyOf(doc), [doc]);
  const topologyKey = useMemo(() => JSON.stringify(topology), [topology]);
  const layout = useMemo(() => layoutDiagram(topology), [topologyKey]); // eslint-disable-line react-hooks/exhaustive-deps
  const [view, setView] = useState<ViewBox>(() => fitView(layout));
  const [focused, setFocused] = useState<string | null>(null);
  const svgRef = useRef<SVGSVGElement>(null);
  const [boxRef, boxWidth] = useElementWidth<HTMLDivElement>();
  const measured = boxWidth > 0;
  const { heightPx } = startScale(layout, boxWidth);
  const drag = useRef<{ x: number; y: number; view: ViewBox; pointer: number } | null>(null);

  // A new topology (or the first measurement of the box) starts the view again; resizing later keeps it.
  useEffect(() => setView(startView(layout, boxWidth)), [layout, measured]); // eslint-disable-line react-hooks/exhaustive-deps

  const kase: CaseResult | undefined = useMemo(() => result?.cases.find((c) => c.name === caseName) ?? result?.cases[0], [result, caseName]);
  const figures = useMemo(() => {
    const map = new Map<string, NodeFigures>();
    const pointV = new Map(kase?.points.map((p) => [p.id, p.voltage]) ?? []);
    const worst = new Map(result?.loads.map((l) => [l.id, l]) ?? []);
    for (const s of doc.sources) {
      const v = kase?.sources.find((r) => r.id === s.id)?.terminalVoltage;
      const nominal = s.type === "pvArray" ? `${fixed(s.currentA, 1)} A` : `${fixed(s.voltage, 1)} V`;
      const line = v !== undefined ? `${fixed(v, 2)} V` : nominal;
      map.set(`s:${s.id}`, { title: s.name || s.id, lines: [line], ariaLabel: `Source ${s.id}, ${line}` });
    }
    for (const p of doc.points) {
      const v = pointV.get(p.id);
      const line = v !== undefined ? `${fixed(v, 2)} V` : "";
      map.set(`p:${p.id}`, { title: p.name || p.id, lines: [line], ariaLabel: `Point ${p.id}${line ? `, ${line}` : ""}` });
    }
    for (const l of doc.loads) {
      const w = worst.get(l.id);
      const line = w ? `${fixed(w.voltage, 2)} V · ${fixed(w.dropPercent, 2)} %` : undefined;
      map.set(`l:${l.id}`, {
        title: l.name || l.id,
        lines: line ? [line] : [],
        status: w?.status,
        ariaLabel: `Load ${l.id}${w ? `, ${STATUS_LABEL[w.status]}` : ", not solved yet"}`,
      });
    }
    return map;
  }, [doc, kase, result]);
  const runLabels = useMemo(() => {
    const currents = new Map(kase?.runs.map((r) => [r.id, r.current]) ?? []);
    return new Map(
      doc.runs.map((r) => {
        const i = currents.get(r.id);
        const text = [formatSize(r.size), formatLength(r.length, doc.units), i !== undefined ? `${fixed(Math.abs(i), 1)} A` : null].filter(Boolean).join(" · ");
        return [r.id, text];
      }),
    );
  }, [doc.runs, doc.units, kase]);
  const sourceType = useMemo(() => new Map(doc.sources.map((s) => [s.id, s.type])), [doc.sources]);

  const isSelected = (kind: ElementKind, id: string) => selection?.kind === kind && selection.id === id;

  // Bring a selection made elsewhere into view when it is outside.
  useEffect(() => {
    if (!selection) return;
    const key = selection.kind === "run" ? null : `${selection.kind[0]}:${selection.id}`;
    const node = key ? layout.nodes.find((n) => n.key === key) : undefined;
    const edge = selection.kind === "run" ? layout.edges.find((e) => e.key === `run:${selection.id}`) : undefined;
    const at = node ? { x: node.x, y: node.y } : edge?.label ?? edge?.points[0];
    if (!at) return;
    setView((v) => (at.x < v.x || at.x > v.x + v.w || at.y < v.y || at.y > v.y + v.h ? { ...v, x: at.x - v.w / 2, y: at.y - v.h / 2 } : v));
  }, [selection, layout]);

  const zoom = useCallback(
    (factor: number, around?: { x: number; y: number }) => {
      setView((v) => {
        const full = fitView(layout);
        const w = Math.min(Math.max(v.w / factor, 60), full.w * 8);
        const h = (w / v.w) * v.h;
        const cx = around?.x ?? v.x + v.w / 2;
        const cy = around?.y ?? v.y + v.h / 2;
        return { x: cx - ((cx - v.x) * w) / v.w, y: cy - ((cy - v.y) * h) / v.h, w, h };
      });
    },
    [layout],
  );

  // Ctrl + wheel zooms (a plain wheel scrolls the page). React's wheel listener is passive, so this one is ours.
  useEffect(() => {
    const svg = svgRef.current;
    if (!svg) return;
    const onWheel = (event: WheelEvent) => {
      if (!event.ctrlKey) return;
      event.preventDefault();
      const rect = svg.getBoundingClientRect();
      setView((v) => {
        const around = rect.width > 0 ? { x: v.x + ((event.clientX - rect.left) / rect.width) * v.w, y: v.y + ((event.clientY - rect.top) / rect.height) * v.h } : undefined;
        const factor = event.deltaY < 0 ? ZOOM_STEP : 1 / ZOOM_STEP;
        const full = fitView(layout);
        const w = Math.min(Math.max(v.w / factor, 60), full.w * 8);
        const h = (w / v.w) * v.h;
        const cx = around?.x ?? v.x + v.w / 2;
        const cy = around?.y ?? v.y + v.h / 2;
        return { x: cx - ((cx - v.x) * w) / v.w, y: cy - ((cy - v.y) * h) / v.h, w, h };
      });
    };
    svg.addEventListener("wheel", onWheel, { passive: false });
    return () => svg.removeEventListener("wheel", onWheel);
  }, [layout]);

  const onPointerDown = (event: ReactPointerEvent<SVGSVGElement>) => {
    // Drag on the background pans; on an element it is a click.
    if ((event.target as Element).closest("[role='button']")) return;
    drag.current = { x: event.clientX, y: event.clientY, view, pointer: event.pointerId };
    event.currentTarget.setPointerCapture?.(event.pointerId);
  };
  const onPointerMove = (event: ReactPointerEvent<SVGSVGElement>) => {
    const d = drag.current;
    if (!d || d.pointer !== event.pointerId) return;
    const rect = event.currentTarget.getBoundingClientRect();
    if (rect.width === 0) return;
    const scale = d.view.w / rect.width;
    setView({ ...d.view, x: d.view.x - (event.clientX - d.x) * scale, y: d.view.y - (event.clientY - d.y) * scale });
  };
  const onPointerUp = () => {
    drag.current = null;
  };
  const onKeyDown = (event: KeyboardEvent<SVGSVGElement>) => {
    const moves: Record<string, [number, number]> = { ArrowLeft: [-1, 0], ArrowRight: [1, 0], ArrowUp: [0, -1], ArrowDown: [0, 1] };
    const move = moves[event.key];
    if (move) {
      event.preventDefault();
      setView((v) => ({ ...v, x: v.x + move[0] * v.w * PAN_STEP, y: v.y + move[1] * v.h * PAN_STEP }));
    } else if (event.key === "+" || event.key === "=") {
      zoom(ZOOM_STEP);
    } else if (event.key === "-") {
      zoom(1 / ZOOM_STEP);
    } else if (event.key === "Escape" && event.target === event.currentTarget) {
      onSelect(null);
    }
  };

  const activate = (kind: ElementKind, id: string) => (event: KeyboardEvent<SVGGElement>) => {
    if (event.key === "Enter" || event.key === " ") {
      event.preventDefault();
      event.stopPropagation();
      onSelect({ kind, id });
    }
  };

  const exportSvg = () => {
    if (!svgRef.current) return;
    download(`${doc.name || "system"}-one-line.svg`.replace(/[^\w.-]+/g, "-"), new Blob([serialiseSvg(svgRef.current, layout)], { type: "image/svg+xml" }));
  };
  const exportPng = () => {
    if (!svgRef.current) return;
    const text = serialiseSvg(svgRef.current, layout);
    const full = fitView(layout);
    // Canvases stop at about 16,000 px a side: large diagrams are drawn at a smaller scale.
    const scale = Math.min(2, 8000 / Math.max(full.w, full.h));
    const image = new Image();
    image.onload = () => {
      const canvas = document.createElement("canvas");
      canvas.width = Math.ceil(full.w * scale);
      canvas.height = Math.ceil(full.h * scale);
      const context = canvas.getContext("2d");
      if (!context) return;
      context.fillStyle = "#ffffff";
      context.fillRect(0, 0, canvas.width, canvas.height);
      context.drawImage(image, 0, 0, canvas.width, canvas.height);
      canvas.toBlob((blob) => {
        if (blob) download(`${doc.name || "system"}-one-line.png`.replace(/[^\w.-]+/g, "-"), blob);
      }, "image/png");
    };
    image.src = `data:image/svg+xml;charset=utf-8,${encodeURIComponent(text)}`;
  };

  const focusRing = (key: string, x: number, y: number, w: number, h: number) =>
    focused === key ? <rect data-export="skip" x={x - 5} y={y - 5} width={w + 10} height={h + 10} rx={6} fill="none" stroke={COPPER[500]} strokeWidth={2} strokeDasharray="4 3" /> : null;

  return (
    <section aria-labelledby="one-line-heading" className="flex min-w-0 flex-col rounded-lg border border-ink-100 bg-white">
      <div className="flex flex-wrap items-center justify-between gap-2 border-b border-ink-100 px-3 py-2">
        <h2 id="one-line-heading" className="text-sm font-semibold text-ink-900">
          One-line diagram
        </h2>
        <div className="flex flex-wrap items-center gap-1" role="toolbar" aria-label="Diagram view">
          <button type="button" aria-label="Zoom in" title="Zoom in (ctrl + wheel)" onClick={() => zoom(ZOOM_STEP)} className={`${secondaryButtonClass} w-8 px-0`}>
            +
          </button>
          <button type="button" aria-label="Zoom out" title="Zoom out (ctrl + wheel)" onClick={() => zoom(1 / ZOOM_STEP)} className={`${secondaryButtonClass} w-8 px-0`}>
            −
          </button>
          <button type="button" onClick={() => setView(fitView(layout))} className={secondaryButtonClass}>
            Fit
          </button>
          <button type="button" onClick={exportSvg} disabled={layout.nodes.length === 0} className={secondaryButtonClass}>
            Download SVG
          </button>
          <button type="button" onClick={exportPng} disabled={layout.nodes.length === 0} className={secondaryButtonClass}>
            Download PNG
          </button>
        </div>
      </div>
      <div ref={boxRef} className="min-w-0">
      {layout.nodes.length === 0 ? (
        <p className="p-6 text-sm text-ink-500">Nothing to draw yet: add a point and a source in the tables.</p>
      ) : (
        <svg
          ref={svgRef}
          role="group"
          aria-label="One-line diagram: drag or use the arrow keys to pan, + and − to zoom"
          aria-roledescription="diagram"
          data-layout={layout.method}
          tabIndex={0}
          viewBox={`${view.x} ${view.y} ${view.w} ${view.h}`}
          preserveAspectRatio="xMidYMid meet"
          style={{ height: heightPx }}
          className="block w-full touch-none select-none bg-ink-50/40 outline-none focus-visible:ring-2 focus-visible:ring-copper-500"
          onPointerDown={onPointerDown}
          onPointerMove={onPointerMove}
          onPointerUp={onPointerUp}
          onPointerCancel={onPointerUp}
          onKeyDown={onKeyDown}
        >
          <g>
            {layout.edges.map((edge) =>
              edge.kind === "run" ? null : <path key={edge.key} d={edgePath(edge)} fill="none" stroke={INK[300]} strokeWidth={1.2} />,
            )}
          </g>
          <g>
            {layout.edges.map((edge) => {
              if (edge.kind !== "run") return null;
              const selected = isSelected("run", edge.id);
              const label = runLabels.get(edge.id) ?? edge.id;
              const lp = edge.label;
              return (
                <g
                  key={edge.key}
                  role="button"
                  tabIndex={0}
                  aria-label={`Run ${edge.id}, ${label}`}
                  aria-pressed={selected}
                  data-run-id={edge.id}
                  style={{ cursor: "pointer", outline: "none" }}
                  onClick={() => onSelect({ kind: "run", id: edge.id })}
                  onKeyDown={activate("run", edge.id)}
                  onFocus={() => setFocused(edge.key)}
                  onBlur={() => setFocused((f) => (f === edge.key ? null : f))}
                >
                  {/* A wide transparent stroke makes the thin line easy to hit. */}
                  <path d={edgePath(edge)} fill="none" stroke="transparent" strokeWidth={12} />
                  <path d={edgePath(edge)} fill="none" stroke={selected ? COPPER[500] : INK[900]} strokeWidth={selected ? 3.5 : 2} />
                  {lp ? (
                    <>
                      <rect x={lp.x - 74} y={lp.y - 9} width={148} height={18} rx={3} fill="#ffffff" stroke={selected ? COPPER[500] : INK[200]} strokeWidth={1} />
                      <text x={lp.x} y={lp.y + 4} textAnchor="middle" fontSize={10.5} fill={INK[900]} fontFamily={FONT}>
                        {truncate(label, 28)}
                      </text>
                      {focusRing(edge.key, lp.x - 74, lp.y - 9, 148, 18)}
                    </>
                  ) : null}
                </g>
              );
            })}
          </g>
          <g>
            {layout.nodes.map((node) => {
              const kind: ElementKind = node.kind;
              const f = figures.get(node.key) ?? { title: node.id, lines: [], ariaLabel: `${KIND_WORD[kind]} ${node.id}` };
              const selected = isSelected(kind, node.id);
              return (
                <g
                  key={node.key}
                  role="button"
                  tabIndex={0}
                  aria-label={f.ariaLabel}
                  aria-pressed={selected}
                  data-node={node.key}
                  style={{ cursor: "pointer", outline: "none" }}
                  onClick={() => onSelect({ kind, id: node.id })}
                  onKeyDown={activate(kind, node.id)}
                  onFocus={() => setFocused(node.key)}
                  onBlur={() => setFocused((k) => (k === node.key ? null : k))}
                >
                  <NodeShape node={node} figures={f} sourceType={sourceType.get(node.id)} selected={selected} />
                  {focusRing(node.key, node.x - node.width / 2, node.y - node.height / 2, node.width, node.height)}
                </g>
              );
            })}
          </g>
        </svg>
      )}
      </div>
      {layout.method === "columns" ? <p className="border-t border-ink-100 px-3 py-1.5 text-xs text-ink-500">Large system: drawn in columns by distance from the source.</p> : null}
    </section>
  );
});
