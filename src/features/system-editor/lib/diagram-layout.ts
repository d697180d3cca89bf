// Where the one-line diagram puts things. Only the topology matters (ids and what connects to
// what), so the layout is computed again only when that changes, never while a figure is typed.
import dagre from "@dagrejs/dagre";
import type { SystemInput } from "../../../../shared/engine/schema";

export interface Topology {
  sources: Array<{ id: string; point: string }>;
  points: string[];
  runs: Array<{ id: string; from: string; to: string }>;
  loads: Array<{ id: string; point: string }>;
}

export type NodeKind = "source" | "point" | "load";
export interface LayoutNode {
  key: string;
  kind: NodeKind;
  id: string;
  /** Centre. */
  x: number;
  y: number;
  width: number;
  height: number;
}
export interface LayoutEdge {
  key: string;
  /** run: point → point; feed: source → its point; drop: point → load. */
  kind: "run" | "feed" | "drop";
  id: string;
  points: Array<{ x: number; y: number }>;
  /** Where a run's label goes (its centre). */
  label?: { x: number; y: number };
}
export interface DiagramLayout {
  nodes: LayoutNode[];
  edges: LayoutEdge[];
  width: number;
  height: number;
  method: "dagre" | "columns";
}

export const NODE_SIZE: Record<NodeKind, { width: number; height: number }> = {
  source: { width: 132, height: 60 },
  point: { width: 148, height: 30 },
  load: { width: 168, height: 64 },
};
export const RUN_LABEL = { width: 150, height: 18 };

/**
 * Above this many nodes (sources + points + loads) the diagram uses a column layout instead of
 * dagre. Measured with dagre 3.1.3 on Node 20 (LR, edge labels, each load on its own point):
 * 250 nodes ≈ 290 ms as a star and ≈ 300 ms as a daisy chain; 1,000 nodes (500 loads) ≈ 640 ms
 * as a star and ≈ 3,200 ms as a daisy chain, which would freeze the editor on every added row.
 * The column layout takes ≈ 15 ms for those 1,000 nodes (linear in the size).
 */
export const DAGRE_NODE_LIMIT = 250;

const MARGIN = 24;

export function topologyOf(doc: Pick<SystemInput, "sources" | "points" | "runs" | "loads">): Topology {
  return {
    sources: doc.sources.map((s) => ({ id: s.id, point: s.point })),
    points: doc.points.map((p) => p.id),
    runs: doc.runs.map((r) => ({ id: r.id, from: r.from, to: r.to })),
    loads: doc.loads.map((l) => ({ id: l.id, point: l.point })),
  };
}

export const nodeKey = (kind: NodeKind, id: string) => `${kind[0]}:${id}`;

interface Graph {
  nodes: Array<{ key: string; kind: NodeKind; id: string }>;
  edges: Array<{ key: string; kind: LayoutEdge["kind"]; id: string; from: string; to: string }>;
}

/** Nodes and edges, runs turned to flow away from the sources (breadth-first depth), dangling references left out. */
function buildGraph(t: Topology): Graph {
  const nodes: Graph["nodes"] = [];
  const pointSet = new Set<string>();
  for (const s of t.sources) nodes.push({ key: nodeKey("source", s.id), kind: "source", id: s.id });
  for (const p of t.points) {
    if (pointSet.has(p)) continue;
    pointSet.add(p);
    nodes.push({ key: nodeKey("point", p), kind: "point", id: p });
  }
  for (const l of t.loads) nodes.push({ key: nodeKey("load", l.id), kind: "load", id: l.id });

  // Depth of each point from the nearest source's point, over runs in either direction.
  const depth = new Map<string, number>();
  const adjacent = new Map<string, string[]>();
  for (const r of t.runs) {
    if (!pointSet.has(r.from) || !pointSet.has(r.to) || r.from === r.to) continue;
    (adjacent.get(r.from) ?? adjacent.set(r.from, []).get(r.from)!).push(r.to);
    (adjacent.get(r.to) ?? adjacent.set(r.to, []).get(r.to)!).push(r.from);
  }
  const queue: string[] = [];
  for (const s of t.sources) {
    if (pointSet.has(s.point) && !depth.has(s.point)) {
      depth.set(s.point, 0);
      queue.push(s.point);
    }
  }
  for (let head = 0; head < queue.length; head++) {
    const at = queue[head];
    for (const next of adjacent.get(at) ?? []) {
      if (depth.has(next)) continue;
      depth.set(next, depth.get(at)! + 1);
      queue.push(next);
    }
  }

  const edges: Graph["edges"] = [];
  for (const s of t.sources) {
    if (pointSet.has(s.point)) edges.push({ key: `feed:${s.id}`, kind: "feed", id: s.id, from: nodeKey("source", s.id), to: nodeKey("point", s.point) });
  }
  for (const r of t.runs) {
    if (!pointSet.has(r.from) || !pointSet.has(r.to) || r.from === r.to) continue;
    const reversed = (depth.get(r.from) ?? Infinity) > (depth.get(r.to) ?? Infinity);
    const [a, b] = reversed ? [r.to, r.from] : [r.from, r.to];
    edges.push({ key: `run:${r.id}`, kind: "run", id: r.id, from: nodeKey("point", a), to: nodeKey("point", b) });
  }
  for (const l of t.loads) {
    if (pointSet.has(l.point)) edges.push({ key: `drop:${l.id}`, kind: "drop", id: l.id, from: nodeKey("point", l.point), to: nodeKey("load", l.id) });
  }
  return { nodes, edges };
}

