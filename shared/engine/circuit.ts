// The circuit solver: modified nodal analysis of a netlist of two-terminal DC elements.
//
// Unknowns are node voltages (node 0 is the reference). Ideal voltage sources and zero-ohm
// resistors are not given a branch-current row; instead their two nodes are merged into one
// unknown with a fixed offset (V_plus = V_minus + E), which keeps the matrix symmetric positive
// definite so that sparse.ts can factor it with LDLᵀ. Their currents are recovered afterwards
// from Kirchhoff's current law over the merged nodes. This is the same system as the textbook
// MNA with an extra row per ideal source, with those rows eliminated by substitution; the tests
// compare it against that textbook form solved by mathjs's sparse LU.
//
// Sources with a series resistance are stamped as their Norton equivalent. Constant-power sinks
// (I = P/V) are solved by Newton–Raphson on the same pattern: each step stamps the linearised
// load, a conductance −P/V₀² in parallel with a current sink 2P/V₀, refactors numerically (the
// symbolic analysis is reused) and takes a damped step.

import {
  allocateNumeric,
  analyze,
  factorize,
  PatternBuilder,
  selectedEntry,
  selectedInverse,
  solveInto,
  type NumericFactor,
} from "./sparse.js";

export type CircuitElement =
  | { kind: "resistor"; id: string; a: number; b: number; ohms: number }
  /** Voltage source, + terminal at `plus`. seriesOhms 0 (default) = ideal. */
  | { kind: "voltageSource"; id: string; plus: number; minus: number; volts: number; seriesOhms?: number }
  /** Current source that drives `amps` out of node `from`, through itself, into node `to`. */
  | { kind: "currentSource"; id: string; from: number; to: number; amps: number }
  /** Sink drawing `amps` into its + terminal and out of its − terminal. */
  | { kind: "constantCurrent"; id: string; plus: number; minus: number; amps: number }
  /** Sink drawing P/V, V = V(plus) − V(minus). */
  | { kind: "constantPower"; id: string; plus: number; minus: number; watts: number };

export interface Netlist {
  /** Nodes are 0 … nodeCount − 1; node 0 is the reference. */
  nodeCount: number;
  elements: CircuitElement[];
}

export type CircuitErrorCode =
  | "FLOATING_NODE"
  | "SHORTED_SOURCE"
  | "PARALLEL_IDEAL_SOURCES"
  | "ILL_CONDITIONED"
  | "VOLTAGE_COLLAPSE"
  | "NO_CONVERGENCE"
  | "BAD_ELEMENT"
  /** The solve needs more work than its budget (PrepareOptions.workLimit / orderingWorkLimit). */
  | "WORK_LIMIT";

export interface CircuitError {
  code: CircuitErrorCode;
  message: string;
  /** Ids of the elements involved. */
  elementIds: string[];
  nodes: number[];
  /** For VOLTAGE_COLLAPSE: the largest fraction of the constant-power demand that solves. */
  deliverableFraction?: number;
  /** For WORK_LIMIT: which budget ran out — the ordering, one factorization alone, or the solves. */
  budget?: "ordering" | "factorization" | "solves";
}

export interface CircuitSolution {
  ok: true;
  /** Node voltages against node 0. */
  voltages: Float64Array;
  /** Current of each element, in element order: resistor a→b; sources out of + (`plus` or `to`)
   *  into the circuit; sinks into their + terminal. */
  currents: Float64Array;
  newtonIterations: number;
}

export type CircuitResult = CircuitSolution | { ok: false; errors: CircuitError[] };

export interface PrepareOptions {
  /** Extra node pairs to include in the sparsity pattern (e.g. every point's + and − terminal,
   *  so the selected inverse yields the Thevenin resistance between them). */
  extraPairs?: ReadonlyArray<readonly [number, number]>;
  /** Optional group id per node: nodes of one group are ordered together (see groupedOrder). */
  nodeGroups?: Int32Array;
  /** Budget of the minimum-degree ordering (Σ degree² of the eliminated groups); past it the
   *  circuit is refused with WORK_LIMIT. Default: none. */
  orderingWorkLimit?: number;
  /** Budget of the solves on this circuit, in work units (see PreparedCircuit.factorWork): every
   *  numeric factorization charges factorWork, and a solve that would pass the budget stops with
   *  WORK_LIMIT instead of running on (the collapse search can refactor a thousand times per case).
   *  Default: none. resetWork() starts a new budget. */
  workLimit?: number;
}

const K_RES = 0;
const K_VS = 1; // Norton (series resistance > 0)
const K_IDEAL = 2; // ideal voltage source (merge)
const K_SHORT = 3; // zero-ohm resistor (merge)
const K_IS = 4;
const K_CC = 5;
const K_CP = 6;

/** A netlist after its structure has been analysed. Solve it as many times as needed with new
 *  values of the same elements (other cases, Newton steps); the ordering and the elimination
 *  tree are computed once here. */
