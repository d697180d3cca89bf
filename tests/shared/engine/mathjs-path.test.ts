// Checks the engine's circuit solver against an independent in-project solve path: the textbook
// modified nodal analysis (one unknown per node voltage plus one branch-current unknown per voltage
// source, with a source's internal resistance in its own branch equation V+ − V− + R·I = E)
// assembled here from the engine's netlist and solved with mathjs's sparse LU (slu with partial
// pivoting, then lusolve). The engine instead merges the nodes of ideal sources into supernodes,
// stamps resistive sources as Norton equivalents and factors a symmetric matrix with its own
// LDLᵀ (shared/engine/sparse.ts), so the two share nothing but the netlist.
//
// Random linear systems from tests/support/random-systems.ts must agree to 1e-9 V at every node
// (solveCircuit) and every point (solveSystem), in every case; a handful of constant-power systems
// must agree with each constant-power load replaced by the resistor V²/P of the engine's solution.
import { lusolve, slu, sparse } from "mathjs";
import { describe, expect, it } from "vitest";
import { solveCircuit, type Netlist } from "../../../shared/engine/circuit.js";
import { engineCases, randomSystem } from "../../support/random-systems.js";

const VOLTAGE_TOLERANCE = 1e-9;
/** Source currents: 1e-9 relative, at least 10 nA (a volt's rounding over milliohms). */
const currentTolerance = (amps: number) => Math.max(1e-8, 1e-9 * Math.abs(amps));

interface MnaSolution {
  /** Per node, node 0 = 0. */
  voltages: Float64Array;
  /** Per element index of a voltage source: current out of its + terminal into the circuit. */
  sourceCurrents: Map<number, number>;
}

/** Textbook MNA: rows 0 … n−2 are KCL at nodes 1 … n−1 (current leaving the node through its
 *  elements = 0), then one row per voltage source (V+ − V− + R·I = E, I leaving + into the
 *  circuit). Solved with mathjs's sparse LU, AMD ordering on A + Aᵀ, partial pivoting. */
function solveMna(netlist: Netlist): MnaSolution {
  const n = netlist.nodeCount - 1;
  const vsources: number[] = [];
  netlist.elements.forEach((el, e) => {
    if (el.kind === "voltageSource" || (el.kind === "resistor" && el.ohms === 0)) vsources.push(e);
  });
  const size = n + vsources.length;
  const A: number[][] = Array.from({ length: size }, () => new Array<number>(size).fill(0));
  const b: number[] = new Array<number>(size).fill(0);
  const row = (node: number) => node - 1; // −1 for the reference
  const add = (i: number, j: number, v: number) => {
    if (i >= 0 && j >= 0) A[i][j] += v;
  };
  const inject = (node: number, amps: number) => {
    if (node > 0) b[row(node)] += amps;
  };
  netlist.elements.forEach((el) => {
    switch (el.kind) {
      case "resistor": {
        if (el.ohms === 0) return; // a branch row below
        const g = 1 / el.ohms;
        const a = row(el.a);
        const c = row(el.b);
        add(a, a, g); add(c, c, g); add(a, c, -g); add(c, a, -g);
        return;
      }
      case "voltageSource":
        return; // a branch row below
      case "currentSource": // amps leave `from` through the source and enter `to`
        inject(el.from, -el.amps);
        inject(el.to, el.amps);
        return;
      case "constantCurrent": // amps enter + and leave −
        inject(el.plus, -el.amps);
        inject(el.minus, el.amps);
        return;
      case "constantPower":
        throw new Error(`solveMna is linear: replace constant-power load ${el.id} first`);
    }
  });
  vsources.forEach((e, k) => {
    const el = netlist.elements[e];
    const r = n + k;
    // A zero-ohm resistor is a 0 V source.
    const [plus, minus, emf, ohms] = el.kind === "voltageSource" ? [el.plus, el.minus, el.volts, el.seriesOhms ?? 0] : el.kind === "resistor" ? [el.a, el.b, 0, 0] : [-1, -1, NaN, NaN];
    // KCL: I leaves the + node's elements sum as −I (it is supplied), the − node's as +I.
    add(row(plus), r, -1);
    add(row(minus), r, 1);
    // Branch: V+ − V− + R·I = E.
    add(r, row(plus), 1);
    add(r, row(minus), -1);
    A[r][r] += ohms;
    b[r] = emf;
  });
  const lu = slu(sparse(A), 1, 1);
  const x = (lusolve(lu, b.map((v) => [v])).toArray() as number[][]).map((r) => r[0]);
  const voltages = new Float64Array(netlist.nodeCount);
  for (let i = 1; i < netlist.nodeCount; i++) voltages[i] = x[i - 1];
  const sourceCurrents = new Map<number, number>();
  vsources.forEach((e, k) => sourceCurrents.set(e, x[n + k]));
  for (const v of x) if (!Number.isFinite(v)) throw new Error("mathjs returned a non-finite solution");
  return { voltages, sourceCurrents };
}