function layoutWithDagre(graph: Graph): DiagramLayout {
  const g = new dagre.graphlib.Graph({ multigraph: true });
  g.setGraph({ rankdir: "LR", nodesep: 18, ranksep: 56, edgesep: 12, marginx: MARGIN, marginy: MARGIN });
  g.setDefaultEdgeLabel(() => ({}));
  for (const n of graph.nodes) g.setNode(n.key, { ...NODE_SIZE[n.kind] });
  for (const e of graph.edges) {
    g.setEdge(e.from, e.to, e.kind === "run" ? { width: RUN_LABEL.width, height: RUN_LABEL.height, labelpos: "c" } : { minlen: 1 }, e.key);
  }
  dagre.layout(g);
  const nodes: LayoutNode[] = graph.nodes.map((n) => {
    const placed = g.node(n.key);
    return { key: n.key, kind: n.kind, id: n.id, x: placed.x ?? 0, y: placed.y ?? 0, ...NODE_SIZE[n.kind] };
  });
  const edges: LayoutEdge[] = graph.edges.map((e) => {
    const placed = g.edge({ v: e.from, w: e.to, name: e.key });
    const points = (placed?.points ?? []).map((p: { x: number; y: number }) => ({ x: p.x, y: p.y }));
    const label = e.kind === "run" && typeof placed?.x === "number" && typeof placed?.y === "number" ? { x: placed.x, y: placed.y } : undefined;
    return { key: e.key, kind: e.kind, id: e.id, points, label };
  });
  const size = g.graph();
  return { nodes, edges, width: size.width ?? 0, height: size.height ?? 0, method: "dagre" };
}

/** Columns by depth from the sources (sources, then points by runs from them, loads beside their point). Linear time. */
function layoutInColumns(graph: Graph): DiagramLayout {
  const column = new Map<string, number>();
  const outgoing = new Map<string, string[]>();
  for (const e of graph.edges) (outgoing.get(e.from) ?? outgoing.set(e.from, []).get(e.from)!).push(e.to);
  const queue: string[] = [];
  for (const n of graph.nodes) {
    if (n.kind === "source") {
      column.set(n.key, 0);
      queue.push(n.key);
    }
  }
  for (let head = 0; head < queue.length; head++) {
    const at = queue[head];
    for (const next of outgoing.get(at) ?? []) {
      if (column.has(next)) continue;
      column.set(next, column.get(at)! + 1);
      queue.push(next);
    }
  }
  // Anything not reached from a source goes in the first column after the sources.
  const order = [...queue, ...graph.nodes.filter((n) => !column.has(n.key)).map((n) => n.key)];
  const byKey = new Map(graph.nodes.map((n) => [n.key, n]));
  const columns: string[][] = [];
  for (const key of order) {
    const c = column.get(key) ?? 1;
    (columns[c] ??= []).push(key);
  }
  const columnWidth = Math.max(...Object.values(NODE_SIZE).map((s) => s.width)) + RUN_LABEL.width / 2 + 40;
  const gap = 16;
  const nodes: LayoutNode[] = [];
  const placed = new Map<string, LayoutNode>();
  let height = 0;
  columns.forEach((keys, c) => {
    let y = MARGIN;
    for (const key of keys ?? []) {
      const n = byKey.get(key)!;
      const size = NODE_SIZE[n.kind];
      const node = { key, kind: n.kind, id: n.id, x: MARGIN + c * columnWidth + size.width / 2, y: y + size.height / 2, ...size };
      nodes.push(node);
      placed.set(key, node);
      y += size.height + gap;
    }
    height = Math.max(height, y);
  });
  const edges: LayoutEdge[] = graph.edges.map((e) => {
    const a = placed.get(e.from)!;
    const b = placed.get(e.to)!;
    const start = { x: a.x + a.width / 2, y: a.y };
    const end = { x: b.x - b.width / 2, y: b.y };
    return { key: e.key, kind: e.kind, id: e.id, points: [start, end], label: e.kind === "run" ? { x: (start.x + end.x) / 2, y: (start.y + end.y) / 2 } : undefined };
  });
  return { nodes, edges, width: MARGIN * 2 + Math.max(columns.length, 1) * columnWidth, height: height + MARGIN, method: "columns" };
}

export function layoutDiagram(topology: Topology): DiagramLayout {
  const graph = buildGraph(topology);
  if (graph.nodes.length === 0) return { nodes: [], edges: [], width: 0, height: 0, method: "dagre" };
  return graph.nodes.length > DAGRE_NODE_LIMIT ? layoutInColumns(graph) : layoutWithDagre(graph);
}
