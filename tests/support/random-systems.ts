// Seeded random network documents ("runwright-system/1") for the tests that check the engine
// against independent solvers. Same seed, same document: the generator uses its own small PRNG
// (mulberry32), never Math.random.
//
// Across seeds it covers radial trees, meshes (extra runs that close loops, including runs in
// parallel between the same two points), shared returns (returnSize ≠ size), 1–3 sources on
// distinct points (batteries and supplies with 0.002–0.05 Ω, at most one ideal source, sometimes
// a PV array), constant-resistance loads (ohms or watts), constant-current loads and, when asked,
// constant-power loads; imperial and metric systems, copper and aluminium, 1 or 2 conductors in
// parallel, and sometimes a second case with other source voltages, conductor temperature and
// load factor.
//
// Load sizes are chosen so that every point stays well above half the nominal voltage, from an
// estimate that needs no solve: with source EMFs of at least 0.97·Vnom, a point's voltage is about
// 0.97·Vnom − Σⱼ |Zᵢⱼ|·Iⱼ, where Iⱼ bounds load j's current (constant resistance at up to
// 1.15·Vnom, constant power at 0.7·Vnom or more) and |Zᵢⱼ| ≤ Zⱼⱼ ≤ R_path(j), the loop resistance
// (+ and − conductors and the reference source's internal resistance) of the radial tree path from
// load j to the first battery/supply, at the hottest case temperature. Extra runs and other
// sources only lower the driving-point resistances (Rayleigh). The loads are sized so that
// Σⱼ R_path(j)·Iⱼ ≤ 0.25·Vnom (so ≥ 0.72·Vnom at every point), the PV arrays' current adds at most 0.05·Vnom, and the tests check
// the outcome (every point above 0.6·Vnom in every case).
import { conductorResistance, METRES_PER_FOOT, type Material } from "../../shared/engine/conductors.js";
import type { Netlist } from "../../shared/engine/circuit.js";
import type { SystemInput } from "../../shared/engine/schema.js";
import { applyCase, compileSystem, parseSystem, solveSystem, type CaseResult } from "../../shared/engine/system.js";

/** mulberry32: a 32-bit seeded PRNG returning floats in [0, 1). */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export class Rng {
  private readonly next: () => number;
  constructor(seed: number) {
    // Scramble small consecutive seeds a little so neighbouring seeds do not start alike.
    this.next = mulberry32(Math.imul(seed ^ 0x9e3779b9, 0x85ebca6b) ^ (seed >>> 3));
  }
  /** Float in [0, 1). */
  float(): number;
  /** Float in [lo, hi). */
  float(lo: number, hi: number): number;
  float(lo = 0, hi = 1): number {
    return lo + (hi - lo) * this.next();
  }
  /** Integer in [lo, hi], both included. */
  int(lo: number, hi: number): number {
    return lo + Math.floor(this.next() * (hi - lo + 1));
  }
  chance(p: number): boolean {
    return this.next() < p;
  }
  pick<T>(list: readonly T[]): T {
    return list[Math.floor(this.next() * list.length)];
  }
  shuffle<T>(list: T[]): T[] {
    for (let i = list.length - 1; i > 0; i--) {
      const j = Math.floor(this.next() * (i + 1));
      [list[i], list[j]] = [list[j], list[i]];
    }
    return list;
  }
}

export const AWG_SIZES = [
  "18 AWG", "16 AWG", "14 AWG", "12 AWG", "10 AWG", "8 AWG", "6 AWG", "4 AWG", "3 AWG", "2 AWG", "1 AWG",
  "1/0 AWG", "2/0 AWG", "3/0 AWG", "4/0 AWG", "250 kcmil", "300 kcmil", "350 kcmil", "400 kcmil", "500 kcmil",
] as const;
/** Aluminium is not used below 12 AWG. */
export const ALUMINUM_AWG_SIZES = AWG_SIZES.slice(AWG_SIZES.indexOf("12 AWG"));
export const METRIC_SIZES = [
  "0.5 mm2", "0.75 mm2", "1 mm2", "1.5 mm2", "2.5 mm2", "4 mm2", "6 mm2", "10 mm2", "16 mm2", "25 mm2",
  "35 mm2", "50 mm2", "70 mm2", "95 mm2", "120 mm2", "150 mm2", "185 mm2", "240 mm2",
] as const;

export interface RandomSystemOptions {
  /** Include constant-power loads (at least one). Default false: a linear network. */
  constantPower?: boolean;
  /** Number of points, default 2 … 40. */
  minPoints?: number;
  maxPoints?: number;
}