interface Stats {
  cases: number;
  nodes: number;
  points: number;
  sources: number;
  maxNodeDelta: number;
  maxPointDelta: number;
  maxSourceDelta: number;
  failures: string[];
}

/** Compares one random document, every case, with the MNA solve; each constant-power load is
 *  replaced by the resistor V²/P at the engine's load voltage. */
function compareDocument(seed: number, constantPower: boolean, stats: Stats): void {
  const doc = randomSystem(seed, { constantPower });
  for (const kase of engineCases(doc)) {
    const where = `seed ${seed}, case "${kase.name}"`;
    const netlist: Netlist = { nodeCount: kase.netlist.nodeCount, elements: kase.netlist.elements.map((el) => ({ ...el })) };
    let replaced = 0;
    netlist.elements = netlist.elements.map((el, e) => {
      if (el.kind !== "constantPower") return el;
      const load = kase.result.loads[[...kase.loadEl].indexOf(e)];
      replaced++;
      if (el.watts === 0) return { kind: "constantCurrent", id: el.id, plus: el.plus, minus: el.minus, amps: 0 };
      return { kind: "resistor", id: el.id, a: el.plus, b: el.minus, ohms: (load.voltage * load.voltage) / el.watts };
    });
    if (constantPower) expect(replaced, where).toBeGreaterThan(0);
    const mna = solveMna(netlist);

    // Node voltages from the engine's circuit solver (the original netlist, constant power and all).
    const engine = solveCircuit(kase.netlist);
    if (!engine.ok) throw new Error(`solveCircuit failed for ${where}: ${JSON.stringify(engine.errors)}`);
    for (let i = 0; i < netlist.nodeCount; i++) {
      const d = Math.abs(engine.voltages[i] - mna.voltages[i]);
      stats.nodes++;
      stats.maxNodeDelta = Math.max(stats.maxNodeDelta, d);
      if (!(d <= VOLTAGE_TOLERANCE)) stats.failures.push(`${where}, node ${i}: engine ${engine.voltages[i]} V, MNA ${mna.voltages[i]} V`);
    }
    // Point voltages from solveSystem.
    kase.result.points.forEach((p, i) => {
      const v = mna.voltages[kase.plusNode[i]] - mna.voltages[kase.minusNode[i]];
      const d = Math.abs(p.voltage - v);
      stats.points++;
      stats.maxPointDelta = Math.max(stats.maxPointDelta, d);
      if (!(d <= VOLTAGE_TOLERANCE)) stats.failures.push(`${where}, point ${p.id}: engine ${p.voltage} V, MNA ${v} V`);
    });
    // Battery and supply currents: the MNA has them as unknowns; the engine recovers them (by
    // Kirchhoff's current law over merged nodes for an ideal source, (E − V)/R for the others).
    doc.sources.forEach((s, i) => {
      if (s.type === "pvArray") return;
      const mnaI = mna.sourceCurrents.get(kase.sourceEl[i])!;
      const engineI = kase.result.sources[i].current;
      const d = Math.abs(mnaI - engineI);
      stats.sources++;
      stats.maxSourceDelta = Math.max(stats.maxSourceDelta, d);
      if (!(d <= currentTolerance(engineI))) stats.failures.push(`${where}, source ${s.id}: engine ${engineI} A, MNA ${mnaI} A`);
    });
    stats.cases++;
  }
}

