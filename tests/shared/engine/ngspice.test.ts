// Checks the engine against an independent circuit solver: ngspice, the SPICE simulator from
// Debian's `ngspice` package, run in batch mode (`ngspice -b`) as a separate process. Seeded random
// network documents (tests/support/random-systems.ts) are solved with solveSystem; the same
// network, with the engine's own per-conductor resistances, source values and load values for each
// case, is written as a SPICE netlist, solved by ngspice's operating-point analysis, and every point
// voltage (V+ − V−) and every battery/supply current must agree. ngspice solves constant-power
// loads itself, as behavioural current sources I = P/V; they are also checked for P = V·I at
// every load, and ngspice must reproduce the point voltages with each constant-power load
// replaced by the resistor V/I of the engine's solution.
//
// ngspice must be on PATH (.ci/run installs it); without it these tests fail, they do not skip.
import { execFile, spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { promisify } from "node:util";
import { afterAll, describe, expect, it } from "vitest";
import type { CircuitElement } from "../../../shared/engine/circuit.js";
import type { SystemInput } from "../../../shared/engine/schema.js";
import { describeSystem, engineCases, randomSystem, type EngineCase } from "../../support/random-systems.js";

const run = promisify(execFile);

/** Point voltages must match ngspice to 1 µV. */
const VOLTAGE_TOLERANCE = 1e-6;
/** Source currents: 1 µA, or 1e-9 of the current when that is larger. */
const currentTolerance = (amps: number) => Math.max(1e-6, 1e-9 * Math.abs(amps));
const SYSTEMS = 240;
/** Every fourth system has constant-power loads. */
const hasConstantPower = (seed: number) => seed % 4 === 0;
const SYSTEMS_PER_NETLIST = 40;
/** Newton tolerances for ngspice, so that its own convergence test guarantees far better than
 *  1 µV where there are constant-power loads (the defaults stop at 1e-3 relative). */
const TIGHT_NEWTON = [".options reltol=1e-11 vntol=1e-11 abstol=1e-13"];

function requireNgspice(): void {
  const probe = spawnSync("ngspice", ["--version"], { encoding: "utf8" });
  if (probe.error || probe.status !== 0 || !/ngspice/i.test(probe.stdout)) {
    throw new Error(
      "ngspice is not on PATH (or `ngspice --version` failed): these tests check the engine against it. " +
        "Install Debian's ngspice package (apt-get install ngspice; .ci/run does this)." +
        (probe.error ? ` (${probe.error.message})` : ""),
    );
  }
}

interface Instance {
  seed: number;
  doc: SystemInput;
  caseIndex: number;
  kase: EngineCase;
  /** Prefix of every node and element name of this instance in the batch netlist. */
  prefix: string;
}

const docs = Array.from({ length: SYSTEMS }, (_, i) => i + 1).map((seed) => ({
  seed,
  doc: randomSystem(seed, { constantPower: hasConstantPower(seed) }),
}));

function instancesOf(list: typeof docs): Instance[] {
  const out: Instance[] = [];
  for (const { seed, doc } of list) {
    engineCases(doc).forEach((kase, caseIndex) => out.push({ seed, doc, caseIndex, kase, prefix: `s${seed}_c${caseIndex}_` }));
  }
  return out;
}

/** SPICE number: 17 significant digits, plain exponent (no engineering suffixes). */
const num = (v: number) => {
  if (!Number.isFinite(v)) throw new Error(`not a finite value: ${v}`);
  return v.toExponential(16);
};

type ConstantPowerAs = "resistor" | "behavioural";

/** The instance's elements as SPICE lines. Node 0 is SPICE's ground, shared by every instance in
 *  a batch (each instance's reference is the − terminal of its first source). */
function spiceLines(inst: Instance, constantPowerAs: ConstantPowerAs): string[] {
  const { prefix, kase, doc } = inst;
  const node = (n: number) => (n === 0 ? "0" : `${prefix}n${n}`);
  const lines: string[] = [];
  kase.netlist.elements.forEach((el: CircuitElement, e) => {
    const name = `${prefix}e${e}`;
    switch (el.kind) {
      case "resistor":
        lines.push(`R${name} ${node(el.a)} ${node(el.b)} ${num(el.ohms)}`);
        break;
      case "voltageSource":
        if ((el.seriesOhms ?? 0) > 0) {
          // EMF between an internal node and −, internal resistance from there to +.
          lines.push(`V${name} ${prefix}x${e} ${node(el.minus)} DC ${num(el.volts)}`);
          lines.push(`R${name}_int ${prefix}x${e} ${node(el.plus)} ${num(el.seriesOhms!)}`);
        } else lines.push(`V${name} ${node(el.plus)} ${node(el.minus)} DC ${num(el.volts)}`);
        break;
      case "currentSource":
        // SPICE `I n+ n- val` drives val from n+ through the source to n-: the engine's from → to.
        lines.push(`I${name} ${node(el.from)} ${node(el.to)} DC ${num(el.amps)}`);
        break;
      case "constantCurrent":
        // A sink: into + and out of −, i.e. through the element from + to −.
        lines.push(`I${name} ${node(el.plus)} ${node(el.minus)} DC ${num(el.amps)}`);
        break;
      case "constantPower": {
        if (el.watts === 0) break; // draws nothing
        if (constantPowerAs === "resistor") {
          const load = kase.result.loads[[...kase.loadEl].indexOf(e)];
          lines.push(`R${name} ${node(el.plus)} ${node(el.minus)} ${num(load.voltage / load.current)}`);
        } else {
          // I = P/V; the floor at half the nominal voltage keeps ngspice's first Newton steps
          // (from 0 V) finite and does not act at the solution (every point is above 0.6·Vnom).
          const v = `V(${node(el.plus)},${node(el.minus)})`;
          lines.push(`B${name} ${node(el.plus)} ${node(el.minus)} I=${num(el.watts)}/max(${v},${num(0.5 * doc.nominalVoltage)})`);
        }
        break;
      }
    }
  });
  return lines;
}

const workDir = mkdtempSync(join(tmpdir(), "runwright-ngspice-"));
afterAll(() => rmSync(workDir, { recursive: true, force: true }));
let netlistCounter = 0;

/** Runs one netlist through `ngspice -b` and returns every printed vector (node voltages and
 *  voltage-source branch currents) by lower-case name. */
async function ngspice(title: string, body: string[], options: string[] = []): Promise<Map<string, number>> {
  const file = join(workDir, `batch-${netlistCounter++}.cir`);
  writeFileSync(file, [title, ...options, ...body, ".control", "set numdgt=15", "op", "print all", "quit 0", ".endc", ".end", ""].join("\n"));
  let stdout: string;
  let stderr: string;
  try {
    ({ stdout, stderr } = await run("ngspice", ["-b", file], { maxBuffer: 256 * 1024 * 1024, encoding: "utf8" }));
  } catch (error) {
    const e = error as { message: string; stdout?: string; stderr?: string };
    throw new Error(`ngspice -b ${file} failed: ${e.message}\n${(e.stderr ?? "").slice(0, 2000)}\n${(e.stdout ?? "").slice(0, 2000)}`);
  }
  const values = new Map<string, number>();
  let shortest = Infinity;
  for (const line of stdout.split("\n")) {
    const m = /^\s*(\S+) = (-?\d\.(\d+)e[+-]\d+)\s*$/.exec(line);
    if (!m) continue;
    values.set(m[1].toLowerCase(), Number(m[2]));
    shortest = Math.min(shortest, 1 + m[3].length);
  }
  if (values.size === 0) throw new Error(`ngspice printed no values for ${file}:\n${stderr.slice(0, 2000)}\n${stdout.slice(0, 2000)}`);
  // The comparison needs the digits: 1 µV of 60 V is 1.7e-8, so at least 12 significant digits.
  if (shortest < 12) throw new Error(`ngspice printed only ${shortest} significant digits`);
  return values;
}

interface Comparison {
  points: number;
  sourceCurrents: number;
  maxDeltaV: number;
  maxDeltaI: number;
  worst: string;
  failures: string[];
  /** Constant-power loads: |V·I − P|/P with V from ngspice and I from the engine. */
  powerChecks: number;
  maxPowerRel: number;
  powerFailures: string[];
}

/** Solves the instances with ngspice (batched, the batches in parallel) and compares every point
 *  voltage and every battery/supply current with the engine's result. */
async function compareWithNgspice(instances: Instance[], constantPowerAs: ConstantPowerAs, options: string[] = []): Promise<Comparison> {
  const batches: Instance[][] = [];
  const seedsPerBatch = new Map<number, number>();
  for (const inst of instances) {
    if (!seedsPerBatch.has(inst.seed)) seedsPerBatch.set(inst.seed, Math.floor(seedsPerBatch.size / SYSTEMS_PER_NETLIST));
    (batches[seedsPerBatch.get(inst.seed)!] ??= []).push(inst);
  }
  const results = await Promise.all(
    batches.map((batch, b) => ngspice(`runwright batch ${b} (${constantPowerAs})`, batch.flatMap((inst) => spiceLines(inst, constantPowerAs)), options)),
  );
  const out: Comparison = { points: 0, sourceCurrents: 0, maxDeltaV: 0, maxDeltaI: 0, worst: "", failures: [], powerChecks: 0, maxPowerRel: 0, powerFailures: [] };
  batches.forEach((batch, b) => {
    const values = results[b];
    for (const inst of batch) {
      const { prefix, kase } = inst;
      const where = `seed ${inst.seed}, case "${kase.name}"`;
      const v = (n: number) => {
        if (n === 0) return 0;
        const x = values.get(`${prefix}n${n}`.toLowerCase());
        if (x === undefined) throw new Error(`ngspice printed no voltage for node ${prefix}n${n} (${where})`);
        return x;
      };
      kase.result.points.forEach((p, i) => {
        const spice = v(kase.plusNode[i]) - v(kase.minusNode[i]);
        const d = Math.abs(spice - p.voltage);
        out.points++;
        if (d > out.maxDeltaV) { out.maxDeltaV = d; out.worst = `${where}, point ${p.id}`; }
        if (!(d <= VOLTAGE_TOLERANCE)) out.failures.push(`${where}, point ${p.id}: engine ${p.voltage} V, ngspice ${spice} V (Δ ${d.toExponential(3)} V)`);
      });
      inst.doc.sources.forEach((s, i) => {
        if (s.type === "pvArray") return;
        const branch = values.get(`V${prefix}e${kase.sourceEl[i]}#branch`.toLowerCase());
        if (branch === undefined) throw new Error(`ngspice printed no branch current for source ${s.id} (${where})`);
        // SPICE's branch current flows into the + terminal; the engine's out of + into the circuit.
        const spice = -branch;
        const engine = kase.result.sources[i].current;
        const d = Math.abs(spice - engine);
        out.sourceCurrents++;
        out.maxDeltaI = Math.max(out.maxDeltaI, d);
        if (!(d <= currentTolerance(engine))) out.failures.push(`${where}, source ${s.id}: engine ${engine} A, ngspice ${spice} A (Δ ${d.toExponential(3)} A)`);
      });
      kase.netlist.elements.forEach((el, e) => {
        if (el.kind !== "constantPower" || el.watts === 0) return;
        const load = kase.result.loads[[...kase.loadEl].indexOf(e)];
        const rel = Math.abs((v(el.plus) - v(el.minus)) * load.current - el.watts) / el.watts;
        out.powerChecks++;
        out.maxPowerRel = Math.max(out.maxPowerRel, rel);
        if (!(rel <= 1e-9)) out.powerFailures.push(`${where}, load ${load.id}: ${load.current} A at ngspice's voltage is ${rel.toExponential(3)} off ${el.watts} W`);
      });
    }
  });
  return out;
}

describe("engine against ngspice", () => {
  it("finds ngspice on PATH", () => {
    requireNgspice();
  });

  it("generates systems that cover the feature list", () => {
    const f = docs.map(({ doc }) => describeSystem(doc));
    const count = (pred: (x: (typeof f)[number]) => boolean) => f.filter(pred).length;
    expect(count((x) => !x.loops)).toBeGreaterThan(50);
    expect(count((x) => x.loops)).toBeGreaterThan(50);
    expect(count((x) => x.sharedReturn)).toBeGreaterThan(50);
    expect(count((x) => x.sources === 1)).toBeGreaterThan(20);
    expect(count((x) => x.sources === 2)).toBeGreaterThan(20);
    expect(count((x) => x.sources === 3)).toBeGreaterThan(20);
    expect(count((x) => x.ideal)).toBeGreaterThan(20);
    expect(count((x) => x.ideal && x.sources > 1)).toBeGreaterThan(5);
    expect(count((x) => x.pvArray)).toBeGreaterThan(20);
    expect(count((x) => x.aluminum)).toBeGreaterThan(20);
    expect(count((x) => x.parallel)).toBeGreaterThan(20);
    expect(count((x) => x.units === "imperial")).toBeGreaterThan(50);
    expect(count((x) => x.units === "metric")).toBeGreaterThan(50);
    expect(count((x) => x.cases === 2)).toBeGreaterThan(30);
    expect(count((x) => x.points === 2)).toBeGreaterThan(0);
    expect(count((x) => x.points >= 30)).toBeGreaterThan(10);
    for (const model of ["ohms", "watts", "constantCurrent", "constantPower"] as const) {
      expect(count((x) => x.loadModels.has(model)), model).toBeGreaterThan(30);
    }
    // Ideal sources: at most one per system, never two sources on one point.
    for (const { doc } of docs) {
      expect(doc.sources.filter((s) => s.type !== "pvArray" && (s.internalResistanceOhm ?? 0) === 0).length).toBeLessThanOrEqual(1);
      expect(new Set(doc.sources.map((s) => s.point)).size).toBe(doc.sources.length);
    }
  });

  it(`matches ngspice within 1 µV at every point of ${SYSTEMS} random systems, every case`, async () => {
    requireNgspice();
    const instances = instancesOf(docs);
    // The generator keeps loads small enough that every point stays well above half nominal
    // (which is also where the behavioural constant-power sources' floor stays inactive).
    for (const inst of instances) {
      for (const p of inst.kase.result.points) expect(p.voltage, `seed ${inst.seed} ${p.id}`).toBeGreaterThan(0.6 * inst.doc.nominalVoltage);
    }
    const cmp = await compareWithNgspice(instances, "behavioural", TIGHT_NEWTON);
    console.log(
      `ngspice: ${docs.length} systems (${docs.filter(({ seed }) => hasConstantPower(seed)).length} with constant-power loads), ${instances.length} cases, ` +
        `${cmp.points} point voltages, ${cmp.sourceCurrents} source currents; ` +
        `max |ΔV| ${cmp.maxDeltaV.toExponential(3)} V (${cmp.worst}), max |ΔI| ${cmp.maxDeltaI.toExponential(3)} A`,
    );
    expect(cmp.failures.slice(0, 20)).toEqual([]);
    expect(cmp.powerFailures.slice(0, 20)).toEqual([]);
    expect(cmp.points).toBeGreaterThan(2000);
    expect(cmp.sourceCurrents).toBeGreaterThan(300);
  });

  describe("constant-power loads", () => {
    const cpDocs = docs.filter(({ seed }) => hasConstantPower(seed));

    it("draw P = V·I at every load, every case, to 1e-9", async () => {
      requireNgspice();
      // The engine's own V and I, against the document's watts × the case's load factor.
      let checked = 0;
      let worst = 0;
      const instances = instancesOf(cpDocs);
      for (const inst of instances) {
        const { doc, kase } = inst;
        const factor = doc.cases?.[inst.caseIndex].loadFactor ?? 1;
        doc.loads.forEach((l, i) => {
          if (l.model !== "constantPower") return;
          const r = kase.result.loads[i];
          const P = l.watts * factor;
          const where = `seed ${inst.seed}, case "${kase.name}", load ${l.id}`;
          expect(r.voltage, where).toBe(kase.result.points.find((p) => p.id === l.point)!.voltage);
          if (P === 0) {
            expect(r.current, where).toBe(0);
            return;
          }
          const rel = Math.abs(r.voltage * r.current - P) / P;
          worst = Math.max(worst, rel);
          expect(rel, where).toBeLessThanOrEqual(1e-9);
          expect(Math.abs(r.powerW - P) / P, where).toBeLessThanOrEqual(1e-9);
          checked++;
        });
      }
      // And the engine's current at the voltage ngspice finds for the load.
      const cmp = await compareWithNgspice(instances, "behavioural", TIGHT_NEWTON);
      console.log(
        `constant power: ${checked} load-cases, max |V·I − P|/P ${worst.toExponential(3)} with the engine's V, ` +
          `${cmp.maxPowerRel.toExponential(3)} with ngspice's V (${cmp.powerChecks} checks)`,
      );
      expect(checked).toBeGreaterThan(60);
      expect(cmp.powerChecks).toBe(checked);
      expect(cmp.powerFailures.slice(0, 20)).toEqual([]);
    });

    it("give the same point voltages in ngspice when each is replaced by the resistor V/I", async () => {
      requireNgspice();
      const instances = instancesOf(cpDocs);
      const cmp = await compareWithNgspice(instances, "resistor");
      console.log(`ngspice, constant power as V/I resistors: ${cpDocs.length} systems, ${cmp.points} point voltages, max |ΔV| ${cmp.maxDeltaV.toExponential(3)} V`);
      expect(cmp.failures.slice(0, 20)).toEqual([]);
      expect(cmp.points).toBeGreaterThan(500);
    });
  });

  it("the netlist writer is not trivially agreeable: a wrong value shows as a failure", async () => {
    // Guards the comparison itself: shift one conductor's resistance by 1 % and the check must
    // see it (so a writer or parser that dropped elements or values would not pass silently).
    requireNgspice();
    const inst = instancesOf([docs.find(({ doc }) => doc.points.length >= 10 && doc.loads.length >= 5)!])[0];
    const runs = inst.kase.result.runs;
    const busiest = runs.reduce((best, r, i) => (Math.abs(r.current * r.resistanceOhm) > Math.abs(runs[best].current * runs[best].resistanceOhm) ? i : best), 0);
    const el = inst.kase.netlist.elements[inst.kase.runPlus[busiest]] as { ohms: number };
    expect(el.ohms).toBe(runs[busiest].resistanceOhm);
    el.ohms *= 1.01;
    const cmp = await compareWithNgspice([inst], "resistor");
    expect(cmp.failures.length).toBeGreaterThan(0);
  });
});
