// The system compiler and checks: turns a System (points, runs, sources, loads, cases) into a
// two-wire netlist, solves every case with the circuit solver, and reports the result contract
// (see the README's engine section) with findings and cautions.
//
// Every point has a + and a − terminal. A run stamps its + conductor between the + terminals of
// its points and its − conductor (returnSize when given) between the − terminals, so returns are
// modelled, not doubled by hand. The reference node is the − terminal of the first source.
import type { ZodError } from "zod";
import { CAUTIONS } from "./cautions.js";
import {
  chargeWork,
  prepareCircuit,
  resetWork,
  solvePrepared,
  theveninResistances,
  type CircuitElement,
  type CircuitError,
  type PreparedCircuit,
} from "./circuit.js";
import {
  ampacity,
  AMPACITY_SOURCE,
  conductorResistance,
  METRES_PER_FOOT,
  normalizeSize,
  SMALL_CONDUCTOR_LIMIT_SOURCE,
  smallConductorFuseLimit,
  type Material,
} from "./conductors.js";
import {
  DEFAULT_LIMIT_PROFILE,
  SYSTEM_LIMITS,
  systemSchema,
  type Case,
  type LimitProfile,
  type System,
} from "./schema.js";

export type Severity = "error" | "warning" | "info";

export type EngineErrorCode =
  | "INVALID_FIELD"
  | "TOO_LARGE"
  | "DUPLICATE_ID"
  | "UNKNOWN_POINT"
  | "UNKNOWN_SOURCE"
  | "UNKNOWN_SIZE"
  | "UNKNOWN_CASE"
  | "ZERO_LENGTH_RUN"
  | "RUN_ENDS_SAME_POINT"
  | "NO_SOURCE"
  | "FLOATING_POINT"
  | "SHORTED_SOURCE"
  | "PARALLEL_IDEAL_SOURCES"
  | "VOLTAGE_COLLAPSE"
  | "ILL_CONDITIONED";

export interface EngineError {
  code: EngineErrorCode;
  message: string;
  /** JSON path of the offending field, e.g. "runs[2].size". */
  path?: string;
  ids?: string[];
  case?: string;
}

export interface Finding {
  severity: Severity;
  code: string;
  message: string;
  ids: string[];
  case?: string;
}

export type LoadStatus = "within" | "near" | "over";

export interface PointResult { id: string; voltage: number; faultCurrentA: number | null }
export interface SourceResult { id: string; current: number; terminalVoltage: number; powerW: number }
export interface RunResult {
  id: string;
  current: number;
  returnCurrent: number;
  resistanceOhm: number;
  returnResistanceOhm: number;
  dropV: number;
  lossW: number;
  ampacityA: number | null;
  utilizationPercent: number | null;
}
export interface LoadResult {
  id: string;
  voltage: number;
  current: number;
  powerW: number;
  dropPercent: number;
  branchDropPercent: number;
  limitPercent: number;
  governingLimit: "branch" | "total" | "critical";
  status: LoadStatus;
  underVoltage: boolean;
}
export interface CaseResult {
  name: string;
  conductorTemperatureC: number;
  newtonIterations: number;
  points: PointResult[];
  sources: SourceResult[];
  runs: RunResult[];
  loads: LoadResult[];
  totals: { loadW: number; conductorLossW: number; sourceLossW: number; lossPercent: number };
}
export interface WorstLoad { id: string; worstCase: string; dropPercent: number; limitPercent: number; status: LoadStatus; voltage: number }

export interface SolveSuccess {
  ok: true;
  cases: CaseResult[];
  loads: WorstLoad[];
  findings: Finding[];
  cautions: readonly string[];
  limitProfile: LimitProfile;
}
export interface SolveFailure { ok: false; errors: EngineError[]; cautions: readonly string[] }
export type SolveResult = SolveSuccess | SolveFailure;

export interface SolveOptions {
  /** Solve only the case with this name. */
  caseName?: string;
  /** Skip the available-fault-current calculation (auto-size's inner loop does not need it). */
  skipFaultCurrent?: boolean;
  /** Work budget of this solve (default: the one the system was compiled with). */
  workLimit?: number;
}

/** Budgets of compiling and solving (defaults SYSTEM_LIMITS.orderingWork and .solveWork). The
 *  API passes tighter ones than the command line: a request must answer within seconds. */
export interface WorkLimits {
  orderingWorkLimit?: number;
  workLimit?: number;
}

const failure = (errors: EngineError[]): SolveFailure => ({ ok: false, errors, cautions: CAUTIONS });

/** Formats a zod issue path as "runs[2].size". */
export function formatPath(path: ReadonlyArray<PropertyKey>): string {
  let out = "";
  for (const part of path) {
    if (typeof part === "number") out += `[${part}]`;
    // An empty key ({"": 1}) still needs a name in the path.
    else if (part === "") out += '[""]';
    else out += out ? `.${String(part)}` : String(part);
  }
  return out;
}

/** Schema errors as engine errors, each naming its field. */
export function schemaErrors(error: ZodError, limit = 20): EngineError[] {
  const out: EngineError[] = [];
  for (const issue of error.issues.slice(0, limit)) {
    if (issue.code === "unrecognized_keys") {
      for (const key of issue.keys) {
        const path = formatPath([...issue.path, key]);
        out.push({ code: "INVALID_FIELD", path, message: `${path}: unknown field "${key}"` });
      }
      continue;
    }
    const path = formatPath(issue.path) || "(document)";
    let message = issue.message;
    if (issue.code === "invalid_union" && "discriminator" in issue) message = `must be one of the known kinds`;
    out.push({ code: "INVALID_FIELD", path, message: `${path}: ${message}` });
  }
  return out;
}

/** Parses and validates a network file (schema + references). Lengths must be numbers here:
 *  text lengths with units are converted by resolveLengths (lengths.ts) first. */