export interface PreparedCircuit {
  netlist: Netlist;
  kinds: Uint8Array;
  /** First and second node of each element (a/b, plus/minus, from/to). */
  na: Int32Array;
  nb: Int32Array;
  /** Unknown index of each node's merged class, −1 for the reference class. */
  nodeVar: Int32Array;
  varCount: number;
  /** Merge forest in BFS order: node, parent node, merge element (−1 for a class root). */
  mergeOrder: Int32Array;
  mergeParent: Int32Array;
  mergeElement: Int32Array;
  /** Matrix slots per element: [aa, bb, ab] (−1 when not in the matrix). */
  slots: Int32Array;
  num: NumericFactor;
  extraPairSlots: Int32Array;
  /** Work units of one numeric factorization with its solve and stamping: Σ (column count)² of L
   *  + 6·(2·nnz(L) + nnz(A) + 2·unknowns + elements + nodes). Deterministic, so the budget does
   *  not depend on the machine or its load. */
  factorWork: number;
  /** The budget given to prepareCircuit, and the one of the solve in progress. */
  defaultWorkLimit: number;
  workLimit: number;
  workUsed: number;
}

function fail(code: CircuitErrorCode, message: string, elementIds: string[], nodes: number[] = [], extra: Partial<CircuitError> = {}): { ok: false; errors: CircuitError[] } {
  return { ok: false, errors: [{ code, message, elementIds, nodes, ...extra }] };
}

