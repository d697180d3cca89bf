// A single run against the US handbook voltage-drop formula VD = 2·K·I·L / CM (REFERENCES.md §4):
// formula from piping-designer.com ("Voltage Drop", single-phase VD = 2KIL/cmil), K = R × CM / 1000
// from electricianmath.com, and worked examples A and A′ from the trade-license exam prep lesson
// "Voltage Drop & Ohm's Law" (tradelicenseprep.com, nc-sp-ph-prep/calc-voltage-drop):
// 120 V, 20 A, 100 ft one way, K = 12.9; 12 AWG (6,530 cmil) → 7.9 V, 6.6 %; 8 AWG (16,510 cmil) → 3.1 V, 2.6 %.
import { describe, expect, it } from "vitest";
import { solveSystem, type SolveSuccess } from "../../../shared/engine/system.js";

function system(size: string) {
  return {
    format: "runwright-system/1",
    units: "imperial",
    nominalVoltage: 120,
    conductorTemperatureC: 75,
    points: [{ id: "panel" }, { id: "outlet" }],
    sources: [{ id: "utility", type: "supply", point: "panel", voltage: 120, internalResistanceOhm: 0 }],
    runs: [{ id: "branch", from: "panel", to: "outlet", length: 100, size, material: "copper" }],
    loads: [{ id: "heater", point: "outlet", model: "constantCurrent", amps: 20 }],
  };
}

function solve(size: string): SolveSuccess {
  const r = solveSystem(system(size));
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r;
}

const within = (actual: number, expected: number, rel: number) =>
  expect(Math.abs(actual - expected) / Math.abs(expected)).toBeLessThanOrEqual(rel);

describe("handbook formula VD = 2·K·I·L / CM (tradelicenseprep.com worked examples A and A′)", () => {
  it("A: 12 AWG copper, 20 A, 100 ft → 7.9 V and 6.6 % (within 2 %)", () => {
    const r = solve("12 AWG");
    const run = r.cases[0].runs[0];
    const load = r.cases[0].loads[0];
    within(run.dropV, 7.9, 0.02);
    within(load.dropPercent, 6.6, 0.02);
    // and against the exact arithmetic of the handbook form: 2·12.9·20·100/6530 = 7.902 V, 6.585 %
    within(run.dropV, (2 * 12.9 * 20 * 100) / 6530, 0.02);
    within(load.dropPercent, ((2 * 12.9 * 20 * 100) / 6530 / 120) * 100, 0.02);
    // 6.6 % is "too high" in the lesson: over the 3 % branch recommendation (REFERENCES.md §5)
    expect(load.status).toBe("over");
  });

  it("A′: 8 AWG copper, same load → 3.1 V and 2.6 % (within 2 %)", () => {
    const r = solve("8 AWG");
    const run = r.cases[0].runs[0];
    const load = r.cases[0].loads[0];
    within(run.dropV, 3.1, 0.02);
    within(load.dropPercent, 2.6, 0.02);
    within(run.dropV, (2 * 12.9 * 20 * 100) / 16510, 0.02);
    // 2.6 % of a 3 % limit is 87 %: "near" under the default 80 % near threshold
    expect(load.status).toBe("near");
  });

  // Without K: VD = 2·L·(R_Ω/kft / 1000)·I, R from NFPA 70 Chapter 9 Table 8 at 75 °C as reproduced at
  // electrical-design-tutor.com (12 AWG Cu 1.98 Ω/kft, 8 AWG Cu 0.778 Ω/kft).
  for (const [size, ohmPerKft] of [["12 AWG", 1.98], ["8 AWG", 0.778]] as const) {
    it(`${size}: the engine's dropV equals 2·I·L·R/1000 from Table 8 (${ohmPerKft} Ω/kft) to 1e-9`, () => {
      const r = solve(size);
      const run = r.cases[0].runs[0];
      const expected = (2 * 20 * 100 * ohmPerKft) / 1000;
      expect(Math.abs(run.dropV - expected) / expected).toBeLessThanOrEqual(1e-9);
      // each conductor: 100 ft of Table 8 resistance
      expect(Math.abs(run.resistanceOhm - (100 * ohmPerKft) / 1000) / ((100 * ohmPerKft) / 1000)).toBeLessThanOrEqual(1e-9);
      expect(Math.abs(run.returnResistanceOhm - run.resistanceOhm)).toBeLessThanOrEqual(1e-15);
      // the current is the load's 20 A, out on + and back on −
      expect(run.current).toBeCloseTo(20, 9);
      expect(run.returnCurrent).toBeCloseTo(20, 9);
      // the load sees 120 V minus the drop, and drop % is of the 120 V nominal
      const load = r.cases[0].loads[0];
      expect(Math.abs(load.voltage - (120 - expected))).toBeLessThanOrEqual(1e-9 * 120);
      expect(Math.abs(load.dropPercent - (expected / 120) * 100)).toBeLessThanOrEqual(1e-9 * 100);
      // the loss is I²R in both conductors
      expect(Math.abs(run.lossW - 20 * expected) / (20 * expected)).toBeLessThanOrEqual(1e-9);
    });
  }

  it("the run's ampacity is the 75 °C column of Table 310.16 (12 AWG 25 A, 8 AWG 50 A)", () => {
    // NFPA 70 Table 310.16 (a published reproduction; 75 °C column confirmed at passyourelectricianexam.com)
    expect(solve("12 AWG").cases[0].runs[0].ampacityA).toBe(25);
    expect(solve("8 AWG").cases[0].runs[0].ampacityA).toBe(50);
    expect(solve("8 AWG").cases[0].runs[0].utilizationPercent).toBeCloseTo(40, 9);
  });
});