const newStats = (): Stats => ({ cases: 0, nodes: 0, points: 0, sources: 0, maxNodeDelta: 0, maxPointDelta: 0, maxSourceDelta: 0, failures: [] });
const report = (label: string, systems: number, s: Stats) =>
  console.log(
    `${label}: ${systems} systems, ${s.cases} cases, ${s.nodes} nodes, ${s.points} points, ${s.sources} source currents; ` +
      `max |ΔV| node ${s.maxNodeDelta.toExponential(3)} V, point ${s.maxPointDelta.toExponential(3)} V, max |ΔI| ${s.maxSourceDelta.toExponential(3)} A`,
  );

describe("engine against textbook MNA with mathjs's sparse LU", () => {
  it("solves a small circuit by hand (the reference path itself)", () => {
    // Node 1: battery + (12 V, 0.05 Ω) ; node 2: ideal 1 V source above node 1 ; node 3: load end.
    // 0.15 Ω from 2 to 3, 1.8 Ω load 3 → 0, a 0.5 A sink 3 → 0 and 1 A injected into 3 from 0.
    const sol = solveMna({
      nodeCount: 4,
      elements: [
        { kind: "voltageSource", id: "bat", plus: 1, minus: 0, volts: 12, seriesOhms: 0.05 },
        { kind: "voltageSource", id: "boost", plus: 2, minus: 1, volts: 1 },
        { kind: "resistor", id: "run", a: 2, b: 3, ohms: 0.15 },
        { kind: "resistor", id: "load", a: 3, b: 0, ohms: 1.8 },
        { kind: "constantCurrent", id: "cc", plus: 3, minus: 0, amps: 0.5 },
        { kind: "currentSource", id: "pv", from: 0, to: 3, amps: 1 },
      ],
    });
    // Loop: 13 V − I·(0.05 + 0.15) = V3; KCL at 3: I + 1 = V3/1.8 + 0.5, so V3 = 1.8·I + 0.9;
    // 13 − 0.2·I = 1.8·I + 0.9 ⇒ I = 6.05 A, V3 = 11.79 V.
    expect(sol.sourceCurrents.get(0)).toBeCloseTo(6.05, 12);
    expect(sol.sourceCurrents.get(1)).toBeCloseTo(6.05, 12);
    expect(sol.voltages[3]).toBeCloseTo(11.79, 12);
    expect(sol.voltages[1]).toBeCloseTo(12 - 0.05 * 6.05, 12);
    expect(sol.voltages[2]).toBeCloseTo(13 - 0.05 * 6.05, 12);
  });

  it("agrees to 1e-9 V on 120 random linear systems, every node, every point, every case", () => {
    const stats = newStats();
    const seeds = Array.from({ length: 120 }, (_, i) => 5001 + i);
    for (const seed of seeds) compareDocument(seed, false, stats);
    report("mathjs slu", seeds.length, stats);
    expect(stats.failures.slice(0, 20)).toEqual([]);
    expect(stats.cases).toBeGreaterThan(120);
    expect(stats.points).toBeGreaterThan(1500);
  });

  it("agrees to 1e-9 V on constant-power systems with each load replaced by the resistor V²/P", () => {
    const stats = newStats();
    const seeds = Array.from({ length: 12 }, (_, i) => 7001 + i);
    for (const seed of seeds) compareDocument(seed, true, stats);
    report("mathjs slu, constant power as V²/P", seeds.length, stats);
    expect(stats.failures.slice(0, 20)).toEqual([]);
    expect(stats.cases).toBeGreaterThanOrEqual(12);
  });

  it("sees a wrong value: the comparison fails when one source voltage is off by 1 mV", () => {
    const kase = engineCases(randomSystem(5001))[0];
    const engine = solveCircuit(kase.netlist);
    if (!engine.ok) throw new Error("engine failed");
    const netlist: Netlist = { nodeCount: kase.netlist.nodeCount, elements: kase.netlist.elements.map((el) => ({ ...el })) };
    const src = netlist.elements.find((el) => el.kind === "voltageSource") as { volts: number };
    src.volts += 1e-3;
    const mna = solveMna(netlist);
    const worst = Math.max(...Array.from(engine.voltages, (v, i) => Math.abs(v - mna.voltages[i])));
    expect(worst).toBeGreaterThan(VOLTAGE_TOLERANCE);
  });
});