export function prepareCircuit(netlist: Netlist, options: PrepareOptions = {}): PreparedCircuit | { ok: false; errors: CircuitError[] } {
  const { nodeCount, elements } = netlist;
  const m = elements.length;
  const kinds = new Uint8Array(m);
  const na = new Int32Array(m);
  const nb = new Int32Array(m);
  for (let e = 0; e < m; e++) {
    const el = elements[e];
    let a: number;
    let b: number;
    switch (el.kind) {
      case "resistor":
        a = el.a; b = el.b;
        if (!(el.ohms >= 0) || !Number.isFinite(el.ohms)) return fail("BAD_ELEMENT", `Resistor ${el.id} needs a resistance of 0 Ω or more.`, [el.id]);
        kinds[e] = el.ohms === 0 ? K_SHORT : K_RES;
        break;
      case "voltageSource":
        a = el.plus; b = el.minus;
        if (!((el.seriesOhms ?? 0) >= 0)) return fail("BAD_ELEMENT", `Source ${el.id} needs a series resistance of 0 Ω or more.`, [el.id]);
        kinds[e] = (el.seriesOhms ?? 0) > 0 ? K_VS : K_IDEAL;
        break;
      case "currentSource":
        a = el.from; b = el.to; kinds[e] = K_IS; break;
      case "constantCurrent":
        a = el.plus; b = el.minus; kinds[e] = K_CC; break;
      case "constantPower":
        a = el.plus; b = el.minus; kinds[e] = K_CP;
        if (!(el.watts >= 0)) return fail("BAD_ELEMENT", `Load ${el.id} needs a power of 0 W or more.`, [el.id]);
        break;
    }
    if (!(a >= 0 && a < nodeCount && b >= 0 && b < nodeCount) || !Number.isInteger(a) || !Number.isInteger(b)) {
      return fail("BAD_ELEMENT", `Element ${el.id} connects to a node that does not exist.`, [el.id]);
    }
    na[e] = a;
    nb[e] = b;
  }

  // Merge the nodes joined by ideal sources and zero-ohm resistors (union–find with offsets to
  // check loops for consistency; the reference class keeps node 0 as its root).
  const uf = new Int32Array(nodeCount);
  const uoff = new Float64Array(nodeCount);
  const hasShort = new Uint8Array(nodeCount);
  for (let i = 0; i < nodeCount; i++) uf[i] = i;
  const find = (x: number): number => {
    let root = x;
    let off = 0;
    while (uf[root] !== root) { off += uoff[root]; root = uf[root]; }
    // path compression
    let cur = x;
    let curOff = off;
    while (uf[cur] !== root && uf[cur] !== cur) {
      const next = uf[cur];
      const nextOff = curOff - uoff[cur];
      uf[cur] = root;
      uoff[cur] = curOff;
      cur = next;
      curOff = nextOff;
    }
    lastOffset = off;
    return root;
  };
  let lastOffset = 0;
  const mergeAdj: number[][] = new Array(nodeCount);
  for (let e = 0; e < m; e++) {
    const k = kinds[e];
    if (k !== K_IDEAL && k !== K_SHORT) continue;
    const el = elements[e];
    const emf = k === K_IDEAL ? (el as { volts: number }).volts : 0;
    const p = na[e];
    const q = nb[e];
    const rp = find(p); const op = lastOffset;
    const rq = find(q); const oq = lastOffset;
    if (rp === rq) {
      const loopEmf = op - oq - emf;
      if (k === K_SHORT && Math.abs(loopEmf) <= 1e-12 && !hasSourceLoop(elements, kinds, mergeAdj, p, q)) continue; // parallel wires
      const involved = mergeLoop(mergeAdj, p, q, elements);
      const ids = [...new Set([el.id, ...involved])];
      const shorted = k === K_SHORT || hasShort[rp] === 1;
      if (Math.abs(loopEmf) > 1e-9 && shorted) {
        return fail("SHORTED_SOURCE", `A zero-resistance path shorts source ${ids.filter((id) => id !== el.id || k === K_IDEAL).join(", ") || el.id}.`, ids, [p, q]);
      }
      return fail(
        "PARALLEL_IDEAL_SOURCES",
        Math.abs(loopEmf) > 1e-9
          ? `Ideal sources ${ids.join(", ")} are connected in parallel at different voltages; give them an internal resistance.`
          : `Ideal sources ${ids.join(", ")} are in parallel, so how they share the current is undefined; give them an internal resistance.`,
        ids,
        [p, q],
      );
    }
    // link: V_p − V_q = emf
    const ground = find(0);
    if (rp === ground) {
      uf[rq] = rp;
      uoff[rq] = op - emf - oq; // V_rq = V_rp + (op − emf − oq)
    } else {
      uf[rp] = rq;
      uoff[rp] = oq + emf - op;
    }
    if (k === K_SHORT || hasShort[rp] || hasShort[rq]) { hasShort[rp] = 1; hasShort[rq] = 1; }
    (mergeAdj[p] ??= []).push(e);
    (mergeAdj[q] ??= []).push(e);
  }

  // Unknowns: one per merged class except the reference class.
  const groundRoot = find(0);
  const nodeVar = new Int32Array(nodeCount).fill(-2);
  let varCount = 0;
  const classVar = new Int32Array(nodeCount).fill(-2);
  for (let i = 0; i < nodeCount; i++) {
    const r = find(i);
    if (r === groundRoot) { nodeVar[i] = -1; continue; }
    if (classVar[r] === -2) classVar[r] = varCount++;
    nodeVar[i] = classVar[r];
  }
  // Merge forest in BFS order from each class's first node (node 0 for the reference class).
  const mergeOrder = new Int32Array(nodeCount);
  const mergeParent = new Int32Array(nodeCount).fill(-1);
  const mergeElement = new Int32Array(nodeCount).fill(-1);
  const seen = new Uint8Array(nodeCount);
  let head = 0;
  let tail = 0;
  const visit = (start: number) => {
    seen[start] = 1;
    mergeOrder[tail++] = start;
    while (head < tail) {
      const v = mergeOrder[head++];
      const list = mergeAdj[v];
      if (!list) continue;
      for (const e of list) {
        const u = na[e] === v ? nb[e] : na[e];
        if (seen[u]) continue;
        seen[u] = 1;
        mergeParent[u] = v;
        mergeElement[u] = e;
        mergeOrder[tail++] = u;
      }
    }
  };
  visit(0);
  for (let i = 1; i < nodeCount; i++) if (!seen[i]) visit(i);

  // Connectivity: every unknown needs a conductive path to the reference.
  const cuf = new Int32Array(varCount + 1);
  for (let i = 0; i <= varCount; i++) cuf[i] = i;
  const cfind = (x: number): number => { while (cuf[x] !== x) { cuf[x] = cuf[cuf[x]]; x = cuf[x]; } return x; };
  const G = varCount; // reference
  for (let e = 0; e < m; e++) {
    const k = kinds[e];
    if (k !== K_RES && k !== K_VS) continue;
    const va = nodeVar[na[e]]; const vb = nodeVar[nb[e]];
    const x = cfind(va < 0 ? G : va); const y = cfind(vb < 0 ? G : vb);
    if (x !== y) cuf[x] = y;
  }
  const floatingNodes: number[] = [];
  for (let i = 0; i < nodeCount; i++) {
    const v = nodeVar[i];
    if (v >= 0 && cfind(v) !== cfind(G)) floatingNodes.push(i);
  }
  if (floatingNodes.length > 0) {
    const set = new Set(floatingNodes);
    const ids = elements.filter((_, e) => set.has(na[e]) || set.has(nb[e])).map((el) => el.id);
    return fail("FLOATING_NODE", `Nodes ${floatingNodes.slice(0, 10).join(", ")}${floatingNodes.length > 10 ? " …" : ""} have no resistive path to the reference.`, [...new Set(ids)], floatingNodes);
  }

  // Pattern and symbolic analysis.
  const pb = new PatternBuilder(varCount);
  const slots = new Int32Array(3 * m).fill(-1);
  const pairOf = new Int32Array(m).fill(-1);
  for (let e = 0; e < m; e++) {
    const k = kinds[e];
    if (k !== K_RES && k !== K_VS && k !== K_CP) continue;
    const va = nodeVar[na[e]]; const vb = nodeVar[nb[e]];
    if (va >= 0 && vb >= 0 && va !== vb) pairOf[e] = pb.pair(va, vb);
  }
  const extra = options.extraPairs ?? [];
  const extraPair = new Int32Array(extra.length).fill(-1);
  extra.forEach(([a, b], i) => {
    const va = nodeVar[a]; const vb = nodeVar[b];
    if (va >= 0 && vb >= 0 && va !== vb) extraPair[i] = pb.pair(va, vb);
  });
  let varGroups: Int32Array | undefined;
  if (options.nodeGroups) {
    varGroups = new Int32Array(varCount).fill(-1);
    for (let i = 0; i < nodeCount; i++) {
      const v = nodeVar[i];
      if (v >= 0 && varGroups[v] < 0) varGroups[v] = options.nodeGroups[i];
    }
    // Renumber the groups that hold unknowns 0 … G − 1.
    const renum = new Map<number, number>();
    for (let v = 0; v < varCount; v++) {
      let id = renum.get(varGroups[v]);
      if (id === undefined) { id = renum.size; renum.set(varGroups[v], id); }
      varGroups[v] = id;
    }
  }
  const analysed = analyze(pb, varGroups, options.orderingWorkLimit ?? Infinity);
  if (!analysed) {
    return fail("WORK_LIMIT", `The network is too densely meshed to solve: ordering its ${varCount} unknowns for elimination would take more than ${options.orderingWorkLimit} steps.`, [], [], { budget: "ordering" });
  }
  const { sym, pairSlot } = analysed;
  const workLimit = options.workLimit ?? Infinity;
  // The linear terms (triangular solves, stamping, per-element loops) cost about six times a
  // multiply-add of the factorization per unit, measured on chains and grids (see SYSTEM_LIMITS).
  const factorWork = sym.flops + 6 * (2 * sym.nnzL + sym.nnzA + 2 * sym.n + m + nodeCount);
  if (factorWork > workLimit) {
    return fail("WORK_LIMIT", `The network is too large or too densely meshed to solve: one factorization of its ${varCount} unknowns takes ${factorWork} work units, over the budget of ${workLimit}.`, [], [], { budget: "factorization" });
  }
  for (let e = 0; e < m; e++) {
    const k = kinds[e];
    if (k !== K_RES && k !== K_VS && k !== K_CP) continue;
    const va = nodeVar[na[e]]; const vb = nodeVar[nb[e]];
    if (va === vb) continue;
    slots[3 * e] = va >= 0 ? sym.diagSlot[va] : -1;
    slots[3 * e + 1] = vb >= 0 ? sym.diagSlot[vb] : -1;
    slots[3 * e + 2] = pairOf[e] >= 0 ? pairSlot[pairOf[e]] : -1;
  }
  const extraPairSlots = new Int32Array(extra.length).map((_, i) => (extraPair[i] >= 0 ? pairSlot[extraPair[i]] : -1));
  return {
    netlist, kinds, na, nb, nodeVar, varCount,
    mergeOrder, mergeParent, mergeElement, slots,
    num: allocateNumeric(sym), extraPairSlots,
    factorWork, defaultWorkLimit: workLimit, workLimit, workUsed: 0,
  };
}

