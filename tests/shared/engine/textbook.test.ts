// The circuit solver against published nodal-analysis worked examples (REFERENCES.md §9).
import { describe, expect, it } from "vitest";
import { solveCircuit, type CircuitElement, type CircuitResult } from "../../../shared/engine/circuit.js";

function solved(r: CircuitResult) {
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r;
}
const idx = (els: CircuitElement[], id: string) => els.findIndex((e) => e.id === id);

describe("Lessons in Electric Circuits, Vol. I (DC), ch. 10 \"Node voltage method\", first example", () => {
  // Open textbook (Design Science License), repo svenstucki/lessons_in_electric_circuits, DC/dcnet.sml.
  // The book's netlist: V1 11 0 DC 10; V2 22 0 DC -4; r1 11 1 2; r2 1 0 4; r3 1 2 2.5; r4 2 0 5; r5 2 22 1.
  // Printed: v(1) = 3.809524e+00, v(2) = -1.547619e+00.
  // Our node numbers: 0 = reference, 1 = book node 1, 2 = book node 2, 3 = book node 11, 4 = book node 22.
  const resistors: CircuitElement[] = [
    { kind: "resistor", id: "R2", a: 1, b: 0, ohms: 4 },
    { kind: "resistor", id: "R3", a: 1, b: 2, ohms: 2.5 },
    { kind: "resistor", id: "R4", a: 2, b: 0, ohms: 5 },
  ];

  it("with the book's ideal voltage sources: V(1) = 3.809524 V, V(2) = −1.547619 V", () => {
    const r = solved(solveCircuit({
      nodeCount: 5,
      elements: [
        { kind: "voltageSource", id: "V1", plus: 3, minus: 0, volts: 10 },
        { kind: "voltageSource", id: "V2", plus: 4, minus: 0, volts: -4 },
        { kind: "resistor", id: "R1", a: 3, b: 1, ohms: 2 },
        ...resistors,
        { kind: "resistor", id: "R5", a: 2, b: 4, ohms: 1 },
      ],
    }));
    expect(r.voltages[1]).toBeCloseTo(3.809524, 6);
    expect(r.voltages[2]).toBeCloseTo(-1.547619, 6);
    expect(r.voltages[3]).toBe(10);
    expect(r.voltages[4]).toBe(-4);
  });

  it("the same network with each source and its series resistor as one Norton source (10 V / 2 Ω, −4 V / 1 Ω)", () => {
    // The book's own step: Norton equivalents 10/2 = 5 A and 4/1 = 4 A, G = [[1.15, −0.4], [−0.4, 1.6]], I = [5, −4].
    const elements: CircuitElement[] = [
      { kind: "voltageSource", id: "V1", plus: 1, minus: 0, volts: 10, seriesOhms: 2 },
      { kind: "voltageSource", id: "V2", plus: 2, minus: 0, volts: -4, seriesOhms: 1 },
      ...resistors,
    ];
    const r = solved(solveCircuit({ nodeCount: 3, elements }));
    expect(r.voltages[1]).toBeCloseTo(3.809524, 6);
    expect(r.voltages[2]).toBeCloseTo(-1.547619, 6);
  });

  it("the same network with the book's current sources (5 A into node 1, 4 A out of node 2) and G", () => {
    const r = solved(solveCircuit({
      nodeCount: 3,
      elements: [
        { kind: "currentSource", id: "I1", from: 0, to: 1, amps: 5 },
        { kind: "resistor", id: "G1", a: 1, b: 0, ohms: 2 },
        { kind: "currentSource", id: "I2", from: 2, to: 0, amps: 4 },
        { kind: "resistor", id: "G5", a: 2, b: 0, ohms: 1 },
        ...resistors,
      ],
    }));
    expect(r.voltages[1]).toBeCloseTo(3.809524, 6);
    expect(r.voltages[2]).toBeCloseTo(-1.547619, 6);
    // G·V = I with the book's G matrix
    expect(1.15 * r.voltages[1] - 0.4 * r.voltages[2]).toBeCloseTo(5, 12);
    expect(-0.4 * r.voltages[1] + 1.6 * r.voltages[2]).toBeCloseTo(-4, 12);
  });
});

