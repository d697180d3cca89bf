// Every engine error code, fault current, drop status, fuse and ampacity findings, and garbage input.
// Expected figures are computed here from the published tables in REFERENCES.md, named beside each use:
//  - IEC 60228:2004 max DC resistance at 20 °C, class 5 (etechnik-synergie.com, mycableengineering.com):
//    2.5 mm2 7.98 Ω/km, 16 mm2 1.21 Ω/km.
//  - NFPA 70 Chapter 9 Table 8 at 75 °C (electrical-design-tutor.com): 10 AWG Cu 1.24 Ω/kft.
//  - NFPA 70 Table 310.16 (2023; a published reproduction) and 240.4(D) (electricallicenserenewal.com).
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { solveCircuit } from "../../../shared/engine/circuit.js";
import { SYSTEM_LIMITS } from "../../../shared/engine/schema.js";
import { solveSystem, type EngineErrorCode, type SolveFailure, type SolveResult, type SolveSuccess } from "../../../shared/engine/system.js";

const CODES: readonly EngineErrorCode[] = [
  "INVALID_FIELD", "TOO_LARGE", "DUPLICATE_ID", "UNKNOWN_POINT", "UNKNOWN_SOURCE", "UNKNOWN_SIZE", "UNKNOWN_CASE",
  "ZERO_LENGTH_RUN", "RUN_ENDS_SAME_POINT", "NO_SOURCE", "FLOATING_POINT", "SHORTED_SOURCE", "PARALLEL_IDEAL_SOURCES",
  "VOLTAGE_COLLAPSE", "ILL_CONDITIONED",
];

// IEC 60228 class 5, Ω/m at 20 °C (see the header)
const R25_C5 = 7.98e-3; // 2.5 mm2
const R16_C5 = 1.21e-3; // 16 mm2

type Doc = Record<string, any>;
/** A 12 V metric system at 20 °C (the IEC 60228 reference temperature, so no temperature correction). */
function doc(): Doc {
  return {
    format: "runwright-system/1",
    units: "metric",
    nominalVoltage: 12,
    conductorTemperatureC: 20,
    points: [{ id: "bus" }, { id: "far" }],
    sources: [{ id: "bat", type: "battery", point: "bus", voltage: 12, internalResistanceOhm: 0.01 }],
    runs: [{ id: "r1", from: "bus", to: "far", length: 10, size: "16 mm2" }],
    loads: [{ id: "lamp", point: "far", model: "constantCurrent", amps: 5 }],
  };
}

function fails(r: SolveResult): SolveFailure {
  expect(r.ok).toBe(false);
  if (r.ok) throw new Error("expected a failure");
  expect(r.errors.length).toBeGreaterThan(0);
  for (const e of r.errors) {
    expect(CODES).toContain(e.code);
    expect(typeof e.message).toBe("string");
    expect(e.message.length).toBeGreaterThan(0);
  }
  return r;
}
function succeeds(r: SolveResult): SolveSuccess {
  if (!r.ok) throw new Error(`expected success: ${JSON.stringify(r.errors)}`);
  return r;
}
const codes = (r: SolveResult) => (r.ok ? [] : r.errors.map((e) => e.code));
const findingCodes = (r: SolveSuccess) => r.findings.map((f) => f.code);
const findingsOf = (r: SolveSuccess, code: string) => r.findings.filter((f) => f.code === code);
const rel = (actual: number, expected: number) => Math.abs(actual - expected) / Math.abs(expected);