/** Starts a new work budget on a prepared circuit (each solve of a system has its own). */
export function resetWork(pc: PreparedCircuit, limit = pc.defaultWorkLimit): void {
  pc.workUsed = 0;
  pc.workLimit = limit;
}

/** Charges `units` of work; false (and nothing charged) when that would pass the budget. */
export function chargeWork(pc: PreparedCircuit, units: number): boolean {
  if (pc.workUsed + units > pc.workLimit) return false;
  pc.workUsed += units;
  return true;
}

/** The error of a solve stopped by its budget. */
function workLimitError(pc: PreparedCircuit): { ok: false; errors: CircuitError[] } {
  return fail("WORK_LIMIT", `Solving this circuit needs more than its budget of ${pc.workLimit} work units (${pc.workUsed} used, ${pc.factorWork} per factorization).`, [], [], { budget: "solves" });
}
const isWorkLimit = (r: CircuitResult) => !r.ok && r.errors[0].code === "WORK_LIMIT";

/** Does the merge path between p and q (a loop being closed) pass through an ideal source? */
function hasSourceLoop(elements: CircuitElement[], kinds: Uint8Array, mergeAdj: number[][], p: number, q: number): boolean {
  const path = mergePath(mergeAdj, p, q, elements);
  return path.some((e) => kinds[e] === K_IDEAL);
}