/** Rounds to `digits` significant digits (keeps documents readable; the bound has margin). */
function sig(v: number, digits = 5): number {
  return v === 0 ? 0 : Number(v.toPrecision(digits));
}
const round = (v: number, decimals: number) => Number(v.toFixed(decimals));

type RunInput = SystemInput["runs"][number];
type SourceInput = SystemInput["sources"][number];
type LoadInput = SystemInput["loads"][number];
type CaseInput = NonNullable<SystemInput["cases"]>[number];

/** A random network document for this seed (see the header for what it covers). */
export function randomSystem(seed: number, options: RandomSystemOptions = {}): SystemInput {
  const rng = new Rng(seed);
  const minPoints = Math.max(2, options.minPoints ?? 2);
  const maxPoints = Math.max(minPoints, options.maxPoints ?? 40);
  const units: "metric" | "imperial" = rng.chance(0.5) ? "imperial" : "metric";
  const nominal = rng.pick([12, 24, 48] as const);
  // Half small networks, half spread over the whole range.
  const n = rng.chance(0.5) ? rng.int(minPoints, Math.min(maxPoints, 8)) : rng.int(minPoints, maxPoints);
  const points = Array.from({ length: n }, (_, i) => ({ id: `p${i}` }));

  // Runs: a random tree, then (sometimes) extra runs closing loops.
  const runs: RunInput[] = [];
  const treeAdj: { to: number; run: number }[][] = Array.from({ length: n }, () => []);
  const newRun = (a: number, b: number): RunInput => {
    const material: Material = rng.chance(0.2) ? "aluminum" : "copper";
    const list: readonly string[] = units === "metric" ? METRIC_SIZES : material === "aluminum" ? ALUMINUM_AWG_SIZES : AWG_SIZES;
    const size = rng.pick(list);
    const run: RunInput = {
      id: `r${runs.length}`,
      from: `p${a}`,
      to: `p${b}`,
      length: round(rng.float(1, 60), 1),
      size,
    };
    const parallel = rng.chance(0.25) ? 2 : 1;
    if (parallel > 1 || rng.chance(0.7)) run.parallel = parallel; // else the default, 1
    if (material === "aluminum" || rng.chance(0.5)) run.material = material;
    if (rng.chance(0.3)) {
      let other = rng.pick(list);
      while (other === size) other = rng.pick(list);
      run.returnSize = other;
    }
    if (units === "metric" && material === "copper" && rng.chance(0.15)) run.stranding = "class2";
    if (rng.chance(0.1)) run.kind = "feeder";
    return run;
  };
  for (let i = 1; i < n; i++) {
    const parent = rng.chance(0.3) ? i - 1 : rng.int(0, i - 1);
    const run = rng.chance(0.8) ? newRun(parent, i) : newRun(i, parent);
    treeAdj[parent].push({ to: i, run: runs.length });
    treeAdj[i].push({ to: parent, run: runs.length });
    runs.push(run);
  }
  if (rng.chance(0.45)) {
    const extra = rng.int(1, Math.max(1, Math.floor(n / 3)));
    for (let k = 0; k < extra; k++) {
      const a = rng.int(0, n - 1);
      let b = rng.int(0, n - 2);
      if (b >= a) b++;
      runs.push(newRun(a, b));
    }
  }

  // Cases (decided before the loads: the hottest temperature sets the budget).
  const systemTemp = rng.chance(0.7) ? round(rng.float(-10, 100), 1) : undefined;
  const caseMode = rng.float();
  const twoCases = caseMode < 0.35;
  const oneExplicitCase = !twoCases && caseMode < 0.6;
  const case2Temp = round(rng.float(-10, 105), 1);
  const temps = [systemTemp ?? 75, ...(twoCases ? [case2Temp] : [])];
  const hottest = Math.max(...temps);

  // Sources on distinct points; at least one battery/supply, at most one ideal.
  const nSources = Math.min(n, rng.pick([1, 1, 1, 2, 2, 3]));
  const sourcePoints = rng.shuffle(Array.from({ length: n }, (_, i) => i)).slice(0, nSources);
  const isPv = sourcePoints.map(() => nSources > 1 && rng.chance(0.3));
  if (isPv.every(Boolean)) isPv[rng.int(0, nSources - 1)] = false;
  const voltageIdx = isPv.map((pv, i) => (pv ? -1 : i)).filter((i) => i >= 0);
  const idealIdx = rng.chance(0.35) ? rng.pick(voltageIdx) : -1;
  const sourceR = sourcePoints.map((_, i) => (i === idealIdx ? 0 : round(rng.float(0.002, 0.05), 4)));

  // Loop resistance of every point's tree path to the first battery/supply.
  const refIdx = voltageIdx[0];
  const lengthFactor = units === "imperial" ? METRES_PER_FOOT : 1;
  const ohms = (size: string, run: RunInput) =>
    (conductorResistance(size, run.material ?? "copper", hottest, run.stranding)!.ohmPerMetre * (run.length as number) * lengthFactor) / (run.parallel ?? 1);
  const rPath = new Float64Array(n).fill(NaN);
  const start = sourcePoints[refIdx];
  rPath[start] = sourceR[refIdx];
  const queue = [start];
  while (queue.length > 0) {
    const v = queue.shift()!;
    for (const { to, run } of treeAdj[v]) {
      if (!Number.isNaN(rPath[to])) continue;
      const r = runs[run];
      rPath[to] = rPath[v] + ohms(r.size, r) + ohms(r.returnSize ?? r.size, r);
      queue.push(to);
    }
  }

  // Sources.
  const sources: SourceInput[] = sourcePoints.map((p, i) => {
    const id = `s${i}`;
    if (isPv[i]) return { id, type: "pvArray", point: `p${p}`, currentA: 0 }; // current set below
    const s: SourceInput = {
      id,
      type: rng.chance(0.6) ? "battery" : "supply",
      point: `p${p}`,
      voltage: round(nominal * rng.float(1.0, 1.08), 3),
    };
    if (i !== idealIdx || rng.chance(0.5)) s.internalResistanceOhm = sourceR[i];
    return s;
  });

  // Loads: current budgets Iⱼ with Σ R_path(j)·Iⱼ ≤ 0.25·Vnom.
  const loadPoints: number[] = [];
  for (let p = 0; p < n; p++) {
    const u = rng.float();
    if (u < 0.55) loadPoints.push(p);
    else if (u < 0.7) loadPoints.push(p, p);
  }
  if (loadPoints.length === 0) loadPoints.push(rng.int(0, n - 1));
  // Iⱼ ∝ wⱼ / R_path(j): loads near a source may draw more. R_path is floored at 5 % of the
  // largest so a load beside an ideal source stays finite; the sum stays within the budget.
  const weights = loadPoints.map(() => rng.float(0.1, 1));
  const wSum = weights.reduce((s, w) => s + w, 0);
  const rMax = Math.max(...loadPoints.map((p) => rPath[p]), 1e-6);
  const share = rng.float(0.3, 1) * 0.25 * nominal;
  const budget = loadPoints.map((p, j) => (share * weights[j]) / wSum / Math.max(rPath[p], 0.05 * rMax));
  const totalA = budget.reduce((s, a) => s + a, 0);
  if (totalA > 600) budget.forEach((a, j) => (budget[j] = (a * 600) / totalA)); // at most 600 A in all
  const cpWanted = options.constantPower === true;
  const models = loadPoints.map(() => {
    const u = rng.float();
    if (cpWanted && u < 0.4) return "cp" as const;
    const v = rng.float();
    return v < 0.35 ? ("ohms" as const) : v < 0.65 ? ("watts" as const) : ("cc" as const);
  });
  if (cpWanted && !models.includes("cp")) models[rng.int(0, models.length - 1)] = "cp";
  const loads: LoadInput[] = loadPoints.map((p, j) => {
    const id = `l${j}`;
    const point = `p${p}`;
    const amps = budget[j] * 0.9999; // room for rounding to 5 significant digits
    switch (models[j]) {
      case "ohms": // draws at most 1.15·Vnom / R
        return { id, point, model: "constantResistance", ohms: sig((1.15 * nominal) / amps) };
      case "watts": // R = Vnom²/W
        return { id, point, model: "constantResistance", watts: sig((nominal * nominal) / ((1.15 * nominal) / amps)) };
      case "cc":
        return { id, point, model: "constantCurrent", amps: rng.chance(0.03) ? 0 : sig(amps) };
      case "cp": // at 0.7·Vnom or more it draws at most `amps`
        return { id, point, model: "constantPower", watts: sig(0.7 * nominal * amps) };
    }
  });
  // PV arrays: currents within 0.05·Vnom / R_path in total (they can only raise voltages).
  const pvBudget = (rng.float(0, 1) * 0.05 * nominal) / Math.max(...rPath, 1e-6);
  const nPv = isPv.filter(Boolean).length;
  sources.forEach((s) => {
    if (s.type === "pvArray") s.currentA = sig(Math.min(pvBudget / nPv, 80));
  });

  const doc: SystemInput = {
    format: "runwright-system/1",
    name: `random system ${seed}`,
    units,
    nominalVoltage: nominal,
    points,
    sources,
    runs,
    loads,
  };
  if (systemTemp !== undefined) doc.conductorTemperatureC = systemTemp;
  if (twoCases) {
    const sourceVoltages: Record<string, number> = {};
    const sourceCurrents: Record<string, number> = {};
    sources.forEach((s) => {
      if (s.type === "pvArray") {
        if (rng.chance(0.5)) sourceCurrents[s.id] = sig(s.currentA * rng.float(0, 1));
      } else sourceVoltages[s.id] = round(nominal * rng.float(0.97, 1.05), 3);
    });
    const second: CaseInput = { name: "Low battery, hot day", sourceVoltages, conductorTemperatureC: case2Temp };
    if (Object.keys(sourceCurrents).length > 0) second.sourceCurrents = sourceCurrents;
    if (rng.chance(0.5)) second.loadFactor = round(rng.float(0.5, 1), 3);
    doc.cases = [{ name: "Nominal", loadFactor: 1 }, second];
  } else if (oneExplicitCase) {
    doc.cases = [{ name: "Design", loadFactor: rng.chance(0.5) ? 1 : round(rng.float(0.5, 1), 3) }];
  }
  return doc;
}