describe("error codes from solveSystem", () => {
  it("INVALID_FIELD: an unknown field is named in the message and the path", () => {
    const d = doc();
    d.runs[0].colour = "red";
    const r = fails(solveSystem(d));
    expect(r.errors).toHaveLength(1);
    expect(r.errors[0].code).toBe("INVALID_FIELD");
    expect(r.errors[0].path).toBe("runs[0].colour");
    expect(r.errors[0].message).toContain("runs[0].colour");
    expect(r.errors[0].message).toContain("colour");
  });

  it("INVALID_FIELD: a wrong type names the field", () => {
    const d = doc();
    d.nominalVoltage = "12";
    const r = fails(solveSystem(d));
    expect(r.errors[0].code).toBe("INVALID_FIELD");
    expect(r.errors[0].path).toBe("nominalVoltage");
    expect(r.errors[0].message).toMatch(/^nominalVoltage: /);

    const d2 = doc();
    d2.runs[0].parallel = 1.5;
    const r2 = fails(solveSystem(d2));
    expect(r2.errors[0]).toMatchObject({ code: "INVALID_FIELD", path: "runs[0].parallel" });
    expect(r2.errors[0].message).toContain("runs[0].parallel");

    const d3 = doc();
    d3.loads[0].model = "constantMood";
    expect(fails(solveSystem(d3)).errors[0]).toMatchObject({ code: "INVALID_FIELD", path: "loads[0].model" });
  });

  it("INVALID_FIELD: a text length that was not converted first (resolveLengths), and a PV array's voltage set in a case", () => {
    const d = doc();
    d.runs[0].length = "10 m";
    expect(fails(solveSystem(d)).errors[0]).toMatchObject({ code: "INVALID_FIELD", path: "runs[0].length", ids: ["r1"] });
    const d2 = doc();
    d2.sources.push({ id: "pv", type: "pvArray", point: "bus", currentA: 3 });
    d2.cases = [{ name: "sun", sourceVoltages: { pv: 20 } }];
    expect(fails(solveSystem(d2)).errors[0]).toMatchObject({ code: "INVALID_FIELD", path: "cases[0].sourceVoltages.pv" });
  });

  it("TOO_LARGE: more than SYSTEM_LIMITS.points points, before any other check", () => {
    const d = doc();
    d.points = Array.from({ length: SYSTEM_LIMITS.points + 1 }, (_, i) => ({ id: `p${i}` }));
    const r = fails(solveSystem(d));
    expect(r.errors).toHaveLength(1);
    expect(r.errors[0]).toMatchObject({ code: "TOO_LARGE", path: "points" });
    expect(r.errors[0].message).toContain(String(SYSTEM_LIMITS.points));
  });

  it("TOO_LARGE: more than SYSTEM_LIMITS.sources sources", () => {
    const d = doc();
    d.sources = Array.from({ length: SYSTEM_LIMITS.sources + 1 }, (_, i) => ({ id: `s${i}`, type: "battery", point: "bus", voltage: 12, internalResistanceOhm: 0.01 }));
    expect(fails(solveSystem(d)).errors[0]).toMatchObject({ code: "TOO_LARGE", path: "sources" });
  });

  it("DUPLICATE_ID", () => {
    const d = doc();
    d.points.push({ id: "far" });
    const r = fails(solveSystem(d));
    expect(r.errors[0]).toMatchObject({ code: "DUPLICATE_ID", path: "points[2].id", ids: ["far"] });
    const d2 = doc();
    d2.loads.push({ id: "lamp", point: "bus", model: "constantCurrent", amps: 1 });
    expect(fails(solveSystem(d2)).errors[0]).toMatchObject({ code: "DUPLICATE_ID", path: "loads[1].id", ids: ["lamp"] });
  });

  it("UNKNOWN_POINT", () => {
    const d = doc();
    d.loads[0].point = "nowhere";
    expect(fails(solveSystem(d)).errors[0]).toMatchObject({ code: "UNKNOWN_POINT", path: "loads[0].point", ids: ["lamp", "nowhere"] });
    const d2 = doc();
    d2.runs[0].to = "nowhere";
    expect(fails(solveSystem(d2)).errors[0]).toMatchObject({ code: "UNKNOWN_POINT", path: "runs[0].to" });
  });

  it("UNKNOWN_SOURCE: a case's sourceVoltages (or sourceCurrents) naming no source", () => {
    const d = doc();
    d.cases = [{ name: "low", sourceVoltages: { nope: 11.8 } }];
    const r = fails(solveSystem(d));
    expect(r.errors[0]).toMatchObject({ code: "UNKNOWN_SOURCE", path: "cases[0].sourceVoltages.nope", ids: ["nope"] });
    const d2 = doc();
    d2.cases = [{ name: "sun", sourceCurrents: { ghost: 2 } }];
    expect(fails(solveSystem(d2)).errors[0]).toMatchObject({ code: "UNKNOWN_SOURCE", ids: ["ghost"] });
  });

  it("UNKNOWN_SIZE: \"17 mm2\" at runs[0].size, and an unknown returnSize", () => {
    const d = doc();
    d.runs[0].size = "17 mm2";
    const r = fails(solveSystem(d));
    expect(r.errors[0]).toMatchObject({ code: "UNKNOWN_SIZE", path: "runs[0].size", ids: ["r1"] });
    expect(r.errors[0].message).toContain("17 mm2");
    const d2 = doc();
    d2.runs[0].returnSize = "0 AWG";
    expect(fails(solveSystem(d2)).errors[0]).toMatchObject({ code: "UNKNOWN_SIZE", path: "runs[0].returnSize" });
  });

  it("UNKNOWN_CASE", () => {
    const d = doc();
    d.cases = [{ name: "full" }, { name: "low", sourceVoltages: { bat: 11.5 } }];
    const r = fails(solveSystem(d, { caseName: "nope" }));
    expect(r.errors[0]).toMatchObject({ code: "UNKNOWN_CASE", path: "cases" });
    expect(r.errors[0].message).toContain("nope");
    // the default case is called "Nominal"; a named case solves only that case
    expect(fails(solveSystem(doc(), { caseName: "nope" })).errors[0].code).toBe("UNKNOWN_CASE");
    const only = succeeds(solveSystem(d, { caseName: "low" }));
    expect(only.cases.map((c) => c.name)).toEqual(["low"]);
  });

  it("ZERO_LENGTH_RUN: 0 and negative", () => {
    for (const length of [0, -5]) {
      const d = doc();
      d.runs[0].length = length;
      expect(fails(solveSystem(d)).errors[0]).toMatchObject({ code: "ZERO_LENGTH_RUN", path: "runs[0].length", ids: ["r1"] });
    }
  });

  it("RUN_ENDS_SAME_POINT", () => {
    const d = doc();
    d.runs[0].to = "bus";
    const r = fails(solveSystem(d));
    expect(codes(r)).toContain("RUN_ENDS_SAME_POINT");
    expect(r.errors.find((e) => e.code === "RUN_ENDS_SAME_POINT")).toMatchObject({ path: "runs[0].to", ids: ["r1"] });
  });

  it("NO_SOURCE", () => {
    const d = doc();
    d.sources = [];
    expect(fails(solveSystem(d)).errors[0]).toMatchObject({ code: "NO_SOURCE", path: "sources" });
  });

  it("FLOATING_POINT: points with no path to any source, named in ids", () => {
    const d = doc();
    d.points.push({ id: "island" }, { id: "islet" });
    d.runs.push({ id: "r2", from: "island", to: "islet", length: 1, size: "4 mm2" });
    const r = fails(solveSystem(d));
    expect(r.errors).toHaveLength(1);
    expect(r.errors[0].code).toBe("FLOATING_POINT");
    expect(r.errors[0].ids).toEqual(["island", "islet"]);
    expect(r.errors[0].message).toContain("island");
  });

  it("FLOATING_POINT: a PV array (a current source) with only constant-current loads has nothing that sets the voltage", () => {
    const d = doc();
    d.sources = [{ id: "pv", type: "pvArray", point: "bus", currentA: 5 }];
    const r = fails(solveSystem(d));
    expect(r.errors[0].code).toBe("FLOATING_POINT");
    expect(r.errors[0].ids).toContain("pv");
  });

  it("VOLTAGE_COLLAPSE: a constant-current load the cables cannot feed (it would sit at or below 0 V)", () => {
    // 100 A through 2 × 10 m of 0.5 mm² (IEC 60228 class 5, 39.0 Ω/km at 20 °C): 78 V of drop from 12 V.
    const d = doc();
    d.runs[0].size = "0.5 mm2";
    d.loads = [{ id: "lamp", point: "far", model: "constantCurrent", amps: 100 }];
    const r = fails(solveSystem(d));
    expect(r.errors[0].code).toBe("VOLTAGE_COLLAPSE");
    expect(r.errors[0].ids).toEqual(["lamp"]);
  });

  it("SHORTED_SOURCE: a 0 Ω constantResistance load at the point of an ideal source", () => {
    const d = doc();
    d.sources[0].internalResistanceOhm = 0;
    d.loads = [{ id: "dead-short", point: "bus", model: "constantResistance", ohms: 0 }];
    const r = fails(solveSystem(d));
    expect(r.errors[0].code).toBe("SHORTED_SOURCE");
    expect(r.errors[0].path).toBe("loads[0].ohms");
    expect(r.errors[0].ids).toEqual(expect.arrayContaining(["dead-short", "bus"]));
  });

  it("SHORTED_SOURCE: a 0 Ω load is a dead short whatever the source, even one with internal resistance", () => {
    const d = doc();
    d.loads = [{ id: "dead-short", point: "bus", model: "constantResistance", ohms: 0 }];
    const r = fails(solveSystem(d));
    expect(r.errors[0].code).toBe("SHORTED_SOURCE");
    expect(r.errors[0].message).toMatch(/dead short/);
  });

  it("SHORTED_SOURCE in the circuit solver: a 0 Ω resistor across an ideal voltage source", () => {
    const r = solveCircuit({
      nodeCount: 2,
      elements: [
        { kind: "voltageSource", id: "V1", plus: 1, minus: 0, volts: 12 },
        { kind: "resistor", id: "R0", a: 1, b: 0, ohms: 0 },
      ],
    });
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.errors[0].code).toBe("SHORTED_SOURCE");
      expect(r.errors[0].elementIds).toEqual(expect.arrayContaining(["V1", "R0"]));
    }
  });

  it("PARALLEL_IDEAL_SOURCES: two ideal sources on the same point, at equal or different voltages", () => {
    for (const v2 of [12, 13]) {
      const d = doc();
      d.sources[0].internalResistanceOhm = 0;
      d.sources.push({ id: "psu", type: "supply", point: "bus", voltage: v2 });
      const r = fails(solveSystem(d));
      expect(r.errors[0].code).toBe("PARALLEL_IDEAL_SOURCES");
      expect(r.errors[0].ids).toEqual(expect.arrayContaining(["bat", "psu"]));
    }
  });

  it("two ideal sources on two points joined by a run are not in parallel (the run has resistance): it solves", () => {
    // Only same-point (or ideal-only) loops qualify. 12 V and 12.5 V joined by 10 m of 16 mm2:
    // the 0.5 V difference drives (12.5 − 12)/(2·10·R16) through the run, far → bus.
    const d = doc();
    d.sources[0].internalResistanceOhm = 0;
    d.sources.push({ id: "psu", type: "supply", point: "far", voltage: 12.5, internalResistanceOhm: 0 });
    d.loads = [];
    const r = succeeds(solveSystem(d));
    const run = r.cases[0].runs[0];
    expect(rel(-run.current, 0.5 / (2 * 10 * R16_C5))).toBeLessThan(1e-9);
    expect(rel(r.cases[0].sources[1].current, 0.5 / (2 * 10 * R16_C5))).toBeLessThan(1e-9);
    expect(rel(-r.cases[0].sources[0].current, 0.5 / (2 * 10 * R16_C5))).toBeLessThan(1e-9);
  });

  describe("VOLTAGE_COLLAPSE: a constantPower load above V²/(4R) of its supply", () => {
    // R = internal resistance + both conductors: 0.01 + 2 · 10 m · 7.98 mΩ/m (2.5 mm2 class 5, IEC 60228)
    const R = 0.01 + 2 * 10 * R25_C5;
    const E = 12;
    const pMax = (E * E) / (4 * R);
    const withPower = (watts: number, caseName?: string) => {
      const d = doc();
      d.runs[0].size = "2.5 mm2";
      d.loads = [{ id: "pump", point: "far", model: "constantPower", watts }];
      if (caseName) d.cases = [{ name: caseName }];
      return solveSystem(d);
    };

    for (const f of [1.01, 1.001]) {
      it(`${f} × V²/(4R) collapses; ids name the load`, () => {
        const r = fails(withPower(f * pMax));
        expect(r.errors).toHaveLength(1);
        expect(r.errors[0].code).toBe("VOLTAGE_COLLAPSE");
        expect(r.errors[0].ids).toEqual(["pump"]);
        for (const id of r.errors[0].ids!) expect(typeof id).toBe("string");
        expect(r.errors[0].message).toContain("pump");
        expect(r.errors[0].message).not.toMatch(/NaN|Infinity|undefined/);
        expect(r.errors[0].case).toBe("Nominal");
      });
    }

    for (const f of [0.99, 0.999]) {
      it(`${f} × V²/(4R) solves on the upper branch, V = E/2·(1 + √(1 − P/Pmax))`, () => {
        const r = succeeds(withPower(f * pMax));
        const load = r.cases[0].loads[0];
        expect(rel(load.voltage, (E / 2) * (1 + Math.sqrt(1 - f)))).toBeLessThan(1e-6);
        expect(rel(load.powerW, f * pMax)).toBeLessThan(1e-9);
        expect(Number.isFinite(load.dropPercent)).toBe(true);
      });
    }

    it("names the case in which it collapses", () => {
      const r = fails(withPower(2 * pMax, "hot-day"));
      expect(r.errors[0]).toMatchObject({ code: "VOLTAGE_COLLAPSE", case: "hot-day", ids: ["pump"] });
    });
  });

  describe("ILL_CONDITIONED", () => {
    it("the circuit solver reports it for 1e-300 Ω between two nodes each tied to ground by 1e300 Ω", () => {
      // G = [[1e300 + 1e-300, −1e300], [−1e300, 1e300 + 1e-300]]: the second pivot cancels to 0.
      const r = solveCircuit({
        nodeCount: 3,
        elements: [
          { kind: "currentSource", id: "I", from: 0, to: 1, amps: 1 },
          { kind: "resistor", id: "tiny", a: 1, b: 2, ohms: 1e-300 },
          { kind: "resistor", id: "hugeA", a: 1, b: 0, ohms: 1e300 },
          { kind: "resistor", id: "hugeB", a: 2, b: 0, ohms: 1e300 },
        ],
      });
      expect(r.ok).toBe(false);
      if (r.ok) return;
      expect(r.errors[0].code).toBe("ILL_CONDITIONED");
      expect(r.errors[0].elementIds.length).toBeGreaterThan(0);
      expect(r.errors[0].nodes.length).toBeGreaterThan(0);
    });

    it("1e-300 Ω in series with 1e300 Ω from an ideal 1 V source gives a finite answer, not an error", () => {
      // Documented behaviour: V(2) = 1 V (right to the last bit), the 1e-300 A through the chain is
      // computed for the 1e300 Ω resistor, but the current of the 1e-300 Ω resistor and of the
      // source come out as 0 (ΔV underflows), so KCL at node 2 is off by 1e-300 A.
      const r = solveCircuit({
        nodeCount: 3,
        elements: [
          { kind: "voltageSource", id: "V", plus: 1, minus: 0, volts: 1 },
          { kind: "resistor", id: "tiny", a: 1, b: 2, ohms: 1e-300 },
          { kind: "resistor", id: "huge", a: 2, b: 0, ohms: 1e300 },
        ],
      });
      expect(r.ok).toBe(true);
      if (!r.ok) return;
      expect(r.voltages[2]).toBe(1);
      expect(r.currents[2]).toBe(1e-300);
      // observed: currents[1] (the 1e-300 Ω resistor) and currents[0] (the source) are 0, not 1e-300
      for (const i of [0, 1]) {
        expect(Number.isFinite(r.currents[i])).toBe(true);
        expect(Math.abs(r.currents[i])).toBeLessThanOrEqual(1e-300);
      }
    });

    it("solveSystem reports it for a 1e-300 Ω load on an ordinary run", () => {
      const d = doc();
      d.loads = [{ id: "weird", point: "far", model: "constantResistance", ohms: 1e-300 }];
      const r = fails(solveSystem(d));
      expect(r.errors[0].code).toBe("ILL_CONDITIONED");
      expect(r.errors[0].ids).toEqual(expect.arrayContaining(["weird"]));
      expect(r.errors[0].case).toBe("Nominal");
    });
  });
});