describe("Lessons in Electric Circuits, Vol. I, ch. 10 \"Branch current method\" (one battery charging another)", () => {
  // Same book and file. B1 1(+)–0 28 V, B2 3(+)–0 7 V, R1 1–2 4 Ω, R2 2–0 2 Ω, R3 2–3 1 Ω.
  // Printed: V(2) = 8 V, V(1,2) = 20 V, V(2,3) = 1 V; I_R1 = 5 A, I_R2 = 4 A, I_R3 = 1 A into B2's + terminal.
  const els: CircuitElement[] = [
    { kind: "voltageSource", id: "B1", plus: 1, minus: 0, volts: 28 },
    { kind: "voltageSource", id: "B2", plus: 3, minus: 0, volts: 7 },
    { kind: "resistor", id: "R1", a: 1, b: 2, ohms: 4 },
    { kind: "resistor", id: "R2", a: 2, b: 0, ohms: 2 },
    { kind: "resistor", id: "R3", a: 2, b: 3, ohms: 1 },
  ];

  it("V(2) = 8 V, I_R1 = 5 A, I_R2 = 4 A, I_R3 = 1 A; B2 delivers −1 A (it is charged)", () => {
    const r = solved(solveCircuit({ nodeCount: 4, elements: els }));
    expect(r.voltages[2]).toBeCloseTo(8, 12);
    expect(r.voltages[1] - r.voltages[2]).toBeCloseTo(20, 12);
    expect(r.voltages[2] - r.voltages[3]).toBeCloseTo(1, 12);
    expect(r.currents[idx(els, "R1")]).toBeCloseTo(5, 12);
    expect(r.currents[idx(els, "R2")]).toBeCloseTo(4, 12);
    expect(r.currents[idx(els, "R3")]).toBeCloseTo(1, 12);
    // source currents are out of + into the circuit
    expect(r.currents[idx(els, "B1")]).toBeCloseTo(5, 12);
    expect(r.currents[idx(els, "B2")]).toBeCloseTo(-1, 12);
  });

  it("the same with B1+R1 and B2+R3 as Norton sources (28 V / 4 Ω, 7 V / 1 Ω) on node 2", () => {
    const nortons: CircuitElement[] = [
      { kind: "voltageSource", id: "B1", plus: 1, minus: 0, volts: 28, seriesOhms: 4 },
      { kind: "voltageSource", id: "B2", plus: 1, minus: 0, volts: 7, seriesOhms: 1 },
      { kind: "resistor", id: "R2", a: 1, b: 0, ohms: 2 },
    ];
    const r = solved(solveCircuit({ nodeCount: 2, elements: nortons }));
    expect(r.voltages[1]).toBeCloseTo(8, 12);
    expect(r.currents[0]).toBeCloseTo(5, 12); // through R1's place
    expect(r.currents[1]).toBeCloseTo(-1, 12); // 1 A into B2's + terminal
    expect(r.currents[2]).toBeCloseTo(4, 12);
  });
});