export type LoadKind = "ohms" | "watts" | "constantCurrent" | "constantPower";

/** What a generated document contains, for checking the generator's coverage. */
export interface SystemFeatures {
  points: number;
  units: "metric" | "imperial";
  loops: boolean;
  sharedReturn: boolean;
  sources: number;
  ideal: boolean;
  pvArray: boolean;
  aluminum: boolean;
  parallel: boolean;
  cases: number;
  loadModels: Set<LoadKind>;
}

export function describeSystem(doc: SystemInput): SystemFeatures {
  const loadModels = new Set<LoadKind>();
  for (const l of doc.loads) {
    if (l.model === "constantResistance") loadModels.add(l.ohms !== undefined ? "ohms" : "watts");
    else loadModels.add(l.model);
  }
  return {
    points: doc.points.length,
    units: doc.units,
    // Connected by construction, so any run beyond a spanning tree closes a loop.
    loops: doc.runs.length > doc.points.length - 1,
    sharedReturn: doc.runs.some((r) => r.returnSize !== undefined && r.returnSize !== r.size),
    sources: doc.sources.length,
    ideal: doc.sources.some((s) => s.type !== "pvArray" && (s.internalResistanceOhm ?? 0) === 0),
    pvArray: doc.sources.some((s) => s.type === "pvArray"),
    aluminum: doc.runs.some((r) => r.material === "aluminum"),
    parallel: doc.runs.some((r) => (r.parallel ?? 1) > 1),
    cases: doc.cases?.length ?? 1,
    loadModels,
  };
}