describe("garbage in: every error is a value, never a throw", () => {
  const garbage: unknown[] = [null, undefined, "a string", "", 42, NaN, true, {}, [], [doc()], { format: "runwright-system/1" }];
  for (const g of garbage) {
    it(`solveSystem(${JSON.stringify(g)?.slice(0, 40) ?? String(g)}) → INVALID_FIELD`, () => {
      let r: SolveResult | undefined;
      expect(() => { r = solveSystem(g); }).not.toThrow();
      const f = fails(r!);
      expect(f.errors.every((e) => e.code === "INVALID_FIELD")).toBe(true);
      expect(f.cautions).toHaveLength(3);
    });
  }

  it("NaN and infinite lengths are INVALID_FIELD at runs[0].length", () => {
    for (const length of [NaN, Infinity, -Infinity]) {
      const d = doc();
      d.runs[0].length = length;
      expect(fails(solveSystem(d)).errors[0]).toMatchObject({ code: "INVALID_FIELD", path: "runs[0].length" });
    }
  });

  it("huge and tiny numbers in every numeric field come back as values", () => {
    const fields: [string, (d: Doc, v: number) => void][] = [
      ["length", (d, v) => { d.runs[0].length = v; }],
      ["voltage", (d, v) => { d.sources[0].voltage = v; }],
      ["internalResistanceOhm", (d, v) => { d.sources[0].internalResistanceOhm = v; }],
      ["nominalVoltage", (d, v) => { d.nominalVoltage = v; }],
      ["amps", (d, v) => { d.loads[0].amps = v; }],
      ["watts", (d, v) => { d.loads[0] = { id: "lamp", point: "far", model: "constantPower", watts: v }; }],
      ["ohms", (d, v) => { d.loads[0] = { id: "lamp", point: "far", model: "constantResistance", ohms: v }; }],
      ["R watts", (d, v) => { d.loads[0] = { id: "lamp", point: "far", model: "constantResistance", watts: v }; }],
      ["loadFactor", (d, v) => { d.cases = [{ name: "x", loadFactor: v }]; }],
      ["parallel", (d, v) => { d.runs[0].parallel = v; }],
      ["fuseA", (d, v) => { d.runs[0].fuseA = v; }],
    ];
    for (const [name, set] of fields) {
      for (const v of [1e308, -1e308, 5e-324, 1e-300, Number.MAX_SAFE_INTEGER, 0, -1]) {
        const d = doc();
        set(d, v);
        let r: SolveResult | undefined;
        expect(() => { r = solveSystem(d); }, `${name} = ${v}`).not.toThrow();
        expect(typeof r!.ok, `${name} = ${v}`).toBe("boolean");
        if (!r!.ok) for (const e of r!.errors) expect(CODES, `${name} = ${v}`).toContain(e.code);
      }
    }
  });

  it("every field of a valid document replaced by a nasty value comes back as a value", () => {
    const nasty: unknown[] = [null, NaN, Infinity, -1, 0, 1e308, "", "x".repeat(500), [], {}, true, [null]];
    const paths: (string | number)[][] = [];
    const walk = (v: unknown, path: (string | number)[]) => {
      if (path.length > 0) paths.push(path);
      if (Array.isArray(v)) v.forEach((x, i) => walk(x, [...path, i]));
      else if (v && typeof v === "object") for (const k of Object.keys(v)) walk((v as Doc)[k], [...path, k]);
    };
    walk(doc(), []);
    expect(paths.length).toBeGreaterThan(20);
    for (const path of paths) {
      for (const value of nasty) {
        const d = doc();
        let at: any = d;
        for (const p of path.slice(0, -1)) at = at[p];
        at[path[path.length - 1]] = value;
        let r: SolveResult | undefined;
        expect(() => { r = solveSystem(d); }, `${path.join(".")} = ${String(value).slice(0, 20)}`).not.toThrow();
        expect(typeof r!.ok).toBe("boolean");
        if (!r!.ok) expect(r!.errors.length).toBeGreaterThan(0);
      }
    }
  });

  it("arbitrary values (fast-check, fixed seed) never throw", () => {
    fc.assert(
      fc.property(fc.anything({ withNullPrototype: true, withBigInt: true, withDate: true, withMap: true, withSet: true }), (x) => {
        const r = solveSystem(x);
        return r.ok === false && r.errors.length > 0 && r.errors.every((e) => CODES.includes(e.code));
      }),
      { numRuns: 300, seed: 20240601 },
    );
  });
});