export function parseSystem(input: unknown): { ok: true; system: System } | SolveFailure {
  if (input && typeof input === "object") {
    const doc = input as Record<string, unknown>;
    for (const key of ["points", "runs", "loads", "sources", "cases"] as const) {
      const arr = doc[key];
      if (Array.isArray(arr) && arr.length > SYSTEM_LIMITS[key]) {
        return failure([{ code: "TOO_LARGE", path: key, message: `${key}: ${arr.length} entries is over the limit of ${SYSTEM_LIMITS[key]} per system; split the network into several systems.` }]);
      }
    }
  }
  const parsed = systemSchema.safeParse(input);
  if (!parsed.success) return failure(schemaErrors(parsed.error));
  const system = parsed.data;
  const errors: EngineError[] = [];
  const pointIndex = new Map<string, number>();
  const checkIds = (list: ReadonlyArray<{ id: string }>, key: string) => {
    const seen = new Map<string, number>();
    list.forEach((item, i) => {
      if (seen.has(item.id)) {
        errors.push({ code: "DUPLICATE_ID", path: `${key}[${i}].id`, ids: [item.id], message: `${key}[${i}].id: "${item.id}" is already used by ${key}[${seen.get(item.id)}]` });
      } else seen.set(item.id, i);
    });
    return seen;
  };
  checkIds(system.points, "points").forEach((i, pid) => pointIndex.set(pid, i));
  const sourceIds = checkIds(system.sources, "sources");
  checkIds(system.runs, "runs");
  checkIds(system.loads, "loads");
  const needPoint = (pid: string, path: string, owner: string) => {
    if (!pointIndex.has(pid)) errors.push({ code: "UNKNOWN_POINT", path, ids: [owner, pid], message: `${path}: there is no point "${pid}"` });
  };
  system.sources.forEach((s, i) => needPoint(s.point, `sources[${i}].point`, s.id));
  system.loads.forEach((l, i) => needPoint(l.point, `loads[${i}].point`, l.id));
  // Sizes repeat: normalise each distinct text once (20,000 runs typically use a handful).
  const sizeCache = new Map<string, string | null>();
  const normalized = (text: string) => {
    let v = sizeCache.get(text);
    if (v === undefined) { v = normalizeSize(text, system.units); sizeCache.set(text, v); }
    return v;
  };
  system.runs.forEach((r, i) => {
    needPoint(r.from, `runs[${i}].from`, r.id);
    needPoint(r.to, `runs[${i}].to`, r.id);
    if (r.from === r.to) errors.push({ code: "RUN_ENDS_SAME_POINT", path: `runs[${i}].to`, ids: [r.id], message: `runs[${i}].to: run ${r.id} starts and ends at the same point "${r.from}"` });
    if (typeof r.length === "string") {
      errors.push({ code: "INVALID_FIELD", path: `runs[${i}].length`, ids: [r.id], message: `runs[${i}].length: "${r.length}" must be converted to a number first (resolveLengths)` });
    } else if (!(r.length > 0)) {
      errors.push({ code: "ZERO_LENGTH_RUN", path: `runs[${i}].length`, ids: [r.id], message: `runs[${i}].length: run ${r.id} has a length of ${r.length}; a run must be longer than 0` });
    } else if (r.length < SYSTEM_LIMITS.minRunLength) {
      const unit = system.units === "imperial" ? "ft" : "m";
      errors.push({ code: "ZERO_LENGTH_RUN", path: `runs[${i}].length`, ids: [r.id], message: `runs[${i}].length: run ${r.id} has a length of ${r.length} ${unit}; a run must be at least ${SYSTEM_LIMITS.minRunLength} ${unit} long` });
    }
    const size = normalized(r.size);
    if (!size) errors.push({ code: "UNKNOWN_SIZE", path: `runs[${i}].size`, ids: [r.id], message: `runs[${i}].size: "${r.size}" is not a conductor size we know (AWG 18 … 4/0, 250 … 500 kcmil, or 0.5 … 240 mm2)` });
    else r.size = size;
    if (r.returnSize !== undefined) {
      const rs = normalized(r.returnSize);
      if (!rs) errors.push({ code: "UNKNOWN_SIZE", path: `runs[${i}].returnSize`, ids: [r.id], message: `runs[${i}].returnSize: "${r.returnSize}" is not a conductor size we know` });
      else r.returnSize = rs;
    }
  });
  (system.cases ?? []).forEach((c, i) => {
    for (const [sid] of Object.entries(c.sourceVoltages ?? {})) {
      if (!sourceIds.has(sid)) errors.push({ code: "UNKNOWN_SOURCE", path: `cases[${i}].sourceVoltages.${sid}`, ids: [sid], message: `cases[${i}].sourceVoltages: there is no source "${sid}"` });
      else if (system.sources[sourceIds.get(sid)!].type === "pvArray") errors.push({ code: "INVALID_FIELD", path: `cases[${i}].sourceVoltages.${sid}`, ids: [sid], message: `cases[${i}].sourceVoltages.${sid}: ${sid} is a PV array; set its current in sourceCurrents` });
    }
    for (const [sid] of Object.entries(c.sourceCurrents ?? {})) {
      if (!sourceIds.has(sid)) errors.push({ code: "UNKNOWN_SOURCE", path: `cases[${i}].sourceCurrents.${sid}`, ids: [sid], message: `cases[${i}].sourceCurrents: there is no source "${sid}"` });
      else if (system.sources[sourceIds.get(sid)!].type !== "pvArray") errors.push({ code: "INVALID_FIELD", path: `cases[${i}].sourceCurrents.${sid}`, ids: [sid], message: `cases[${i}].sourceCurrents.${sid}: ${sid} is not a PV array; set its voltage in sourceVoltages` });
    }
  });
  system.loads.forEach((l, i) => {
    if (l.model !== "constantResistance") return;
    if (l.ohms === 0) {
      errors.push({ code: "SHORTED_SOURCE", path: `loads[${i}].ohms`, ids: [l.id, l.point], message: `loads[${i}].ohms: load ${l.id} of 0 Ω is a dead short across point ${l.point}; give the load its real resistance or power` });
    } else if (l.watts !== undefined && !Number.isFinite((system.nominalVoltage * system.nominalVoltage) / l.watts)) {
      errors.push({ code: "INVALID_FIELD", path: `loads[${i}].watts`, ids: [l.id], message: `loads[${i}].watts: ${l.watts} W is too small to be a load` });
    }
  });
  if (system.sources.length === 0) errors.push({ code: "NO_SOURCE", path: "sources", message: "sources: the system has no source; add a battery bank, power supply or PV array" });
  if (errors.length > 0) return failure(errors);

  // Every point must be connected by runs to a point with a source.
  const n = system.points.length;
  const parent = new Int32Array(n).map((_, i) => i);
  const find = (x: number): number => { while (parent[x] !== x) { parent[x] = parent[parent[x]]; x = parent[x]; } return x; };
  for (const r of system.runs) {
    const a = find(pointIndex.get(r.from)!);
    const b = find(pointIndex.get(r.to)!);
    if (a !== b) parent[a] = b;
  }
  const fed = new Set(system.sources.map((s) => find(pointIndex.get(s.point)!)));
  const floating = system.points.filter((_, i) => !fed.has(find(i))).map((p) => p.id);
  if (floating.length > 0) {
    return failure([{
      code: "FLOATING_POINT",
      path: "points",
      ids: floating,
      message: `Point${floating.length > 1 ? "s" : ""} ${floating.slice(0, 10).join(", ")}${floating.length > 10 ? ` and ${floating.length - 10} more` : ""} ha${floating.length > 1 ? "ve" : "s"} no path through runs to any source`,
    }]);
  }
  return { ok: true, system };
}