function mergePath(mergeAdj: number[][], p: number, q: number, elements: CircuitElement[]): number[] {
  // BFS over merge edges from p to q; returns the element indices on the path.
  const prev = new Map<number, [number, number]>();
  const queue = [p];
  prev.set(p, [-1, -1]);
  while (queue.length) {
    const v = queue.shift()!;
    if (v === q) break;
    for (const e of mergeAdj[v] ?? []) {
      const el = elements[e] as { a?: number; b?: number; plus?: number; minus?: number };
      const ends = el.a !== undefined ? [el.a, el.b!] : [el.plus!, el.minus!];
      const u = ends[0] === v ? ends[1] : ends[0];
      if (prev.has(u)) continue;
      prev.set(u, [v, e]);
      queue.push(u);
    }
  }
  const out: number[] = [];
  let cur = q;
  while (prev.has(cur) && prev.get(cur)![0] !== -1) {
    const [v, e] = prev.get(cur)!;
    out.push(e);
    cur = v;
  }
  return out;
}

function mergeLoop(mergeAdj: number[][], p: number, q: number, elements: CircuitElement[]): string[] {
  return mergePath(mergeAdj, p, q, elements).map((e) => elements[e].id);
}

function elementValues(el: CircuitElement): number {
  switch (el.kind) {
    case "resistor": return el.ohms;
    case "voltageSource": return el.volts;
    case "currentSource": return el.amps;
    case "constantCurrent": return el.amps;
    case "constantPower": return el.watts;
  }
}

export interface SolveOptions {
  maxNewtonIterations?: number;
  /** Starting voltages across constant-power loads, by element index (else the open-circuit voltages). */
  initialVoltages?: Float64Array;
  /** Scale applied to every constant-power demand (used by the collapse search). */
  powerScale?: number;
  /** Skip the search for the deliverable fraction after a failed Newton solve. */
  skipCollapseSearch?: boolean;
  /** Elements to leave out of this solve (1 = removed, as if open), e.g. every load for the
   *  open-circuit voltages behind the fault-current calculation. Their current is reported as 0. */
  disabled?: Uint8Array;
}

/** Solves the prepared circuit with its current element values. */
export function solvePrepared(pc: PreparedCircuit, options: SolveOptions = {}): CircuitResult {
  const r = solveOnce(pc, options.powerScale ?? 1, options);
  if (r.ok || r.errors[0].code !== "NO_CONVERGENCE" || options.skipCollapseSearch) return r;
  // Each step of the search below is a whole Newton solve (up to 60 factorizations): on a large
  // network this is where the time goes, so every step is charged to the budget and the search
  // stops when the budget is spent.
  // Newton failed: find the largest fraction of the constant-power demand that still solves. If
  // the full demand is beyond it, the supply cannot deliver it: voltage collapse.
  let lo = 0;
  let hi = options.powerScale ?? 1;
  let best: CircuitSolution | null = null;
  for (let it = 0; it < 30 && hi - lo > 1e-4 * hi; it++) {
    const mid = (lo + hi) / 2;
    const t = solveOnce(pc, mid, { ...options, initialVoltages: undefined });
    if (isWorkLimit(t)) return t;
    if (t.ok) { lo = mid; best = t; } else hi = mid;
  }
  const cpIdx: number[] = [];
  for (let e = 0; e < pc.kinds.length; e++) if (pc.kinds[e] === K_CP && elementValues(pc.netlist.elements[e]) > 0) cpIdx.push(e);
  let worst = cpIdx[0];
  if (best) {
    let worstRatio = Infinity;
    const open = openCircuitLoadVoltages(pc);
    if (!open && pc.workUsed + pc.factorWork > pc.workLimit) return workLimitError(pc);
    for (const e of cpIdx) {
      const v = best.voltages[pc.na[e]] - best.voltages[pc.nb[e]];
      const ratio = open ? v / open[e] : v;
      if (ratio < worstRatio) { worstRatio = ratio; worst = e; }
    }
  }
  const el = pc.netlist.elements[worst];
  return {
    ok: false,
    errors: [{
      code: "VOLTAGE_COLLAPSE",
      message: `The supply cannot deliver the constant-power load ${el.id}: only about ${Math.floor(lo * 1000) / 10} % of the constant-power demand can be met before the voltage collapses.`,
      elementIds: [el.id],
      nodes: [pc.na[worst], pc.nb[worst]],
      deliverableFraction: lo,
    }],
  };
}

function openCircuitLoadVoltages(pc: PreparedCircuit): Float64Array | null {
  const r = solveOnce(pc, 0, { skipCollapseSearch: true });
  if (!r.ok) return null;
  const out = new Float64Array(pc.kinds.length);
  for (let e = 0; e < pc.kinds.length; e++) out[e] = r.voltages[pc.na[e]] - r.voltages[pc.nb[e]];
  return out;
}

let bufAx = new Float64Array(0);
let bufBase = new Float64Array(0);
let bufB = new Float64Array(0);
let bufOff = new Float64Array(0);