describe("available fault current", () => {
  it("at a battery bus equals V / R_internal within 0.1 %", () => {
    const d = doc();
    d.sources[0] = { id: "bank", type: "battery", point: "bus", voltage: 12.8, internalResistanceOhm: 0.004 };
    const r = succeeds(solveSystem(d));
    const bus = r.cases[0].points.find((p) => p.id === "bus")!;
    // I_sc = E_B / R_B (REFERENCES.md §8: electrical-riddles.com, electronicsteacher.com)
    expect(rel(bus.faultCurrentA!, 12.8 / 0.004)).toBeLessThan(0.001);
  });

  it("at the far end of a run equals V / (R_int + 2·R_run) within 0.1 %", () => {
    const d = doc(); // 10 m of 16 mm2 class 5 at 20 °C: R_run = 10 · 1.21 mΩ/m (IEC 60228)
    const r = succeeds(solveSystem(d));
    const far = r.cases[0].points.find((p) => p.id === "far")!;
    expect(rel(far.faultCurrentA!, 12 / (0.01 + 2 * 10 * R16_C5))).toBeLessThan(0.001);
  });

  it("at the far end of an imperial AWG run at 75 °C (Table 8 resistance)", () => {
    // 25 ft of 10 AWG copper at 75 °C: 1.24 Ω/kft (NFPA 70 Ch. 9 Table 8, electrical-design-tutor.com)
    const d = doc();
    d.units = "imperial";
    d.conductorTemperatureC = 75;
    d.runs[0] = { id: "r1", from: "bus", to: "far", length: 25, size: "10 AWG" };
    const r = succeeds(solveSystem(d));
    const far = r.cases[0].points.find((p) => p.id === "far")!;
    expect(rel(far.faultCurrentA!, 12 / (0.01 + (2 * 25 * 1.24) / 1000))).toBeLessThan(0.001);
  });

  it("loads do not change it (they are removed for the fault calculation)", () => {
    const d = doc();
    d.loads.push({ id: "heater", point: "far", model: "constantResistance", ohms: 2 }, { id: "fridge", point: "far", model: "constantPower", watts: 60 });
    const r = succeeds(solveSystem(d));
    expect(rel(r.cases[0].points[0].faultCurrentA!, 12 / 0.01)).toBeLessThan(0.001);
    expect(rel(r.cases[0].points[1].faultCurrentA!, 12 / (0.01 + 2 * 10 * R16_C5))).toBeLessThan(0.001);
  });

  it("an ideal source's point gives faultCurrentA null and a FAULT_CURRENT_UNBOUNDED finding", () => {
    const d = doc();
    d.sources[0].internalResistanceOhm = 0;
    const r = succeeds(solveSystem(d));
    expect(r.cases[0].points[0].faultCurrentA).toBeNull();
    const f = findingsOf(r, "FAULT_CURRENT_UNBOUNDED");
    expect(f).toHaveLength(1);
    expect(f[0].ids).toEqual(["bus"]);
    // the far end is still bounded by the two conductors
    expect(rel(r.cases[0].points[1].faultCurrentA!, 12 / (2 * 10 * R16_C5))).toBeLessThan(0.001);
  });

  it("a source with internal resistance gives no FAULT_CURRENT_UNBOUNDED finding", () => {
    expect(findingCodes(succeeds(solveSystem(doc())))).not.toContain("FAULT_CURRENT_UNBOUNDED");
  });
});