/** Per-run conductor data that does not depend on the case. */
interface RunData {
  lengthM: number;
  plusSize: string;
  minusSize: string;
  material: Material;
}

/** The compiled netlist of a system and the maps back to its ids. */
export interface CompiledSystem {
  system: System;
  netlist: { nodeCount: number; elements: CircuitElement[] };
  plusNode: Int32Array;
  minusNode: Int32Array;
  /** Element index of each run's + and − conductor, each source, each load. */
  runPlus: Int32Array;
  runMinus: Int32Array;
  sourceEl: Int32Array;
  loadEl: Int32Array;
  runData: RunData[];
  cases: Case[];
  prepared: PreparedCircuit;
  primary: number;
  /** Per point: index of the point whose voltage starts the branch (for branch drop). */
  branchOrigin: Int32Array;
  resistivityRuns: string[];
  /** 1 for every load element (removed for the open-circuit solve behind fault currents). */
  loadMask: Uint8Array;
  pointIndex: Map<string, number>;
  /** [+ node, − node] of every point. */
  pointPairs: [number, number][];
  runFrom: Int32Array;
  runTo: Int32Array;
}

export function defaultCases(system: System): Case[] {
  return system.cases && system.cases.length > 0 ? system.cases : [{ name: "Nominal", loadFactor: 1 }];
}

/** Ω/m of one conductor for a run at a temperature. */
function ohmPerMetre(size: string, run: System["runs"][number], temperatureC: number) {
  return conductorResistance(size, run.material, temperatureC, run.stranding)!;
}

/** Builds the netlist (values for the first case) and analyses its structure once. */
export function compileSystem(system: System, limits: WorkLimits = {}): CompiledSystem | SolveFailure {
  const np = system.points.length;
  const pointIndex = new Map(system.points.map((p, i) => [p.id, i]));
  const plusNode = new Int32Array(np);
  const minusNode = new Int32Array(np);
  const refPoint = pointIndex.get(system.sources[0].point)!;
  let next = 1;
  for (let i = 0; i < np; i++) {
    minusNode[i] = i === refPoint ? 0 : next++;
    plusNode[i] = next++;
  }
  const elements: CircuitElement[] = [];
  const runPlus = new Int32Array(system.runs.length);
  const runMinus = new Int32Array(system.runs.length);
  const runData: RunData[] = [];
  const resistivityRuns: string[] = [];
  const lengthFactor = system.units === "imperial" ? METRES_PER_FOOT : 1;
  system.runs.forEach((r, i) => {
    const a = pointIndex.get(r.from)!;
    const b = pointIndex.get(r.to)!;
    const minusSize = r.returnSize ?? r.size;
    runData.push({ lengthM: (r.length as number) * lengthFactor, plusSize: r.size, minusSize, material: r.material });
    if (ohmPerMetre(r.size, r, 20).basis === "resistivity" || ohmPerMetre(minusSize, r, 20).basis === "resistivity") resistivityRuns.push(r.id);
    runPlus[i] = elements.length;
    elements.push({ kind: "resistor", id: `${r.id}(+)`, a: plusNode[a], b: plusNode[b], ohms: 1 });
    runMinus[i] = elements.length;
    elements.push({ kind: "resistor", id: `${r.id}(−)`, a: minusNode[a], b: minusNode[b], ohms: 1 });
  });
  const sourceEl = new Int32Array(system.sources.length);
  system.sources.forEach((s, i) => {
    const p = pointIndex.get(s.point)!;
    sourceEl[i] = elements.length;
    if (s.type === "pvArray") elements.push({ kind: "currentSource", id: s.id, from: minusNode[p], to: plusNode[p], amps: s.currentA });
    else elements.push({ kind: "voltageSource", id: s.id, plus: plusNode[p], minus: minusNode[p], volts: s.voltage, seriesOhms: s.internalResistanceOhm });
  });
  const loadEl = new Int32Array(system.loads.length);
  system.loads.forEach((l, i) => {
    const p = pointIndex.get(l.point)!;
    loadEl[i] = elements.length;
    if (l.model === "constantResistance") elements.push({ kind: "resistor", id: l.id, a: plusNode[p], b: minusNode[p], ohms: 1 });
    else if (l.model === "constantCurrent") elements.push({ kind: "constantCurrent", id: l.id, plus: plusNode[p], minus: minusNode[p], amps: l.amps });
    else elements.push({ kind: "constantPower", id: l.id, plus: plusNode[p], minus: minusNode[p], watts: l.watts });
  });
  const cases = defaultCases(system);
  const netlist = { nodeCount: next, elements };
  const loadMask = new Uint8Array(elements.length);
  for (const e of loadEl) loadMask[e] = 1;
  const runFrom = Int32Array.from(system.runs, (r) => pointIndex.get(r.from)!);
  const runTo = Int32Array.from(system.runs, (r) => pointIndex.get(r.to)!);
  const compiled = { system, netlist, plusNode, minusNode, runPlus, runMinus, sourceEl, loadEl, runData, cases, resistivityRuns, loadMask, pointIndex, runFrom, runTo } as CompiledSystem;
  applyCase(compiled, cases[0]);
  const pairs: [number, number][] = [];
  for (let i = 0; i < np; i++) pairs.push([plusNode[i], minusNode[i]]);
  // Order the matrix point by point (a point's + and − terminal together).
  const nodeGroups = new Int32Array(next);
  for (let i = 0; i < np; i++) { nodeGroups[plusNode[i]] = i; nodeGroups[minusNode[i]] = i; }
  const prepared = prepareCircuit(netlist, {
    extraPairs: pairs,
    nodeGroups,
    orderingWorkLimit: limits.orderingWorkLimit ?? SYSTEM_LIMITS.orderingWork,
    workLimit: limits.workLimit ?? SYSTEM_LIMITS.solveWork,
  });
  compiled.pointPairs = pairs;
  if ("ok" in prepared) return failure(prepared.errors.map((e) => circuitErrorToEngine(compiled, e)));
  compiled.prepared = prepared;
  const primaryIdx = system.sources.findIndex((s) => s.primary);
  compiled.primary = primaryIdx >= 0 ? primaryIdx : 0;
  compiled.branchOrigin = branchOrigins(compiled);
  return compiled;
}

