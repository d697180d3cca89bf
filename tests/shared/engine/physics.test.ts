// Physical laws the engine must obey on any network, checked by property-based testing
// (fast-check generates the networks): Kirchhoff's current law at every node, conservation of
// energy, monotonicity of drop in conductor size on radial systems, and linearity of drop in
// length for constant-current loads.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { solveCircuit } from "../../../shared/engine/circuit.js";
import type { SystemInput } from "../../../shared/engine/schema.js";
import { compileSystem, parseSystem, solveSystem, type SolveSuccess } from "../../../shared/engine/system.js";

const METRIC = ["1.5 mm2", "2.5 mm2", "4 mm2", "6 mm2", "10 mm2", "16 mm2", "25 mm2", "35 mm2", "50 mm2"];
const AWG = ["14 AWG", "12 AWG", "10 AWG", "8 AWG", "6 AWG", "4 AWG", "2 AWG", "1/0 AWG", "2/0 AWG", "4/0 AWG"];

type LoadModel = "constantResistance" | "constantCurrent" | "constantPower";

/** A random network: a tree of points with optional extra runs closing loops, 1–3 sources. */
const networkArb = (opts: { models: LoadModel[]; mesh: boolean; maxPoints?: number }) =>
  fc
    .record({
      imperial: fc.boolean(),
      nominal: fc.constantFrom(12, 24, 48),
      n: fc.integer({ min: 2, max: opts.maxPoints ?? 25 }),
      parents: fc.array(fc.double({ min: 0, max: 0.9999, noNaN: true }), { minLength: 40, maxLength: 40 }),
      // Runs of 2 … 40 m or ft. Double precision puts a floor under Kirchhoff's law: one rounding
      // of a 50 V node voltage (7e-15 V) across a 0.5 ft run of 4/0 AWG (3e4 S) is already 2e-10 A,
      // so sub-metre runs of heavy cable would test the arithmetic, not the engine.
      lengths: fc.array(fc.double({ min: 2, max: 40, noNaN: true }), { minLength: 50, maxLength: 50 }),
      sizes: fc.array(fc.nat(), { minLength: 50, maxLength: 50 }),
      extra: fc.array(fc.tuple(fc.nat(), fc.nat()), { maxLength: opts.mesh ? 6 : 0 }),
      loads: fc.array(fc.record({ at: fc.nat(), model: fc.constantFrom(...opts.models), size: fc.double({ min: 0.05, max: 1, noNaN: true }) }), { minLength: 1, maxLength: 20 }),
      sources: fc.array(fc.record({ at: fc.nat(), r: fc.double({ min: 0.002, max: 0.05, noNaN: true }), dv: fc.double({ min: -0.05, max: 0.05, noNaN: true }) }), { minLength: 0, maxLength: 2 }),
      firstIdeal: fc.boolean(),
      temperature: fc.integer({ min: 20, max: 90 }),
    })
    .map((p): SystemInput => {
      const sizes = p.imperial ? AWG : METRIC;
      const points = Array.from({ length: p.n }, (_, i) => ({ id: `p${i}` }));
      const runs: SystemInput["runs"] = [];
      for (let i = 1; i < p.n; i++) {
        const parent = Math.floor(p.parents[i % p.parents.length] * i);
        runs.push({ id: `r${i}`, from: `p${parent}`, to: `p${i}`, length: p.lengths[i], size: sizes[p.sizes[i] % sizes.length] });
      }
      p.extra.forEach(([a, b], k) => {
        const from = a % p.n;
        const to = b % p.n;
        if (from !== to) runs.push({ id: `m${k}`, from: `p${from}`, to: `p${to}`, length: p.lengths[40 + (k % 10)], size: sizes[p.sizes[40 + (k % 10)] % sizes.length] });
      });
      const v = p.nominal * 1.05;
      const sources: SystemInput["sources"] = [
        { id: "s0", type: "battery", point: "p0", voltage: v, internalResistanceOhm: p.firstIdeal ? 0 : 0.01 },
      ];
      const used = new Set([0]);
      p.sources.forEach((s, k) => {
        const at = s.at % p.n;
        if (used.has(at)) return;
        used.add(at);
        sources.push({ id: `s${k + 1}`, type: "supply", point: `p${at}`, voltage: v * (1 + s.dv), internalResistanceOhm: s.r });
      });
      // Loads sized so the whole network draws a modest current (drops stay well under 50 %).
      const amps = 8 / p.loads.length;
      const loads: SystemInput["loads"] = p.loads.map((l, k) => {
        const point = `p${l.at % p.n}`;
        const a = amps * l.size;
        if (l.model === "constantCurrent") return { id: `l${k}`, point, model: "constantCurrent", amps: a };
        if (l.model === "constantPower") return { id: `l${k}`, point, model: "constantPower", watts: a * p.nominal * 0.5 };
        return { id: `l${k}`, point, model: "constantResistance", ohms: p.nominal / a };
      });
      return {
        format: "runwright-system/1",
        units: p.imperial ? "imperial" : "metric",
        nominalVoltage: p.nominal,
        conductorTemperatureC: p.temperature,
        points, sources, runs, loads,
      };
    });

function solved(doc: SystemInput): SolveSuccess {
  const r = solveSystem(structuredClone(doc));
  if (!r.ok) throw new Error(`engine refused a generated network: ${JSON.stringify(r.errors)}`);
  return r;
}