describe("drop status: within / near / over", () => {
  // One run from an ideal 12 V supply: drop % = 2·I·R·L / 12 · 100, R from IEC 60228 (16 mm2 class 5).
  // Default profile (NFPA 70 210.19(A) Inf. Note No. 4 / 215.2, quoted by EC&M): 3 % branch, 5 % total,
  // critical 3 %; "near" from 80 % of the limit.
  const ampsFor = (percent: number) => ((percent / 100) * 12) / (2 * 10 * R16_C5);
  const single = (percent: number, extra: Doc = {}, profile?: Doc) => {
    const d = doc();
    d.sources[0].internalResistanceOhm = 0;
    d.loads = [{ id: "lamp", point: "far", model: "constantCurrent", amps: ampsFor(percent), ...extra }];
    if (profile) d.limitProfile = profile;
    return succeeds(solveSystem(d));
  };

  it("the engine's drop % is the independent figure 2·I·R·L/V", () => {
    expect(Math.abs(single(2).cases[0].loads[0].dropPercent - 2)).toBeLessThan(1e-9);
  });

  it.each([
    [1.0, "within"],
    [2.37, "within"], // 79 % of 3 %
    [2.43, "near"], // 81 % of 3 %
    [2.9, "near"],
    [3.05, "over"],
    [6.0, "over"],
  ] as const)("default profile: a branch drop of %s per cent is %s", (percent, status) => {
    const r = single(percent);
    const load = r.cases[0].loads[0];
    expect(load.status).toBe(status);
    expect(load.limitPercent).toBe(3);
    expect(load.governingLimit).toBe("branch");
    expect(r.loads[0].status).toBe(status);
    expect(findingCodes(r).includes("DROP_OVER_LIMIT")).toBe(status === "over");
    expect(findingCodes(r).includes("DROP_NEAR_LIMIT")).toBe(status === "near");
  });

  it("a critical load uses criticalPercent", () => {
    const profile = { criticalPercent: 2 };
    expect(single(1.5, { critical: true }, profile).cases[0].loads[0]).toMatchObject({ status: "within", governingLimit: "critical", limitPercent: 2 });
    expect(single(1.7, { critical: true }, profile).cases[0].loads[0].status).toBe("near"); // 85 % of 2 %
    expect(single(2.1, { critical: true }, profile).cases[0].loads[0].status).toBe("over");
    // the same 2.1 % on a non-critical load is only near the 3 % branch limit
    expect(single(2.5, {}, profile).cases[0].loads[0].status).toBe("near");
  });

  it("a custom limitProfile: ABYC E-11 3 % critical / 10 % non-critical", () => {
    // ABYC E-11 (AC and DC Electrical Systems on Boats): ≤ 3 % for critical circuits, ≤ 10 % for others.
    const abyc = { name: "ABYC E-11", branchPercent: 10, totalPercent: 10, criticalPercent: 3 };
    expect(single(5, {}, abyc).cases[0].loads[0]).toMatchObject({ status: "within", limitPercent: 10 });
    expect(single(8.5, {}, abyc).cases[0].loads[0].status).toBe("near");
    expect(single(10.5, {}, abyc).cases[0].loads[0].status).toBe("over");
    expect(single(2.6, { critical: true }, abyc).cases[0].loads[0]).toMatchObject({ status: "near", limitPercent: 3 });
    expect(single(3.5, { critical: true }, abyc).cases[0].loads[0].status).toBe("over");
    const r = single(5, {}, abyc);
    expect(r.limitProfile).toMatchObject({ name: "ABYC E-11", branchPercent: 10, totalPercent: 10, criticalPercent: 3, nearFraction: 0.8 });
  });

  it("a custom nearFraction moves where near starts", () => {
    const p = { nearFraction: 0.5 };
    expect(single(1.45, {}, p).cases[0].loads[0].status).toBe("within"); // 48 % of 3 %
    expect(single(1.55, {}, p).cases[0].loads[0].status).toBe("near"); // 52 %
  });

  it("behind a feeder, the total limit can govern (5 %) while the branch is well within 3 %", () => {
    // bus —feeder 30 m of 2.5 mm2→ panel —branch 5 m of 16 mm2→ load (IEC 60228 class 5 values)
    const build = (amps: number) => {
      const d = doc();
      d.sources[0].internalResistanceOhm = 0;
      d.points = [{ id: "bus" }, { id: "panel" }, { id: "cabin" }];
      d.runs = [
        { id: "feeder", from: "bus", to: "panel", length: 30, size: "2.5 mm2", kind: "feeder" },
        { id: "branch", from: "panel", to: "cabin", length: 5, size: "16 mm2" },
      ];
      d.loads = [{ id: "lamp", point: "cabin", model: "constantCurrent", amps }];
      return succeeds(solveSystem(d));
    };
    const feederPct = (a: number) => ((2 * a * 30 * R25_C5) / 12) * 100;
    const branchPct = (a: number) => ((2 * a * 5 * R16_C5) / 12) * 100;
    const near = build(1).cases[0].loads[0];
    expect(Math.abs(near.dropPercent - (feederPct(1) + branchPct(1)))).toBeLessThan(1e-9);
    expect(Math.abs(near.branchDropPercent - branchPct(1))).toBeLessThan(1e-9);
    expect(near).toMatchObject({ status: "near", governingLimit: "total", limitPercent: 5 }); // 4.09 % of 5 %
    const over = build(1.3);
    expect(over.cases[0].loads[0]).toMatchObject({ status: "over", governingLimit: "total", limitPercent: 5 }); // 5.32 %
    expect(findingCodes(over)).toContain("DROP_OVER_LIMIT");
  });

  it("minVoltage: under-voltage gives status over and an UNDER_VOLTAGE finding even when the drop is within", () => {
    const under = single(1, { minVoltage: 11.9 }); // 12 − 0.12 = 11.88 V
    expect(under.cases[0].loads[0]).toMatchObject({ status: "over", underVoltage: true });
    expect(findingsOf(under, "UNDER_VOLTAGE").map((f) => f.ids)).toEqual([["lamp"]]);
    expect(findingCodes(under)).not.toContain("DROP_OVER_LIMIT");
    const fine = single(1, { minVoltage: 11.8 });
    expect(fine.cases[0].loads[0]).toMatchObject({ status: "within", underVoltage: false });
    expect(findingCodes(fine)).not.toContain("UNDER_VOLTAGE");
  });
});