/** Writes one case's values into the netlist's elements (the topology stays the same). */
export function applyCase(c: CompiledSystem, kase: Case): number {
  const { system, netlist, runData } = c;
  const temperatureC = kase.conductorTemperatureC ?? system.conductorTemperatureC;
  // Ω/m per distinct (size, material, stranding): a site repeats a few cable types many times.
  const perMetre = [new Map<string, number>(), new Map<string, number>(), new Map<string, number>(), new Map<string, number>()];
  const rpm = (size: string, r: System["runs"][number]) => {
    const m = perMetre[(r.material === "copper" ? 0 : 2) + (r.stranding === "class5" ? 0 : 1)];
    let v = m.get(size);
    if (v === undefined) { v = ohmPerMetre(size, r, temperatureC).ohmPerMetre; m.set(size, v); }
    return v;
  };
  system.runs.forEach((r, i) => {
    const d = runData[i];
    (netlist.elements[c.runPlus[i]] as { ohms: number }).ohms = (rpm(d.plusSize, r) * d.lengthM) / r.parallel;
    (netlist.elements[c.runMinus[i]] as { ohms: number }).ohms = (rpm(d.minusSize, r) * d.lengthM) / r.parallel;
  });
  system.sources.forEach((s, i) => {
    const el = netlist.elements[c.sourceEl[i]];
    if (s.type === "pvArray") (el as { amps: number }).amps = kase.sourceCurrents?.[s.id] ?? s.currentA;
    else (el as { volts: number }).volts = kase.sourceVoltages?.[s.id] ?? s.voltage;
  });
  const f = kase.loadFactor ?? 1;
  system.loads.forEach((l, i) => {
    const el = netlist.elements[c.loadEl[i]];
    if (l.model === "constantResistance") {
      const ohms = l.ohms ?? (system.nominalVoltage * system.nominalVoltage) / l.watts!;
      // A load factor of 0 (or so small that ohms / f overflows, e.g. 5e-324) leaves the load open.
      const scaled = ohms / f;
      (el as { ohms: number }).ohms = ohms === 0 ? 0 : f === 0 || !(scaled < 1e300) ? 1e300 : scaled;
    } else if (l.model === "constantCurrent") (el as { amps: number }).amps = l.amps * f;
    else (el as { watts: number }).watts = l.watts * f;
  });
  return temperatureC;
}

/** For each point, the point where its branch starts: the nearest (by + conductor resistance at
 *  20 °C) point that has a source or touches a feeder run. Dijkstra from every such point at once,
 *  on typed arrays (a 20,000-fixture site). */
function branchOrigins(c: CompiledSystem): Int32Array {
  const { system, runFrom, runTo } = c;
  const np = system.points.length;
  const nr = system.runs.length;
  const origin = new Int32Array(np).fill(-1);
  const dist = new Float64Array(np).fill(Infinity);
  // Adjacency in compressed rows.
  const deg = new Int32Array(np + 1);
  for (let i = 0; i < nr; i++) { deg[runFrom[i] + 1]++; deg[runTo[i] + 1]++; }
  for (let i = 0; i < np; i++) deg[i + 1] += deg[i];
  const nbr = new Int32Array(2 * nr);
  const wt = new Float64Array(2 * nr);
  const fillAt = deg.slice(0, np);
  const perArea = new Map<string, number>();
  for (let i = 0; i < nr; i++) {
    const size = c.runData[i].plusSize;
    let r20 = perArea.get(size);
    if (r20 === undefined) { r20 = conductorResistance(size, "copper", 20)!.ohmPerMetre; perArea.set(size, r20); }
    const w = (c.runData[i].lengthM * r20) / system.runs[i].parallel;
    const a = runFrom[i];
    const b = runTo[i];
    nbr[fillAt[a]] = b; wt[fillAt[a]++] = w;
    nbr[fillAt[b]] = a; wt[fillAt[b]++] = w;
  }
  // Binary heap of (distance, point) with lazy deletion.
  let size = 0;
  let hd = new Float64Array(64);
  let hv = new Int32Array(64);
  const push = (d: number, v: number) => {
    if (size === hd.length) {
      const nd = new Float64Array(size * 2); nd.set(hd); hd = nd;
      const nv = new Int32Array(size * 2); nv.set(hv); hv = nv;
    }
    let i = size++;
    while (i > 0) {
      const p = (i - 1) >> 1;
      if (hd[p] <= d) break;
      hd[i] = hd[p]; hv[i] = hv[p]; i = p;
    }
    hd[i] = d; hv[i] = v;
  };
  const popInto = (): number => {
    const v = hv[0];
    const d = hd[--size];
    const w = hv[size];
    let i = 0;
    for (;;) {
      const l = 2 * i + 1;
      if (l >= size) break;
      const r = l + 1;
      const m = r < size && hd[r] < hd[l] ? r : l;
      if (hd[m] >= d) break;
      hd[i] = hd[m]; hv[i] = hv[m]; i = m;
    }
    hd[i] = d; hv[i] = w;
    return v;
  };
  const seed = (p: number) => { if (origin[p] !== p) { dist[p] = 0; origin[p] = p; push(0, p); } };
  for (const s of system.sources) seed(c.pointIndex.get(s.point)!);
  for (let i = 0; i < nr; i++) if (system.runs[i].kind === "feeder") { seed(runFrom[i]); seed(runTo[i]); }
  while (size > 0) {
    const d = hd[0];
    const v = popInto();
    if (d > dist[v]) continue;
    for (let q = deg[v]; q < deg[v + 1]; q++) {
      const u = nbr[q];
      const nd = d + wt[q];
      if (nd < dist[u]) { dist[u] = nd; origin[u] = origin[v]; push(nd, u); }
    }
  }
  return origin;
}