function solveOnce(pc: PreparedCircuit, powerScale: number, options: SolveOptions): CircuitResult {
  const { netlist, kinds, na, nb, nodeVar, varCount, slots, num, mergeOrder, mergeParent, mergeElement } = pc;
  const { elements, nodeCount } = netlist;
  const m = elements.length;
  const nnz = num.sym.nnzA;
  if (bufAx.length < nnz) { bufAx = new Float64Array(nnz); bufBase = new Float64Array(nnz); }
  if (bufB.length < varCount) bufB = new Float64Array(varCount);
  if (bufOff.length < nodeCount) bufOff = new Float64Array(nodeCount);
  const base = bufBase.subarray(0, nnz);
  const Ax = bufAx.subarray(0, nnz);
  const rhs = new Float64Array(varCount);
  const b = bufB.subarray(0, varCount);

  // Offsets from the merges (V_node = V_class + off[node]); class roots and node 0 have 0.
  const off = bufOff;
  for (let t = 0; t < nodeCount; t++) {
    const v = mergeOrder[t];
    const p = mergeParent[v];
    if (p < 0) { off[v] = 0; continue; }
    const e = mergeElement[v];
    const emf = kinds[e] === K_IDEAL ? (elements[e] as { volts: number }).volts : 0;
    // element e: V(na) − V(nb) = emf
    off[v] = na[e] === v ? off[p] + emf : off[p] - emf;
  }

  // Linear part.
  base.fill(0);
  rhs.fill(0);
  const cp: number[] = [];
  const disabled = options.disabled;
  for (let e = 0; e < m; e++) {
    const k = kinds[e];
    if (disabled && disabled[e]) continue;
    const el = elements[e];
    const va = nodeVar[na[e]];
    const vb = nodeVar[nb[e]];
    if (k === K_RES || k === K_VS) {
      const ohms = k === K_RES ? (el as { ohms: number }).ohms : (el as { seriesOhms: number }).seriesOhms;
      const g = 1 / ohms;
      // A resistance below about 5.6e-309 Ω (a subnormal double) has an infinite conductance: the
      // solve would return NaN and ±Infinity as if they were results.
      if (!Number.isFinite(g)) {
        return fail("ILL_CONDITIONED", `The network cannot be solved accurately: the resistance of ${el.id} (${ohms} Ω) is too small to compute with; enter its real value, or 0 for an ideal source.`, [el.id], [na[e], nb[e]]);
      }
      if (va === vb) continue;
      const sa = slots[3 * e]; const sb = slots[3 * e + 1]; const sab = slots[3 * e + 2];
      if (sa >= 0) base[sa] += g;
      if (sb >= 0) base[sb] += g;
      if (sab >= 0) base[sab] -= g;
      // offsets: current a→b = g(Va − Vb) + g(off_a − off_b); Norton adds E·g into plus.
      let inj = -g * (off[na[e]] - off[nb[e]]);
      if (k === K_VS) inj += g * (el as { volts: number }).volts;
      if (va >= 0) rhs[va] += inj;
      if (vb >= 0) rhs[vb] -= inj;
    } else if (k === K_IS) {
      const amps = (el as { amps: number }).amps;
      if (va >= 0) rhs[va] -= amps;
      if (vb >= 0) rhs[vb] += amps;
    } else if (k === K_CC) {
      const amps = (el as { amps: number }).amps;
      if (va >= 0) rhs[va] -= amps;
      if (vb >= 0) rhs[vb] += amps;
    } else if (k === K_CP) {
      if ((el as { watts: number }).watts * powerScale > 0) cp.push(e);
    }
  }

  const maxIter = options.maxNewtonIterations ?? 60;
  let iterations = 0;
  const V = new Float64Array(varCount);

  // First solve: the linear network with constant-power loads open (their open-circuit voltage).
  if (!chargeWork(pc, pc.factorWork)) return workLimitError(pc);
  Ax.set(base);
  let bad = factorize(num, Ax);
  if (bad >= 0) return illConditioned(pc, bad);
  solveInto(num, rhs, V);

  // Per constant-power load: its matrix slots, unknowns, offset difference and power.
  const nc = cp.length;
    const cSa = new Int32Array(nc); const cSb = new Int32Array(nc); const cSab = new Int32Array(nc);
    const cVa = new Int32Array(nc); const cVb = new Int32Array(nc);
    const cOff = new Float64Array(nc); const cP = new Float64Array(nc);
    for (let i = 0; i < nc; i++) {
      const e = cp[i];
      cSa[i] = slots[3 * e]; cSb[i] = slots[3 * e + 1]; cSab[i] = slots[3 * e + 2];
      cVa[i] = nodeVar[na[e]]; cVb[i] = nodeVar[nb[e]];
      cOff[i] = off[na[e]] - off[nb[e]];
      cP[i] = (elements[e] as { watts: number }).watts * powerScale;
    }
  const loadVoltage = (vars: Float64Array, i: number) =>
    (cVa[i] >= 0 ? vars[cVa[i]] : 0) - (cVb[i] >= 0 ? vars[cVb[i]] : 0) + cOff[i];
  if (nc > 0) {
    const vLoad = new Float64Array(nc);
    for (let i = 0; i < nc; i++) {
      const e = cp[i];
      vLoad[i] = options.initialVoltages ? options.initialVoltages[e] : loadVoltage(V, i);
      if (!(vLoad[i] > 0)) {
        const el = elements[e];
        return { ok: false, errors: [{ code: "NO_CONVERGENCE", message: `Constant-power load ${el.id} has no positive voltage to start from.`, elementIds: [el.id], nodes: [na[e], nb[e]] }] };
      }
    }
    let converged = false;
    let lastLoadStep = Infinity;
    const Vnew = new Float64Array(varCount);
    for (iterations = 1; iterations <= maxIter; iterations++) {
      Ax.set(base);
      b.set(rhs);
      for (let i = 0; i < nc; i++) {
        const P = cP[i];
        const v0 = vLoad[i];
        const g = -P / (v0 * v0);
        const ieq = (2 * P) / v0; // I ≈ ieq + g·V
        if (cSa[i] >= 0) Ax[cSa[i]] += g;
        if (cSb[i] >= 0) Ax[cSb[i]] += g;
        if (cSab[i] >= 0) Ax[cSab[i]] -= g;
        // current plus→minus = ieq + g(Va − Vb) + g(off_a − off_b)
        const inj = ieq + g * cOff[i];
        if (cVa[i] >= 0) b[cVa[i]] -= inj;
        if (cVb[i] >= 0) b[cVb[i]] += inj;
      }
      if (!chargeWork(pc, pc.factorWork)) return workLimitError(pc);
      bad = factorize(num, Ax);
      // Not positive definite: the linearisation point is past the nose of the P–V curve.
      if (bad >= 0) break;
      solveInto(num, b, Vnew);
      // Damping: no load voltage may fall to less than half of its present value in one step.
      let alpha = 1;
      for (let i = 0; i < nc; i++) {
        const vn = loadVoltage(Vnew, i);
        const v0 = vLoad[i];
        if (vn < 0.5 * v0) alpha = Math.min(alpha, (0.5 * v0) / (v0 - vn));
      }
      let maxStep = 0;
      let maxV = 1;
      for (let j = 0; j < varCount; j++) {
        const d = alpha * (Vnew[j] - V[j]);
        V[j] += d;
        if (Math.abs(d) > maxStep) maxStep = Math.abs(d);
        if (Math.abs(V[j]) > maxV) maxV = Math.abs(V[j]);
      }
      let maxLoadStep = 0;
      for (let i = 0; i < nc; i++) {
        const vn = loadVoltage(V, i);
        const rel = Math.abs(vn - vLoad[i]) / Math.abs(vLoad[i]);
        if (rel > maxLoadStep) maxLoadStep = rel;
        vLoad[i] = vn;
      }
      // Converged when a full step moves nothing by more than 1e-11 (relative). Newton converges
      // quadratically, so the error left is far smaller; a long chain's rounding noise (about
      // condition number × 1e-16) can stop the step shrinking below ~1e-12, which is accepted
      // as the noise floor once it stops improving.
      if (alpha === 1 && maxStep <= 1e-11 * maxV && maxLoadStep <= 1e-11) { converged = true; break; }
      if (alpha === 1 && maxLoadStep <= 1e-9 && maxLoadStep >= 0.1 * lastLoadStep) { converged = true; break; }
      lastLoadStep = alpha === 1 ? maxLoadStep : Infinity;
    }
    if (!converged) {
      const ids = cp.map((e) => elements[e].id);
      return { ok: false, errors: [{ code: "NO_CONVERGENCE", message: `The constant-power loads did not converge within ${maxIter} Newton steps.`, elementIds: ids.slice(0, 20), nodes: [] }] };
    }
  }

  // Node voltages and element currents.
  const voltages = new Float64Array(nodeCount);
  for (let i = 0; i < nodeCount; i++) voltages[i] = (nodeVar[i] >= 0 ? V[nodeVar[i]] : 0) + off[i];
  const currents = new Float64Array(m);
  const leaving = new Float64Array(nodeCount); // net current leaving each node through non-merge elements
  for (let e = 0; e < m; e++) {
    const k = kinds[e];
    if (disabled && disabled[e]) continue;
    const el = elements[e];
    const a = na[e];
    const c = nb[e];
    let i = 0;
    switch (k) {
      case K_RES: i = (voltages[a] - voltages[c]) / (el as { ohms: number }).ohms; leaving[a] += i; leaving[c] -= i; break;
      case K_VS: {
        const s = el as { volts: number; seriesOhms: number };
        i = (s.volts - (voltages[a] - voltages[c])) / s.seriesOhms; // out of plus into circuit
        leaving[a] -= i; leaving[c] += i; break;
      }
      case K_IS: i = (el as { amps: number }).amps; leaving[a] += i; leaving[c] -= i; break;
      case K_CC: i = (el as { amps: number }).amps; leaving[a] += i; leaving[c] -= i; break;
      case K_CP: {
        const P = (el as { watts: number }).watts * powerScale;
        i = P === 0 ? 0 : P / (voltages[a] - voltages[c]);
        leaving[a] += i; leaving[c] -= i; break;
      }
      default: break;
    }
    currents[e] = i;
  }
  // Merge elements: walk the merge forest from the leaves. KCL at v gives the current from v to
  // its parent through the merge element, i_vp = −leaving[v]; that current leaves p toward v
  // with the opposite sign, so it is added to what leaves p.
  for (let t = nodeCount - 1; t >= 0; t--) {
    const v = mergeOrder[t];
    const p = mergeParent[v];
    if (p < 0) continue;
    const ivp = -leaving[v];
    leaving[p] -= ivp;
    const e = mergeElement[v];
    if (kinds[e] === K_IDEAL) currents[e] = na[e] === v ? -ivp : ivp; // out of + into the circuit
    else currents[e] = na[e] === v ? ivp : -ivp; // zero-ohm resistor: a → b
  }
  return { ok: true, voltages, currents, newtonIterations: iterations };
}