describe("Circuit Analysis (open textbook, circuit-analysis.github.io), ch. 8 \"Nodal Analysis\"", () => {
  // Repo Circuit-Analysis/circuit-analysis.github.io, chapter-8.md.
  it("(a) \"Our First Toy Problem\": V_A = 26.4 V, V_B = 14.4 V, V_C = 4.8 V, I_O = 3.6 A", () => {
    // 6 A from ground into A; R1 2 Ω A–B, R2 4 Ω B–ground, R3 4 Ω B–C, R4 2 Ω C–ground. Nodes A=1, B=2, C=3.
    const els: CircuitElement[] = [
      { kind: "currentSource", id: "IS", from: 0, to: 1, amps: 6 },
      { kind: "resistor", id: "R1", a: 1, b: 2, ohms: 2 },
      { kind: "resistor", id: "R2", a: 2, b: 0, ohms: 4 },
      { kind: "resistor", id: "R3", a: 2, b: 3, ohms: 4 },
      { kind: "resistor", id: "R4", a: 3, b: 0, ohms: 2 },
    ];
    const r = solved(solveCircuit({ nodeCount: 4, elements: els }));
    expect(r.voltages[1]).toBeCloseTo(26.4, 10);
    expect(r.voltages[2]).toBeCloseTo(14.4, 10);
    expect(r.voltages[3]).toBeCloseTo(4.8, 10);
    expect(r.currents[idx(els, "R2")]).toBeCloseTo(3.6, 10);
    expect(r.currents[idx(els, "IS")]).toBe(6);
  });

  // (b) I_S1 = 2 mA from ground into A; R1 4 kΩ A–B, R2 2 kΩ B–ground, R3 4 kΩ B–C; I_S2 = 6 mA out of C
  // to ground. Printed: V_A = 0, V_B = −8 V, V_C = −32 V, V_O = V_B − V_C = 24 V. Nodes A=1, B=2, C=3.
  const exampleB = (kOhm: number, mA: number): CircuitElement[] => [
    { kind: "currentSource", id: "IS1", from: 0, to: 1, amps: 2 * mA },
    { kind: "resistor", id: "R1", a: 1, b: 2, ohms: 4 * kOhm },
    { kind: "resistor", id: "R2", a: 2, b: 0, ohms: 2 * kOhm },
    { kind: "resistor", id: "R3", a: 2, b: 3, ohms: 4 * kOhm },
    { kind: "currentSource", id: "IS2", from: 3, to: 0, amps: 6 * mA },
  ];

  it("(b) in kΩ and mA (product in V): V_A = 0, V_B = −8, V_C = −32, V_O = 24", () => {
    const r = solved(solveCircuit({ nodeCount: 4, elements: exampleB(1, 1) }));
    expect(r.voltages[1]).toBeCloseTo(0, 10);
    expect(r.voltages[2]).toBeCloseTo(-8, 10);
    expect(r.voltages[3]).toBeCloseTo(-32, 10);
    expect(r.voltages[2] - r.voltages[3]).toBeCloseTo(24, 10);
  });

  it("(b) in Ω and A (4000 Ω, 0.002 A …) gives the same volts", () => {
    const r = solved(solveCircuit({ nodeCount: 4, elements: exampleB(1000, 0.001) }));
    expect(r.voltages[1]).toBeCloseTo(0, 9);
    expect(r.voltages[2]).toBeCloseTo(-8, 9);
    expect(r.voltages[3]).toBeCloseTo(-32, 9);
    // R1 carries the 2 mA of I_S1 from A to B; R2 carries −4 mA from B to ground
    expect(r.currents[1]).toBeCloseTo(0.002, 12);
    expect(r.currents[2]).toBeCloseTo(-0.004, 12);
    expect(r.currents[3]).toBeCloseTo(0.006, 12);
  });
});

describe("a voltage source with seriesOhms is its Norton equivalent", () => {
  it("shorted, 10 V behind 2 Ω delivers the Norton current 10/2 = 5 A", () => {
    // The Lessons in Electric Circuits example's own conversion (V1 = 10 V, R1 = 2 Ω → 5 A).
    const r = solved(solveCircuit({
      nodeCount: 2,
      elements: [
        { kind: "voltageSource", id: "V", plus: 1, minus: 0, volts: 10, seriesOhms: 2 },
        { kind: "resistor", id: "short", a: 1, b: 0, ohms: 0 },
      ],
    }));
    expect(r.voltages[1]).toBe(0);
    expect(r.currents[0]).toBeCloseTo(5, 12);
    expect(r.currents[1]).toBeCloseTo(5, 12);
  });

  it("into any load it matches a 5 A current source in parallel with 2 Ω", () => {
    for (const load of [0.5, 2, 3, 100]) {
      const thevenin = solved(solveCircuit({
        nodeCount: 2,
        elements: [
          { kind: "voltageSource", id: "V", plus: 1, minus: 0, volts: 10, seriesOhms: 2 },
          { kind: "resistor", id: "RL", a: 1, b: 0, ohms: load },
        ],
      }));
      const norton = solved(solveCircuit({
        nodeCount: 2,
        elements: [
          { kind: "currentSource", id: "I", from: 0, to: 1, amps: 5 },
          { kind: "resistor", id: "RN", a: 1, b: 0, ohms: 2 },
          { kind: "resistor", id: "RL", a: 1, b: 0, ohms: load },
        ],
      }));
      // V = 10·RL/(2 + RL) by the divider
      expect(thevenin.voltages[1]).toBeCloseTo((10 * load) / (2 + load), 12);
      expect(norton.voltages[1]).toBeCloseTo(thevenin.voltages[1], 12);
      expect(thevenin.currents[1]).toBeCloseTo(norton.currents[2], 12);
    }
  });
});