function circuitErrorToEngine(c: Pick<CompiledSystem, "system" | "netlist" | "loadEl" | "sourceEl">, e: CircuitError, caseName?: string): EngineError {
  const byElement = new Map<string, string>();
  c.netlist.elements.forEach((el) => byElement.set(el.id, el.id.replace(/\((\+|−)\)$/, "")));
  const ids = [...new Set(e.elementIds.map((id) => byElement.get(id) ?? id))];
  const where = caseName ? ` (case "${caseName}")` : "";
  switch (e.code) {
    case "VOLTAGE_COLLAPSE":
      return { code: "VOLTAGE_COLLAPSE", ids, case: caseName, message: `Voltage collapse at load ${ids[0]}${where}: the supply cannot deliver this constant-power load over these cables; only about ${Math.floor((e.deliverableFraction ?? 0) * 1000) / 10} % of the constant-power demand can be met. Use larger cables, a shorter run or a higher system voltage.` };
    case "NO_CONVERGENCE":
      return { code: "VOLTAGE_COLLAPSE", ids, case: caseName, message: `The constant-power loads ${ids.slice(0, 5).join(", ")}${where} could not be solved: the supply is at or beyond the point of voltage collapse.` };
    case "SHORTED_SOURCE":
      return { code: "SHORTED_SOURCE", ids, case: caseName, message: `A zero-resistance path shorts ${ids.join(", ")}${where}; give every load its real resistance or power.` };
    case "PARALLEL_IDEAL_SOURCES":
      return { code: "PARALLEL_IDEAL_SOURCES", ids, case: caseName, message: `${e.message}${where ? ` ${where.trim()}` : ""}` };
    case "FLOATING_NODE":
      return { code: "FLOATING_POINT", ids, case: caseName, message: `Part of the network has nothing that sets its voltage (for example a PV array with only constant-current loads): ${ids.slice(0, 8).join(", ")}.` };
    case "ILL_CONDITIONED":
      return { code: "ILL_CONDITIONED", ids, case: caseName, message: `${e.message}` };
    case "BAD_ELEMENT":
      return { code: "INVALID_FIELD", ids, case: caseName, message: `${e.message} (${ids.join(", ")})` };
    case "WORK_LIMIT":
      return { code: "TOO_LARGE", ids, case: caseName, message: tooMuchWorkMessage(c.system, e, caseName) };
    default:
      return { code: "ILL_CONDITIONED", ids, case: caseName, message: e.message };
  }
}

/** The id of the first result with a NaN or ±Infinity among its numbers (null counts as no value). */
function firstNonFinite(...groups: (ReadonlyArray<object & { id: string }> | (object & { id: string }))[]): string | undefined {
  for (const group of groups) {
    for (const item of (Array.isArray(group) ? group : [group]) as (object & { id: string })[]) {
      for (const v of Object.values(item)) if (typeof v === "number" && !Number.isFinite(v)) return item.id;
    }
  }
  return undefined;
}

/** What a contractor reads when a solve is stopped by its work budget (SYSTEM_LIMITS.solveWork). */
function tooMuchWorkMessage(system: System, e: CircuitError, caseName?: string): string {
  const size = `${system.points.length} points, ${system.runs.length} runs, ${system.loads.length} loads, ${defaultCases(system).length} case${defaultCases(system).length === 1 ? "" : "s"}`;
  const why = e.budget === "solves"
    ? `solving its cases needs too many steps (constant-power loads at or near voltage collapse${caseName ? `, here in case "${caseName}"` : ""}, or too many cases for its size)`
    : "it has too many loops between its points (a densely meshed network)";
  return `This network is too large to solve within the engine's work budget (${size}): ${why}. Split it into several systems, remove cases, or fix what makes the loads collapse.`;
}

/** Drop limits: which limit governs a load and its status. */
export function classify(dropPercent: number, branchDropPercent: number, critical: boolean, profile: LimitProfile) {
  let ratio: number;
  let limitPercent: number;
  let governingLimit: LoadResult["governingLimit"];
  if (critical) {
    limitPercent = profile.criticalPercent;
    governingLimit = "critical";
    ratio = dropPercent / limitPercent;
  } else {
    const rt = dropPercent / profile.totalPercent;
    const rb = branchDropPercent / profile.branchPercent;
    if (rb >= rt) { ratio = rb; limitPercent = profile.branchPercent; governingLimit = "branch"; }
    else { ratio = rt; limitPercent = profile.totalPercent; governingLimit = "total"; }
  }
  const status: LoadStatus = ratio > 1 ? "over" : ratio >= profile.nearFraction ? "near" : "within";
  return { ratio, limitPercent, governingLimit, status };
}

const round = (v: number, digits: number) => Number(v.toFixed(digits));

/** Findings written out in full per code; the rest are summarised. */
export const FINDINGS_PER_CODE = 50;

/** Solves every case of a system and runs every check. Never throws for bad input. */
export function solveSystem(input: unknown, options: SolveOptions & WorkLimits = {}): SolveResult {
  const parsed = parseSystem(input);
  if (!parsed.ok) return parsed;
  const compiled = compileSystem(parsed.system, options);
  if ("ok" in compiled) return compiled;
  return solveCompiled(compiled, options);
}

