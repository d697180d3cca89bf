// Pure helpers between the document, the engine's answer and the screen: rows of the results
// tables, the summary line, selection from ids and paths, and the path from the source to a load.
import type { SystemInput } from "../../../../shared/engine/schema";
import type { CaseResult, EngineError, Finding, LoadResult, LoadStatus, SolveSuccess, WorstLoad } from "../../../../shared/engine/system";
import type { ElementKind, Selection } from "../selection";
import type { TableTab } from "../tables";
import { checkedDrop, lengthNumber, STATUS_RANK } from "./format";

export interface LoadRow {
  id: string;
  name: string;
  worst: WorstLoad;
  /** The load in its worst case (current, governing limit, branch drop). */
  inWorstCase: LoadResult | undefined;
}

/** One row per load, worst first: status, then how far the checked drop is into its limit. */
export function loadRows(doc: SystemInput, result: SolveSuccess): LoadRow[] {
  const names = new Map(doc.loads.map((l) => [l.id, l.name ?? ""]));
  const caseByName = new Map(result.cases.map((c) => [c.name, c]));
  const rows = result.loads.map((worst) => {
    const kase = caseByName.get(worst.worstCase);
    const inWorstCase = kase?.loads.find((l) => l.id === worst.id);
    return { id: worst.id, name: names.get(worst.id) || worst.id, worst, inWorstCase };
  });
  const severity = (r: LoadRow) => (r.inWorstCase ? checkedDrop(r.inWorstCase) : r.worst.dropPercent) / (r.worst.limitPercent || 1);
  return rows.sort((a, b) => STATUS_RANK[b.worst.status] - STATUS_RANK[a.worst.status] || severity(b) - severity(a) || a.id.localeCompare(b.id));
}

export function statusCounts(loads: ReadonlyArray<{ status: LoadStatus }>): Record<LoadStatus, number> {
  const counts: Record<LoadStatus, number> = { over: 0, near: 0, within: 0 };
  for (const l of loads) counts[l.status] += 1;
  return counts;
}

/** "2 over limit, 1 near, 5 within". */
export function statusSummary(loads: ReadonlyArray<{ status: LoadStatus }>): string {
  if (loads.length === 0) return "No loads yet";
  const c = statusCounts(loads);
  return `${c.over} over limit, ${c.near} near, ${c.within} within`;
}

export const FUSE_CODES = new Set(["FUSE_TOO_SMALL", "FUSE_TOO_LARGE", "UNFUSED_BATTERY_RUN"]);

/** Fuse findings per run id (a finding names its run first). */
export function fuseFindingsByRun(findings: readonly Finding[]): Map<string, Finding[]> {
  const out = new Map<string, Finding[]>();
  for (const f of findings) {
    if (!FUSE_CODES.has(f.code)) continue;
    const runId = f.ids[0];
    if (runId === undefined) continue;
    out.set(runId, [...(out.get(runId) ?? []), f]);
  }
  return out;
}

/** FAULT_OVER_INTERRUPTING findings per point id (a run's names the point second, a point's first). */
export function faultFindingsByPoint(findings: readonly Finding[], pointIds: ReadonlySet<string>): Map<string, Finding[]> {
  const out = new Map<string, Finding[]>();
  for (const f of findings) {
    if (f.code !== "FAULT_OVER_INTERRUPTING") continue;
    for (const id of f.ids) {
      if (!pointIds.has(id)) continue;
      out.set(id, [...(out.get(id) ?? []), f]);
    }
  }
  return out;
}

// ---------------------------------------------------------------- selection

export const TAB_OF_KIND: Record<ElementKind, TableTab> = { point: "points", run: "runs", source: "sources", load: "loads", case: "cases" };

/** The kind an id of a finding most likely names, by the finding's code (ids may repeat across kinds). */
const KIND_OF_CODE: Record<string, ElementKind> = {
  DROP_OVER_LIMIT: "load",
  DROP_NEAR_LIMIT: "load",
  UNDER_VOLTAGE: "load",
  VOLTAGE_COLLAPSE: "load",
  AMPACITY_EXCEEDED: "run",
  FUSE_TOO_SMALL: "run",
  FUSE_TOO_LARGE: "run",
  UNFUSED_BATTERY_RUN: "run",
  INTERRUPTING_RATING_MISSING: "run",
  ZERO_LENGTH_RUN: "run",
  RUN_ENDS_SAME_POINT: "run",
  UNKNOWN_SIZE: "run",
  FLOATING_POINT: "point",
  FAULT_OVER_INTERRUPTING: "point",
  UNKNOWN_SOURCE: "source",
};

function kindsHolding(doc: SystemInput, id: string): ElementKind[] {
  const kinds: ElementKind[] = [];
  if (doc.loads.some((l) => l.id === id)) kinds.push("load");
  if (doc.runs.some((r) => r.id === id)) kinds.push("run");
  if (doc.points.some((p) => p.id === id)) kinds.push("point");
  if (doc.sources.some((s) => s.id === id)) kinds.push("source");
  return kinds;
}

/** The element an id names, preferring the kind the code is about. */
export function selectionForId(doc: SystemInput, id: string, code?: string): Selection | null {
  const kinds = kindsHolding(doc, id);
  if (kinds.length === 0) return null;
  const preferred = code ? KIND_OF_CODE[code] : undefined;
  return { kind: preferred && kinds.includes(preferred) ? preferred : kinds[0], id };
}

const PATH_KIND: Record<string, ElementKind> = { points: "point", runs: "run", sources: "source", loads: "load", cases: "case" };