function illConditioned(pc: PreparedCircuit, permutedIndex: number): CircuitResult {
  const variable = pc.num.sym.perm[permutedIndex];
  const nodes: number[] = [];
  for (let i = 0; i < pc.nodeVar.length; i++) if (pc.nodeVar[i] === variable) nodes.push(i);
  const set = new Set(nodes);
  const ids = pc.netlist.elements.filter((_, e) => set.has(pc.na[e]) || set.has(pc.nb[e])).map((el) => el.id);
  return {
    ok: false,
    errors: [{
      code: "ILL_CONDITIONED",
      message: `The network cannot be solved accurately at node ${nodes.join(", ")}: resistances around it differ by too many orders of magnitude (elements ${ids.slice(0, 8).join(", ")}).`,
      elementIds: ids,
      nodes,
    }],
  };
}

/** Convenience: prepare and solve in one call. */
export function solveCircuit(netlist: Netlist, options: SolveOptions & PrepareOptions = {}): CircuitResult {
  const pc = prepareCircuit(netlist, options);
  if ("ok" in pc) return pc;
  return solvePrepared(pc, options);
}

/** Thevenin resistance between node pairs with every source zeroed (ideal sources shorted,
 *  current sources and sinks open) and the given loads removed, from the selected inverse of the
 *  conductance matrix. The pairs must have been passed as `extraPairs` to prepareCircuit.
 *  Returns Infinity where there is no conductive path and 0 across a merged (ideal-source) pair. */