describe("physics properties (fast-check)", () => {
  it("Kirchhoff's current law holds at every node to 1e-9 A", () => {
    fc.assert(
      fc.property(networkArb({ models: ["constantResistance", "constantCurrent", "constantPower"], mesh: true }), (doc) => {
        const parsed = parseSystem(structuredClone(doc));
        if (!parsed.ok) throw new Error(JSON.stringify(parsed.errors));
        const compiled = compileSystem(parsed.system);
        if ("ok" in compiled) throw new Error(JSON.stringify(compiled.errors));
        const r = solveCircuit(compiled.netlist);
        if (!r.ok) throw new Error(JSON.stringify(r.errors));
        // Sum the current leaving each node through every element.
        const leaving = new Float64Array(compiled.netlist.nodeCount);
        compiled.netlist.elements.forEach((el, e) => {
          const i = r.currents[e];
          switch (el.kind) {
            case "resistor": leaving[el.a] += i; leaving[el.b] -= i; break;
            case "voltageSource": leaving[el.plus] -= i; leaving[el.minus] += i; break;
            case "currentSource": leaving[el.from] += i; leaving[el.to] -= i; break;
            default: leaving[el.plus] += i; leaving[el.minus] -= i; break;
          }
        });
        for (let n = 0; n < leaving.length; n++) expect(Math.abs(leaving[n])).toBeLessThan(1e-9);
      }),
      { numRuns: 150, seed: 4201 },
    );
  });

  it("source power equals load power plus conductor losses to 1e-9 relative", () => {
    fc.assert(
      fc.property(networkArb({ models: ["constantResistance", "constantCurrent", "constantPower"], mesh: true }), (doc) => {
        const r = solved(doc);
        for (const c of r.cases) {
          const source = c.sources.reduce((s, x) => s + x.powerW, 0);
          const loads = c.loads.reduce((s, x) => s + x.powerW, 0);
          const losses = c.runs.reduce((s, x) => s + x.lossW, 0);
          expect(Math.abs(source - (loads + losses))).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(source)));
        }
      }),
      { numRuns: 150, seed: 4202 },
    );
  });

  it("constant-power loads draw exactly their power (P = V·I to 1e-9 relative)", () => {
    fc.assert(
      fc.property(networkArb({ models: ["constantPower"], mesh: true }), (doc) => {
        const r = solved(doc);
        doc.loads.forEach((l, i) => {
          const lr = r.cases[0].loads[i];
          const watts = (l as { watts: number }).watts;
          expect(Math.abs(lr.voltage * lr.current - watts)).toBeLessThanOrEqual(1e-9 * Math.max(1, watts));
        });
      }),
      { numRuns: 100, seed: 4203 },
    );
  });

  // Constant-current and constant-power loads. A constant-resistance load is left out on purpose:
  // it draws more current when its voltage rises, so upsizing one branch (which lifts the
  // source's terminal voltage) can add a few nanovolts of drop to a resistive load on another
  // branch. That is physics, not an engine error (fast-check found such a case: +2e-11 %).
  it("in a radial system, upsizing any run never increases any load's drop", () => {
    fc.assert(
      fc.property(
        networkArb({ models: ["constantCurrent", "constantPower"], mesh: false }).filter((d) => d.sources.length === 1),
        fc.nat(),
        (doc, pick) => {
          const before = solved(doc);
          const runIndex = pick % doc.runs.length;
          const list = doc.units === "imperial" ? AWG : METRIC;
          const at = list.indexOf(doc.runs[runIndex].size);
          fc.pre(at < list.length - 1);
          const bigger = structuredClone(doc);
          bigger.runs[runIndex].size = list[at + 1];
          const after = solved(bigger);
          before.cases[0].loads.forEach((lb, i) => {
            expect(after.cases[0].loads[i].dropPercent).toBeLessThanOrEqual(lb.dropPercent + 1e-12);
          });
        },
      ),
      { numRuns: 150, seed: 4204 },
    );
  });

  it("scaling every length by k scales every drop by k for constant-current loads", () => {
    fc.assert(
      fc.property(
        networkArb({ models: ["constantCurrent"], mesh: true }).filter((d) => d.sources.length === 1),
        fc.double({ min: 0.1, max: 5, noNaN: true }),
        (doc, k) => {
          const base = solved(doc);
          const scaled = structuredClone(doc);
          scaled.runs.forEach((r) => { r.length = (r.length as number) * k; });
          const r = solved(scaled);
          // Compared in volts: 1e-9 relative, plus a floor of 64 roundings of the nominal voltage,
          // because a drop is the difference of two node voltages that each carry a rounding.
          const floor = 64 * Number.EPSILON * doc.nominalVoltage;
          base.cases[0].loads.forEach((lb, i) => {
            const expectedV = ((lb.dropPercent * k) / 100) * doc.nominalVoltage;
            const gotV = (r.cases[0].loads[i].dropPercent / 100) * doc.nominalVoltage;
            expect(Math.abs(gotV - expectedV)).toBeLessThanOrEqual(1e-9 * Math.abs(expectedV) + floor);
          });
        },
      ),
      { numRuns: 150, seed: 4205 },
    );
  });
});