/** "runs[2].size" → the run at index 2 of the document. */
export function selectionForPath(doc: SystemInput, path: string): Selection | null {
  const m = /^(points|runs|sources|loads|cases)\[(\d+)\]/.exec(path);
  if (!m) return null;
  const index = Number(m[2]);
  const kind = PATH_KIND[m[1]];
  if (kind === "case") {
    const kase = doc.cases?.[index];
    return kase ? { kind, id: kase.name } : null;
  }
  const list = doc[m[1] as "points" | "runs" | "sources" | "loads"] as ReadonlyArray<{ id: string }>;
  const item = list[index];
  return item ? { kind, id: item.id } : null;
}

/** What clicking an engine error or finding selects: its path first (exact), else its first id that names something. */
export function selectionForProblem(doc: SystemInput, problem: { path?: string; ids?: readonly string[]; code: string }): Selection | null {
  if (problem.path) {
    const byPath = selectionForPath(doc, problem.path);
    if (byPath) return byPath;
  }
  for (const id of problem.ids ?? []) {
    const s = selectionForId(doc, id, problem.code);
    if (s) return s;
  }
  return null;
}

/** Engine errors with a document path, keyed for the tables' `errors` prop ("runs[2].size" → message). */
export function errorsByPath(errors: readonly EngineError[]): Record<string, string> {
  const out: Record<string, string> = {};
  for (const e of errors) {
    if (!e.path || !/^(points|runs|sources|loads|cases)\[\d+\]/.test(e.path)) continue;
    if (!(e.path in out)) out[e.path] = e.message;
  }
  return out;
}

// ---------------------------------------------------------------- path from the source to a load

/** The source whose terminals are the reference for drop %: the one marked primary, else the first. */
export function primarySource(doc: SystemInput) {
  return doc.sources.find((s) => s.primary) ?? doc.sources[0];
}

export interface PathStep {
  /** Point id. */
  id: string;
  name: string;
  /** Cumulative one-way length from the source's point, in the document's units (m or ft). */
  distance: number;
  /** The run that reaches this point (undefined for the source's point). */
  runId?: string;
}

/**
 * The points from the primary source's point to the load's point, in order, with the cumulative
 * one-way length: a breadth-first search over the runs (fewest runs; in a meshed network one of
 * the shortest paths). Empty when the load or its point is unknown or not connected.
 */
export function pathToLoad(doc: SystemInput, loadId: string): PathStep[] {
  const source = primarySource(doc);
  const load = doc.loads.find((l) => l.id === loadId);
  if (!source || !load) return [];
  const names = new Map(doc.points.map((p) => [p.id, p.name ?? p.id]));
  if (!names.has(source.point) || !names.has(load.point)) return [];
  const adjacent = new Map<string, Array<{ to: string; runId: string; length: number }>>();
  for (const r of doc.runs) {
    const length = lengthNumber(r.length);
    (adjacent.get(r.from) ?? adjacent.set(r.from, []).get(r.from)!).push({ to: r.to, runId: r.id, length });
    (adjacent.get(r.to) ?? adjacent.set(r.to, []).get(r.to)!).push({ to: r.from, runId: r.id, length });
  }
  const came = new Map<string, { from: string; runId: string; length: number } | null>([[source.point, null]]);
  const queue = [source.point];
  for (let head = 0; head < queue.length && !came.has(load.point); head++) {
    const at = queue[head];
    for (const edge of adjacent.get(at) ?? []) {
      if (came.has(edge.to)) continue;
      came.set(edge.to, { from: at, runId: edge.runId, length: edge.length });
      queue.push(edge.to);
    }
  }
  if (!came.has(load.point)) return [];
  const reversed: Array<{ id: string; runId?: string; length: number }> = [];
  for (let at: string | undefined = load.point; at !== undefined; ) {
    const step: { from: string; runId: string; length: number } | null | undefined = came.get(at);
    reversed.push({ id: at, runId: step?.runId, length: step?.length ?? 0 });
    at = step ? step.from : undefined;
  }
  const steps: PathStep[] = [];
  let distance = 0;
  for (const s of reversed.reverse()) {
    distance += s.length;
    steps.push({ id: s.id, name: names.get(s.id) ?? s.id, distance, runId: s.runId });
  }
  return steps;
}

export interface PathVoltage extends PathStep {
  voltage: number | null;
  /** "point" for points on the way, "load" for the load at the end. */
  kind: "point" | "load";
}

/** The path with each point's voltage in one case, and the load's own voltage at the end. */
export function voltageAlongPath(doc: SystemInput, kase: CaseResult, loadId: string): PathVoltage[] {
  const steps = pathToLoad(doc, loadId);
  if (steps.length === 0) return [];
  const volts = new Map(kase.points.map((p) => [p.id, p.voltage]));
  const out: PathVoltage[] = steps.map((s) => ({ ...s, kind: "point", voltage: volts.get(s.id) ?? null }));
  const load = doc.loads.find((l) => l.id === loadId);
  const lr = kase.loads.find((l) => l.id === loadId);
  const last = steps[steps.length - 1];
  out.push({ id: loadId, name: load?.name ?? loadId, distance: last.distance, kind: "load", voltage: lr?.voltage ?? null });
  return out;
}

/**
 * The voltage at which this load would sit exactly at its limit in this case. Drop % is measured
 * against the nominal voltage from the primary source's terminals (total, critical) or from the
 * start of its branch (branch), so: V_load + (checked drop − limit) × nominal / 100.
 */
export function limitVoltage(lr: LoadResult, nominalVoltage: number): number {
  return lr.voltage + ((checkedDrop(lr) - lr.limitPercent) * nominalVoltage) / 100;
}