export function theveninResistances(pc: PreparedCircuit, pairs: ReadonlyArray<readonly [number, number]>, disabled?: Uint8Array): Float64Array | null {
  const { kinds, na, nb, nodeVar, slots, num, netlist } = pc;
  const nnz = num.sym.nnzA;
  const Ax = new Float64Array(nnz);
  const n = pc.varCount;
  for (let e = 0; e < kinds.length; e++) {
    const k = kinds[e];
    if (k !== K_RES && k !== K_VS) continue;
    if (disabled && disabled[e]) continue;
    const el = netlist.elements[e];
    const g = 1 / (k === K_RES ? (el as { ohms: number }).ohms : (el as { seriesOhms: number }).seriesOhms);
    if (nodeVar[na[e]] === nodeVar[nb[e]]) continue;
    const sa = slots[3 * e]; const sb = slots[3 * e + 1]; const sab = slots[3 * e + 2];
    if (sa >= 0) Ax[sa] += g;
    if (sb >= 0) Ax[sb] += g;
    if (sab >= 0) Ax[sab] -= g;
  }
  // The fault network has no loads, so a part fed only by a current source has no path; keep
  // the matrix definite with a vanishing conductance to the reference and report Infinity there.
  const tiny = 1e-12;
  for (let v = 0; v < n; v++) Ax[num.sym.diagSlot[v]] += tiny;
  const fnum = allocateNumeric(num.sym);
  if (factorize(fnum, Ax) >= 0) return null;
  const Z = selectedInverse(fnum);
  const out = new Float64Array(pairs.length);
  for (let i = 0; i < pairs.length; i++) {
    const va = nodeVar[pairs[i][0]];
    const vb = nodeVar[pairs[i][1]];
    if (va === vb) { out[i] = 0; continue; }
    let r = 0;
    if (va >= 0) r += selectedEntry(fnum, Z, va, va);
    if (vb >= 0) r += selectedEntry(fnum, Z, vb, vb);
    if (va >= 0 && vb >= 0) r -= 2 * selectedEntry(fnum, Z, va, vb);
    out[i] = r > 1e9 ? Infinity : r;
  }
  return out;
}