/** One case of a document as the engine compiles it: the netlist with that case's values
 *  (conductor ohms at the case temperature, source volts and amps, load values), the node of
 *  each point's + and − terminal, the element index of each run conductor, load and source, and
 *  the engine's
 *  own result for the case from solveSystem. */
export interface EngineCase {
  name: string;
  netlist: Netlist;
  plusNode: Int32Array;
  minusNode: Int32Array;
  runPlus: Int32Array;
  runMinus: Int32Array;
  loadEl: Int32Array;
  sourceEl: Int32Array;
  result: CaseResult;
}

/** Solves the document with solveSystem and compiles it with the engine's own compiler, one
 *  netlist snapshot per case. Throws (with the engine's errors) when either step fails. */
export function engineCases(doc: SystemInput): EngineCase[] {
  const solved = solveSystem(doc);
  if (!solved.ok) throw new Error(`solveSystem failed for "${doc.name}": ${JSON.stringify(solved.errors)}`);
  const parsed = parseSystem(doc);
  if (!parsed.ok) throw new Error(`parseSystem failed for "${doc.name}": ${JSON.stringify(parsed.errors)}`);
  const compiled = compileSystem(parsed.system);
  if ("ok" in compiled) throw new Error(`compileSystem failed for "${doc.name}": ${JSON.stringify(compiled.errors)}`);
  if (solved.cases.length !== compiled.cases.length) throw new Error(`"${doc.name}": ${solved.cases.length} solved cases, ${compiled.cases.length} compiled`);
  return compiled.cases.map((kase, k) => {
    applyCase(compiled, kase);
    const result = solved.cases[k];
    if (result.name !== kase.name) throw new Error(`"${doc.name}": case ${k} is "${result.name}" in the result, "${kase.name}" compiled`);
    return {
      name: kase.name,
      netlist: { nodeCount: compiled.netlist.nodeCount, elements: compiled.netlist.elements.map((el) => ({ ...el })) },
      plusNode: compiled.plusNode,
      minusNode: compiled.minusNode,
      runPlus: compiled.runPlus,
      runMinus: compiled.runMinus,
      loadEl: compiled.loadEl,
      sourceEl: compiled.sourceEl,
      result,
    };
  });
}