describe("fuses and ampacity (imperial, NFPA 70 Table 310.16 2023 and 240.4(D))", () => {
  const withFuse = (size: string, amps: number, fuse: Doc, material = "copper", insulationC = 75) => {
    const d = doc();
    d.units = "imperial";
    d.conductorTemperatureC = 75;
    d.sources[0].internalResistanceOhm = 0;
    d.runs[0] = { id: "r1", from: "bus", to: "far", length: 10, size, material, insulationC, ...fuse };
    d.loads = [{ id: "lamp", point: "far", model: "constantCurrent", amps }];
    return succeeds(solveSystem(d));
  };

  it("FUSE_TOO_SMALL below 125 % of the current (20 A needs ≥ 25 A)", () => {
    expect(findingCodes(withFuse("10 AWG", 20, { fuseA: 24 }))).toContain("FUSE_TOO_SMALL");
    expect(findingCodes(withFuse("10 AWG", 20, { fuseA: 26 }))).not.toContain("FUSE_TOO_SMALL");
    expect(findingsOf(withFuse("10 AWG", 20, { fuseA: 24 }), "FUSE_TOO_SMALL")[0].ids).toEqual(["r1"]);
  });

  it("FUSE_TOO_SMALL: exactly 125 % (a 25 A fuse for a 20 A load) is enough", () => {
    // 1.25 × 20 A = 25 A exactly. The run current comes back as 20.000000000000004 A from the
    // solve, so a comparison without a tolerance flags the textbook-correct fuse (see the report).
    expect(findingCodes(withFuse("10 AWG", 20, { fuseA: 25 }))).not.toContain("FUSE_TOO_SMALL");
  });

  it("FUSE_TOO_LARGE over the ampacity (8 AWG Cu 75 °C = 50 A)", () => {
    expect(findingCodes(withFuse("8 AWG", 10, { fuseA: 60 }))).toContain("FUSE_TOO_LARGE");
    expect(findingCodes(withFuse("8 AWG", 10, { fuseA: 50 }))).not.toContain("FUSE_TOO_LARGE");
    // 8 AWG at 60 °C insulation is 40 A
    expect(findingCodes(withFuse("8 AWG", 10, { fuseA: 50 }, "copper", 60))).toContain("FUSE_TOO_LARGE");
  });

  it.each([
    ["14 AWG", "copper", 15, 20],
    ["12 AWG", "copper", 20, 25],
    ["10 AWG", "copper", 30, 35],
    ["12 AWG", "aluminum", 15, 20],
    ["10 AWG", "aluminum", 25, 30],
  ] as const)("FUSE_TOO_LARGE over the 240.4(D) limit: %s %s allows %s A, not %s A (its 75 °C ampacity)", (size, material, limit, ampacity75) => {
    expect(findingCodes(withFuse(size, 5, { fuseA: limit }, material))).not.toContain("FUSE_TOO_LARGE");
    const r = withFuse(size, 5, { fuseA: ampacity75 }, material);
    expect(r.cases[0].runs[0].ampacityA).toBe(ampacity75);
    expect(findingsOf(r, "FUSE_TOO_LARGE")[0].message).toContain("240.4(D)");
  });

  it("FAULT_OVER_INTERRUPTING when the interrupting rating is below the available fault current", () => {
    // 12.8 V / 2 mΩ = 6400 A at the bus (I_sc = E_B / R_B, REFERENCES.md §8)
    const build = (fuse: Doc, point: Doc = {}) => {
      const d = doc();
      d.sources[0] = { id: "bank", type: "battery", point: "bus", voltage: 12.8, internalResistanceOhm: 0.002 };
      d.points[0] = { id: "bus", ...point };
      d.runs[0] = { ...d.runs[0], size: "16 mm2", ...fuse };
      return succeeds(solveSystem(d));
    };
    const low = build({ fuseA: 80, fuseInterruptingA: 5000 });
    expect(findingsOf(low, "FAULT_OVER_INTERRUPTING").map((f) => f.ids)).toEqual([["r1", "bus"]]);
    expect(findingCodes(build({ fuseA: 80, fuseInterruptingA: 10000 }))).not.toContain("FAULT_OVER_INTERRUPTING");
    // the rating can be given on the point that the fuse protects
    const atPoint = build({ fuseA: 80 }, { fuseInterruptingA: 5000 });
    expect(findingsOf(atPoint, "FAULT_OVER_INTERRUPTING").map((f) => f.ids)).toEqual(expect.arrayContaining([["r1", "bus"], ["bus"]]));
    // without any rating: a warning to enter it
    expect(findingCodes(build({ fuseA: 80 }))).toContain("INTERRUPTING_RATING_MISSING");
    // an unfused run leaving a battery is flagged
    expect(findingCodes(build({}))).toContain("UNFUSED_BATTERY_RUN");
  });

  it("the fault check does not depend on which way a run is drawn (battery at the run's `to` end)", () => {
    // Same bank (12.8 V / 2 mΩ = 6400 A) and fuse as above, but the run is entered from the load
    // point to the battery point. The fuse sits at the battery end either way (see the report).
    const d = doc();
    d.sources[0] = { id: "bank", type: "battery", point: "bus", voltage: 12.8, internalResistanceOhm: 0.002 };
    d.runs[0] = { id: "r1", from: "far", to: "bus", length: 2, size: "16 mm2", fuseA: 80, fuseInterruptingA: 5000 };
    const r = succeeds(solveSystem(d));
    expect(rel(r.cases[0].points[0].faultCurrentA!, 6400)).toBeLessThan(0.001);
    expect(findingCodes(r)).toContain("FAULT_OVER_INTERRUPTING");
    const unfused = doc();
    unfused.runs[0] = { id: "r1", from: "far", to: "bus", length: 2, size: "16 mm2" };
    expect(findingCodes(succeeds(solveSystem(unfused)))).toContain("UNFUSED_BATTERY_RUN");
  });

  it("AMPACITY_EXCEEDED: 12 AWG copper at 60 °C carries 20 A", () => {
    const over = withFuse("12 AWG", 21, {}, "copper", 60);
    expect(over.cases[0].runs[0].ampacityA).toBe(20);
    expect(findingsOf(over, "AMPACITY_EXCEEDED").map((f) => f.ids)).toEqual([["r1"]]);
    expect(findingCodes(withFuse("12 AWG", 19, {}, "copper", 60))).not.toContain("AMPACITY_EXCEEDED");
    expect(over.cases[0].runs[0].utilizationPercent).toBeCloseTo(105, 9);
  });

  it("metric runs get AMPACITY_NOT_CHECKED, not a silent pass", () => {
    const r = succeeds(solveSystem(doc()));
    expect(r.cases[0].runs[0].ampacityA).toBeNull();
    expect(findingsOf(r, "AMPACITY_NOT_CHECKED")[0].ids).toEqual(["r1"]);
  });
});

describe("cautions", () => {
  const check = (r: SolveResult) => {
    expect(Array.isArray(r.cautions)).toBe(true);
    expect(r.cautions).toHaveLength(3);
    for (const c of r.cautions) expect(typeof c).toBe("string");
    expect(r.cautions[0]).toMatch(/fault/i);
    expect(r.cautions[0]).toMatch(/fuse/i);
  };
  it("every result carries the three cautions, the first about fault current and fuses", () => {
    check(solveSystem(doc()));
    check(solveSystem(null));
    check(solveSystem({}));
    const d = doc();
    d.runs[0].size = "17 mm2";
    check(solveSystem(d));
    check(solveSystem(doc(), { caseName: "nope" }));
  });
});