/** Solves an already compiled system (auto-size re-solves with new run sizes this way). */
export function solveCompiled(c: CompiledSystem, options: SolveOptions = {}): SolveResult {
  const { system, netlist, prepared } = c;
  // Every solve has its own work budget (auto-size re-solves one compiled system many times).
  resetWork(prepared, options.workLimit);
  const profile = system.limitProfile ?? DEFAULT_LIMIT_PROFILE;
  let cases = c.cases;
  if (options.caseName !== undefined) {
    cases = cases.filter((k) => k.name === options.caseName);
    if (cases.length === 0) return failure([{ code: "UNKNOWN_CASE", path: "cases", message: `cases: there is no case named "${options.caseName}" (cases: ${c.cases.map((k) => k.name).join(", ")})` }]);
  }
  const caseResults: CaseResult[] = [];
  const findings: Finding[] = [];
  const errors: EngineError[] = [];
  const np = system.points.length;
  const pairs = c.pointPairs;
  const pointIndex = c.pointIndex;
  const loadPoint = system.loads.map((l) => pointIndex.get(l.point)!);
  const batteryAt = new Set<number>();
  system.sources.forEach((s) => { if (s.type === "battery") batteryAt.add(pointIndex.get(s.point)!); });
  const unbounded = new Set<string>();

  for (const kase of cases) {
    const temperatureC = applyCase(c, kase);
    const sol = solvePrepared(prepared);
    if (!sol.ok) {
      const converted = sol.errors.map((e) => circuitErrorToEngine(c, e, kase.name));
      // Out of budget: the other cases cannot be solved either.
      if (sol.errors[0].code === "WORK_LIMIT") return failure(converted);
      errors.push(...converted);
      continue;
    }
    const V = sol.voltages;
    const I = sol.currents;
    const pv = (i: number) => V[c.plusNode[i]] - V[c.minusNode[i]];

    // Available fault current: open-circuit voltage over the Thevenin resistance, loads removed.
    let fault: (number | null)[] = new Array(np).fill(null);
    if (!options.skipFaultCurrent) {
      const open = solvePrepared(prepared, { skipCollapseSearch: true, disabled: c.loadMask });
      if (!open.ok && open.errors[0].code === "WORK_LIMIT") return failure(open.errors.map((e) => circuitErrorToEngine(c, e, kase.name)));
      // One more factorization and the selected inverse (about as much work again).
      if (!chargeWork(prepared, 2 * prepared.factorWork)) {
        return failure([circuitErrorToEngine(c, { code: "WORK_LIMIT", message: "fault current", elementIds: [], nodes: [], budget: "solves" }, kase.name)]);
      }
      const rth = theveninResistances(prepared, pairs, c.loadMask);
      if (open.ok && rth) {
        fault = system.points.map((p, i) => {
          const voc = open.voltages[c.plusNode[i]] - open.voltages[c.minusNode[i]];
          const r = rth[i];
          if (!Number.isFinite(r)) return 0;
          // 0 Ω, or so little that V / R overflows: no finite estimate.
          if (r === 0 || !Number.isFinite(voc / r)) { unbounded.add(p.id); return null; }
          return voc / r;
        });
      }
    }

    const points: PointResult[] = system.points.map((p, i) => ({ id: p.id, voltage: pv(i), faultCurrentA: fault[i] }));
    const primaryPoint = pointIndex.get(system.sources[c.primary].point)!;
    const vRef = pv(primaryPoint);
    let sourceLossW = 0;
    const sources: SourceResult[] = system.sources.map((s, i) => {
      const e = c.sourceEl[i];
      const current = I[e];
      const vt = pv(pointIndex.get(s.point)!);
      if (s.type !== "pvArray") sourceLossW += current * current * s.internalResistanceOhm;
      return { id: s.id, current, terminalVoltage: vt, powerW: vt * current };
    });
    let conductorLossW = 0;
    const runs: RunResult[] = system.runs.map((r, i) => {
      const ep = c.runPlus[i];
      const em = c.runMinus[i];
      const rp = (netlist.elements[ep] as { ohms: number }).ohms;
      const rm = (netlist.elements[em] as { ohms: number }).ohms;
      const ip = I[ep];
      const iret = -I[em]; // − conductor current from `to` back to `from`
      const lossW = ip * ip * rp + iret * iret * rm;
      conductorLossW += lossW;
      const d = c.runData[i];
      const ampP = ampacity(d.plusSize, r.material, r.insulationC);
      const ampM = ampacity(d.minusSize, r.material, r.insulationC);
      let amp: number | null = null;
      let util: number | null = null;
      if (ampP !== undefined && ampM !== undefined) {
        amp = Math.min(ampP, ampM);
        util = Math.max(Math.abs(ip) / ampP, Math.abs(iret) / ampM) * 100;
      }
      return { id: r.id, current: ip, returnCurrent: iret, resistanceOhm: rp, returnResistanceOhm: rm, dropV: ip * rp + iret * rm, lossW, ampacityA: amp, utilizationPercent: util };
    });
    let loadW = 0;
    const loads: LoadResult[] = system.loads.map((l, i) => {
      const e = c.loadEl[i];
      const p = loadPoint[i];
      const v = pv(p);
      const current = I[e];
      const powerW = v * current;
      loadW += powerW;
      const dropPercent = ((vRef - v) / system.nominalVoltage) * 100;
      const origin = c.branchOrigin[p];
      const branchDropPercent = ((pv(origin) - v) / system.nominalVoltage) * 100;
      const k = classify(dropPercent, branchDropPercent, l.critical, profile);
      const underVoltage = l.minVoltage !== undefined && v < l.minVoltage;
      return {
        id: l.id, voltage: v, current, powerW, dropPercent, branchDropPercent,
        limitPercent: k.limitPercent, governingLimit: k.governingLimit,
        status: underVoltage ? "over" : k.status, underVoltage,
      };
    });
    // Values at the edge of what the schema allows (a load factor of 100 on a 1e7 W load, a
    // 5e-324 Ω load) can overflow the arithmetic: report that instead of NaN or Infinity, which
    // JSON would carry as null.
    const totals: { id: string; loadW: number; conductorLossW: number; sourceLossW: number } = { id: "(totals)", loadW, conductorLossW, sourceLossW };
    const overflow = firstNonFinite(points, sources, runs, loads, totals);
    if (overflow) {
      errors.push({ code: "ILL_CONDITIONED", ids: [overflow], case: kase.name, message: `The network cannot be solved accurately in case "${kase.name}": the result for ${overflow} is out of range (a resistance so small, or a load so large, that the arithmetic overflows). Check the values of ${overflow} and what it connects to.` });
      continue;
    }
    // A constant-current load cannot run at or below 0 V: the supply cannot push its current
    // through these cables. Say so instead of reporting negative volts.
    const dead = loads.filter((lr) => lr.voltage <= 0 && lr.current !== 0);
    if (dead.length > 0) {
      const ids = dead.map((d) => d.id);
      errors.push({ code: "VOLTAGE_COLLAPSE", ids, case: kase.name, message: `Voltage collapse at load ${ids.slice(0, 5).join(", ")}${ids.length > 5 ? " …" : ""} (case "${kase.name}"): the supply cannot drive ${ids.length > 1 ? "their" : "its"} current through these cables (the load voltage would be at or below 0 V). Use larger cables, a shorter run or a higher system voltage.` });
      continue;
    }
    caseResults.push({
      name: kase.name,
      conductorTemperatureC: temperatureC,
      newtonIterations: sol.newtonIterations,
      points, sources, runs, loads,
      // Loads that draw (next to) nothing — a load factor of 1e-323 — give no meaningful percentage;
      // Infinity would reach the client as null.
      totals: { loadW, conductorLossW, sourceLossW, lossPercent: loadW > 0 && Number.isFinite((conductorLossW / loadW) * 100) ? (conductorLossW / loadW) * 100 : 0 },
    });
  }
  if (errors.length > 0) return failure(errors);

  // Findings: at most FINDINGS_PER_CODE written out per code; the rest of that code are counted
  // in one summary finding that still lists every id (a 20,000-fixture site over limit would
  // otherwise carry 20,000 near-identical messages).
  const overflow = new Map<string, { severity: Severity; ids: string[] }>();
  const perCode = new Map<string, number>();
  const addFinding = (code: string, severity: Severity, ids: string[], make: () => Finding) => {
    const n = (perCode.get(code) ?? 0) + 1;
    perCode.set(code, n);
    if (n <= FINDINGS_PER_CODE) { findings.push(make()); return; }
    const o = overflow.get(code) ?? { severity, ids: [] };
    o.ids.push(ids[0]);
    overflow.set(code, o);
  };

  // Worst case per load (index-based: systems have tens of thousands of loads).
  const worstIdx = new Int32Array(system.loads.length);
  const worst: WorstLoad[] = system.loads.map((l, i) => {
    let bestRatio = -Infinity;
    let bi = 0;
    caseResults.forEach((cr, ci) => {
      const lr = cr.loads[i];
      const ratio = (lr.underVoltage ? 1e6 : 0) + (lr.governingLimit === "branch" ? lr.branchDropPercent : lr.dropPercent) / lr.limitPercent;
      if (ratio > bestRatio) { bestRatio = ratio; bi = ci; }
    });
    worstIdx[i] = bi;
    const best = caseResults[bi].loads[i];
    return { id: l.id, worstCase: caseResults[bi].name, dropPercent: best.dropPercent, limitPercent: best.limitPercent, status: best.status, voltage: best.voltage };
  });

  // Findings.
  worst.forEach((w, i) => {
    const lr = caseResults[worstIdx[i]].loads[i];
    const load = system.loads[i];
    if (w.status === "over") {
      if (lr.underVoltage) {
        addFinding("UNDER_VOLTAGE", "error", [w.id], () => ({ severity: "error", code: "UNDER_VOLTAGE", ids: [w.id], case: w.worstCase, message: `Load ${w.id} gets ${round(lr.voltage, 2)} V in "${w.worstCase}", below its minimum of ${load.minVoltage} V.` }));
      }
      const shown = lr.governingLimit === "branch" ? lr.branchDropPercent : lr.dropPercent;
      if (shown > lr.limitPercent) {
        const which = lr.governingLimit === "branch" ? "branch" : lr.governingLimit === "critical" ? "critical-load" : "total";
        addFinding("DROP_OVER_LIMIT", "error", [w.id], () => ({ severity: "error", code: "DROP_OVER_LIMIT", ids: [w.id], case: w.worstCase, message: `Load ${w.id} is over limit: ${round(shown, 2)} % ${which} voltage drop in "${w.worstCase}" against a limit of ${lr.limitPercent} % (${round(lr.voltage, 2)} V at the load).` }));
      }
    } else if (w.status === "near") {
      const shown = lr.governingLimit === "branch" ? lr.branchDropPercent : lr.dropPercent;
      addFinding("DROP_NEAR_LIMIT", "warning", [w.id], () => ({ severity: "warning", code: "DROP_NEAR_LIMIT", ids: [w.id], case: w.worstCase, message: `Load ${w.id} is near its limit: ${round(shown, 2)} % ${lr.governingLimit === "branch" ? "branch " : ""}drop in "${w.worstCase}" against ${lr.limitPercent} %.` }));
    }
  });
  // Runs: ampacity, fuses, fault current. Use the largest current over the cases.
  const notChecked: string[] = [];
  system.runs.forEach((r, i) => {
    let maxI = 0;
    let maxCase = caseResults[0].name;
    for (const cr of caseResults) {
      const rr = cr.runs[i];
      const cur = Math.max(Math.abs(rr.current), Math.abs(rr.returnCurrent));
      if (cur > maxI) { maxI = cur; maxCase = cr.name; }
    }
    const d = c.runData[i];
    const amp = caseResults[0].runs[i].ampacityA;
    if (amp === null) notChecked.push(r.id);
    else if (maxI > amp) {
      addFinding("AMPACITY_EXCEEDED", "error", [r.id], () => ({ severity: "error", code: "AMPACITY_EXCEEDED", ids: [r.id], case: maxCase, message: `Run ${r.id} carries ${round(maxI, 1)} A in "${maxCase}", more than the ${amp} A ampacity of ${d.plusSize === d.minusSize ? d.plusSize : `${d.plusSize}/${d.minusSize}`} ${r.material} at ${r.insulationC} °C (${AMPACITY_SOURCE}).` }));
    }
    if (r.fuseA !== undefined) {
      // 1e-9 slack: a 20 A load solves to 20.000000000000004 A, and a 25 A fuse is right for it.
      if (r.fuseA < 1.25 * maxI * (1 - 1e-9)) {
        addFinding("FUSE_TOO_SMALL", "error", [r.id], () => ({ severity: "error", code: "FUSE_TOO_SMALL", ids: [r.id], case: maxCase, message: `Run ${r.id}: the ${r.fuseA} A fuse is below 125 % of the ${round(maxI, 1)} A it carries in "${maxCase}" (continuous loads need at least ${round(1.25 * maxI, 1)} A).` }));
      }
      const small = Math.min(smallConductorFuseLimit(d.plusSize, r.material) ?? Infinity, smallConductorFuseLimit(d.minusSize, r.material) ?? Infinity);
      const ceiling = Math.min(amp ?? Infinity, small);
      if (r.fuseA > ceiling) {
        const basis = small <= (amp ?? Infinity) ? `${SMALL_CONDUCTOR_LIMIT_SOURCE} limit for ${d.plusSize}` : `the conductor's ${amp} A ampacity`;
        addFinding("FUSE_TOO_LARGE", "error", [r.id], () => ({ severity: "error", code: "FUSE_TOO_LARGE", ids: [r.id], message: `Run ${r.id}: the ${r.fuseA} A fuse does not protect the conductor; it must not exceed ${ceiling} A (${basis}).` }));
      }
    }
    // A run may be drawn either way round: the fuse sits at the end with the larger fault current
    // (the battery end), so check against the worse of the two ends.
    const batteryEnd = batteryAt.has(c.runFrom[i]) ? c.runFrom[i] : batteryAt.has(c.runTo[i]) ? c.runTo[i] : undefined;
    if (r.fuseA === undefined) {
      if (batteryEnd !== undefined) {
        const bid = system.points[batteryEnd].id;
        addFinding("UNFUSED_BATTERY_RUN", "warning", [r.id, bid], () => ({ severity: "warning", code: "UNFUSED_BATTERY_RUN", ids: [r.id, bid], message: `Run ${r.id} leaves battery point ${bid} without a fuse; fuse the positive conductor close to the battery.` }));
      }
      return;
    }
    const ends = [c.runFrom[i], c.runTo[i]];
    let maxFault = 0;
    let faultEnd = ends[0];
    let unboundedEnd = false;
    for (const cr of caseResults) for (const e of ends) {
      const f = cr.points[e].faultCurrentA;
      if (f === null) unboundedEnd = true;
      else if (f > maxFault) { maxFault = f; faultEnd = e; }
    }
    const endId = system.points[faultEnd].id;
    const pointRatings = ends.map((e) => system.points[e].fuseInterruptingA).filter((x): x is number => x !== undefined);
    const rating = r.fuseInterruptingA ?? (pointRatings.length ? Math.min(...pointRatings) : undefined);
    const faultText = unboundedEnd ? "an unbounded fault current (a source without internal resistance)" : `about ${Math.round(maxFault)} A of fault current`;
    if (r.fuseA !== undefined && rating !== undefined && !options.skipFaultCurrent && (maxFault > rating || unboundedEnd)) {
      addFinding("FAULT_OVER_INTERRUPTING", "error", [r.id, endId], () => ({ severity: "error", code: "FAULT_OVER_INTERRUPTING", ids: [r.id, endId], message: `Run ${r.id}: ${faultText} is available at ${endId}, more than the ${rating} A interrupting rating of its fuse.` }));
    }
    if (r.fuseA !== undefined && rating === undefined && !options.skipFaultCurrent) {
      addFinding("INTERRUPTING_RATING_MISSING", "warning", [r.id], () => ({ severity: "warning", code: "INTERRUPTING_RATING_MISSING", ids: [r.id], message: `Run ${r.id}: enter the interrupting rating of its ${r.fuseA} A fuse; ${faultText} is available at ${endId}.` }));
    }
  });
  if (!options.skipFaultCurrent) {
    system.points.forEach((p, i) => {
      if (p.fuseInterruptingA === undefined) return;
      let maxFault = 0;
      for (const cr of caseResults) maxFault = Math.max(maxFault, cr.points[i].faultCurrentA ?? 0);
      if (maxFault > p.fuseInterruptingA) {
        addFinding("FAULT_OVER_INTERRUPTING", "error", [p.id], () => ({ severity: "error", code: "FAULT_OVER_INTERRUPTING", ids: [p.id], message: `Point ${p.id}: about ${Math.round(maxFault)} A of fault current is available, more than the ${p.fuseInterruptingA} A interrupting rating of its protection.` }));
      }
    });
  }
  if (unbounded.size > 0) {
    addFinding("FAULT_CURRENT_UNBOUNDED", "warning", [...unbounded], () => ({ severity: "warning", code: "FAULT_CURRENT_UNBOUNDED", ids: [...unbounded], message: `The fault current at ${[...unbounded].slice(0, 6).join(", ")} cannot be estimated because a source there has no internal resistance; enter the battery's or supply's internal resistance.` }));
  }
  if (notChecked.length > 0) {
    addFinding("AMPACITY_NOT_CHECKED", "info", notChecked, () => ({ severity: "info", code: "AMPACITY_NOT_CHECKED", ids: notChecked, message: `Ampacity is not checked for ${notChecked.length} run${notChecked.length > 1 ? "s" : ""} (${notChecked.slice(0, 6).join(", ")}${notChecked.length > 6 ? " …" : ""}): ${AMPACITY_SOURCE} has no value for metric or 18/16 AWG sizes. Check them against the cable maker's table.` }));
  }
  if (c.resistivityRuns.length > 0) {
    addFinding("RESISTANCE_FROM_RESISTIVITY", "info", c.resistivityRuns, () => ({ severity: "info", code: "RESISTANCE_FROM_RESISTIVITY", ids: c.resistivityRuns, message: `No published table value for ${c.resistivityRuns.slice(0, 6).join(", ")}${c.resistivityRuns.length > 6 ? " …" : ""} (metric aluminium): resistance computed from resistivity and the nominal cross-section, which can read a few per cent low.` }));
  }
  for (const [code, o] of overflow) {
    findings.push({ severity: o.severity, code, ids: o.ids, message: `… and ${o.ids.length} more of the same (${code}): ${o.ids.slice(0, 8).join(", ")}${o.ids.length > 8 ? " …" : ""}.` });
  }
  return { ok: true, cases: caseResults, loads: worst, findings, cautions: CAUTIONS, limitProfile: profile };
}
