// The conductor library against the published tables in /work/shared/REFERENCES.md.
// Every expected figure below is typed in from REFERENCES.md (not read from the library's
// RAW_TABLES); the source of each table is named beside it.
import { describe, expect, it } from "vitest";
import {
  ALL_SIZES,
  ampacity,
  conductorResistance,
  normalizeSize,
  sizeInfo,
  smallConductorFuseLimit,
  tableOhmPerKm,
  temperatureFactor,
  type InsulationC,
  type Material,
} from "../../../shared/engine/conductors.js";

const FT = 0.3048; // m per ft (exact, by definition of the international foot)
/** Relative closeness; the library stores Ω/kft and divides by 0.3048, so allow the last bit. */
const expectRel = (actual: number, expected: number, rel = 1e-12) =>
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(rel * Math.abs(expected));

// NFPA 70 (NEC) Chapter 9 Table 8, DC resistance of stranded uncoated conductors at 75 °C, Ω/kft,
// as reproduced at electrical-design-tutor.com ("Conductor Resistance (from NEC 2011 Chapter 9,
// Table 8)"); 16 AWG Cu 4.99 also confirmed at electrician2.com. Aluminium 18–14 AWG are the
// parenthesised Table 8 values. The circular-mil areas are [M] (from memory, REFERENCES.md §1).
// [label, area cmil [M], Cu Ω/kft, Al Ω/kft, Cu Ω/km [D], Al Ω/km [D] or null, K Cu [D], K Al [D] or null]
const TABLE8: ReadonlyArray<readonly [string, number, number, number, number, number | null, number, number | null]> = [
  ["18 AWG", 1620, 7.95, 13.1, 26.1, null, 12.9, null],
  ["16 AWG", 2580, 4.99, 8.21, 16.4, null, 12.9, null],
  ["14 AWG", 4110, 3.14, 5.17, 10.3, null, 12.9, null],
  ["12 AWG", 6530, 1.98, 3.25, 6.50, 10.7, 12.9, 21.2],
  ["10 AWG", 10380, 1.24, 2.04, 4.07, 6.69, 12.9, 21.2],
  ["8 AWG", 16510, 0.778, 1.28, 2.55, 4.20, 12.8, 21.1],
  ["6 AWG", 26240, 0.491, 0.808, 1.61, 2.65, 12.9, 21.2],
  ["4 AWG", 41740, 0.308, 0.508, 1.01, 1.67, 12.9, 21.2],
  ["3 AWG", 52620, 0.245, 0.403, 0.804, 1.32, 12.9, 21.2],
  ["2 AWG", 66360, 0.194, 0.319, 0.636, 1.05, 12.9, 21.2],
  ["1 AWG", 83690, 0.154, 0.253, 0.505, 0.830, 12.9, 21.2],
  ["1/0 AWG", 105600, 0.122, 0.201, 0.400, 0.659, 12.9, 21.2],
  ["2/0 AWG", 133100, 0.0967, 0.159, 0.317, 0.522, 12.9, 21.2],
  ["3/0 AWG", 167800, 0.0766, 0.126, 0.251, 0.413, 12.9, 21.1],
  ["4/0 AWG", 211600, 0.0608, 0.100, 0.199, 0.328, 12.9, 21.2],
  ["250 kcmil", 250000, 0.0515, 0.0847, 0.169, 0.278, 12.9, 21.2],
  ["350 kcmil", 350000, 0.0367, 0.0605, 0.120, 0.198, 12.8, 21.2],
  ["500 kcmil", 500000, 0.0258, 0.0424, 0.0846, 0.139, 12.9, 21.2],
];

// IEC 60228:2004, maximum DC resistance of plain copper at 20 °C, Ω/km, class 2 (stranded) and
// class 5 (flexible), as cross-checked on etechnik-synergie.com (DIN VDE 0295 / IEC 60228 / HD 383)
// and mycableengineering.com ("IEC 60228 DC resistance"). Table numbers (2 and 3) are [M].
const IEC60228: ReadonlyArray<readonly [number, number, number]> = [
  [0.5, 36.0, 39.0],
  [0.75, 24.5, 26.0],
  [1, 18.1, 19.5],
  [1.5, 12.1, 13.3],
  [2.5, 7.41, 7.98],
  [4, 4.61, 4.95],
  [6, 3.08, 3.30],
  [10, 1.83, 1.91],
  [16, 1.15, 1.21],
  [25, 0.727, 0.780],
  [35, 0.524, 0.554],
  [50, 0.387, 0.386],
  [70, 0.268, 0.272],
  [95, 0.193, 0.206],
  [120, 0.153, 0.161],
];

/** Rounds to n significant figures (REFERENCES.md §1: do not assert more than 3 for Ω/km). */
const sig = (v: number, n: number) => Number(v.toPrecision(n));

describe("NFPA 70 Chapter 9 Table 8 (75 °C, stranded), as reproduced at electrical-design-tutor.com", () => {
  for (const [label, , cu, al] of TABLE8) {
    for (const [material, perKft] of [["copper", cu], ["aluminum", al]] as const) {
      it(`${label} ${material}: ${perKft} Ω/kft at 75 °C`, () => {
        const t = tableOhmPerKm(label, material);
        expect(t).toBeDefined();
        expect(t!.referenceC).toBe(75);
        expect(t!.source).toMatch(/Table 8/);
        expectRel(t!.ohmPerKm * FT, perKft);
        // At its reference temperature conductorResistance gives the table value itself.
        const r = conductorResistance(label, material, 75);
        expect(r!.basis).toBe("table");
        expectRel(r!.ohmPerMetre * 1000 * FT, perKft);
      });
    }
  }

  it("the Ω/km column of REFERENCES.md [D] = Ω/kft / 0.3048, to 3 significant figures", () => {
    for (const [label, , , , cuKm, alKm] of TABLE8) {
      expect(sig(tableOhmPerKm(label, "copper")!.ohmPerKm, 3), label).toBe(cuKm);
      if (alKm !== null) expect(sig(tableOhmPerKm(label, "aluminum")!.ohmPerKm, 3), label).toBe(alKm);
    }
  });
});

describe("IEC 60228:2004 max DC resistance at 20 °C (etechnik-synergie.com, mycableengineering.com)", () => {
  for (const [mm2, c2, c5] of IEC60228) {
    it(`${mm2} mm2 copper: class 2 ${c2} Ω/km, class 5 ${c5} Ω/km`, () => {
      const t2 = tableOhmPerKm(`${mm2} mm2`, "copper", "class2");
      const t5 = tableOhmPerKm(`${mm2} mm2`, "copper", "class5");
      expect(t2!.ohmPerKm).toBe(c2);
      expect(t5!.ohmPerKm).toBe(c5);
      expect(t2!.referenceC).toBe(20);
      expect(t5!.referenceC).toBe(20);
      // class 5 is the default stranding
      expect(tableOhmPerKm(`${mm2} mm2`, "copper")!.ohmPerKm).toBe(c5);
      // conductorResistance at 20 °C is the table value, Ω/m
      expectRel(conductorResistance(`${mm2} mm2`, "copper", 20, "class2")!.ohmPerMetre, c2 / 1000);
      expectRel(conductorResistance(`${mm2} mm2`, "copper", 20, "class5")!.ohmPerMetre, c5 / 1000);
    });
  }

  it("50 mm2: the class 5 limit (0.386) is lower than class 2 (0.387), as in the standard", () => {
    const c2 = tableOhmPerKm("50 mm2", "copper", "class2")!.ohmPerKm;
    const c5 = tableOhmPerKm("50 mm2", "copper", "class5")!.ohmPerKm;
    expect(c2).toBe(0.387);
    expect(c5).toBe(0.386);
    expect(c5).toBeLessThan(c2);
  });

  it("IEC 60228 is a copper table: metric aluminium has no table value", () => {
    expect(tableOhmPerKm("16 mm2", "aluminum")).toBeUndefined();
    expect(conductorResistance("16 mm2", "aluminum", 20)!.basis).toBe("resistivity");
  });
});

describe("temperature correction R_T = R_20·[1 + α20·(T − 20)]", () => {
  // α20 Cu 0.00393, Al 0.00403: K.C. Agrawal, Industrial Power Engineering and Applications
  // Handbook, p. 970 (also IEC 60287-1-1 Table 1). R75/R20 (Cu) = 1.2162 is [D] in REFERENCES.md §3.
  it("copper R75/R20 = 1 + 0.00393·55 = 1.21615, i.e. 1.2162 to 4 decimals", () => {
    const f = temperatureFactor("copper", 20, 75);
    expectRel(f, 1 + 0.00393 * 55);
    expect(Math.abs(f - 1.2162)).toBeLessThanOrEqual(0.00005 + 1e-12);
  });

  it("aluminium R75/R20 = 1 + 0.00403·55 = 1.22165", () => {
    expectRel(temperatureFactor("aluminum", 20, 75), 1 + 0.00403 * 55);
  });

  it("the correction is a ratio of the linear form from any reference temperature", () => {
    expectRel(temperatureFactor("copper", 75, 20), 1 / (1 + 0.00393 * 55));
    expectRel(temperatureFactor("aluminum", 75, 90), (1 + 0.00403 * 70) / (1 + 0.00403 * 55));
    expect(temperatureFactor("copper", 40, 40)).toBe(1);
    // Table 8 from 75 °C to 20 °C through conductorResistance
    expectRel(conductorResistance("12 AWG", "copper", 20)!.ohmPerMetre * 1000 * FT, 1.98 / (1 + 0.00393 * 55));
  });

  it("agrees with the Table 8 note coefficients α75 = 0.00323 Cu / 0.00330 Al [M] (REFERENCES.md §1)", () => {
    // [D]: 0.00393/(1 + 0.00393·55) = 0.003232 and 0.00403/(1 + 0.00403·55) = 0.003299
    expect(temperatureFactor("copper", 75, 76) - 1).toBeCloseTo(0.00323, 5);
    expect(temperatureFactor("aluminum", 75, 76) - 1).toBeCloseTo(0.0033, 5);
  });

  it("the inferred-zero form (234.5 + T)/254.5 for Cu [M] is within 0.01 % of the linear form at 75 °C", () => {
    const inferred = (234.5 + 75) / 254.5;
    expect(Math.abs(temperatureFactor("copper", 20, 75) / inferred - 1)).toBeLessThan(1e-4);
  });
});

describe("tables against R = ρ·L/A (ρ_Cu = 1/58 Ω·mm²/m, IEC 60028 via tnlab.org)", () => {
  // Why they differ: a stranded conductor's wires are laid up in helices, so each wire is longer
  // than the cable (lay-length allowance, more for the many fine wires of class 5), and the
  // standards' figures are *maximum* resistances with a manufacturing allowance, not nominal
  // values. So the table value is at or above the computed one, and within a few per cent for
  // stranded (class 2 and Table 8) conductors.
  const RHO_CU = 1 / 58; // Ω·mm²/m at 20 °C
  const MM2_PER_CMIL = 5.067e-4; // REFERENCES.md brief figure: 1 cmil = 5.067e-4 mm²
  const CU_20_TO_75 = 1 + 0.00393 * 55;

  // The brief asked for 8 % on every metric size. That holds for class 2 except 50 mm2 (+12.2 %)
  // and 70 mm2 (+8.8 %), and for no class 5 size (+10.8 … +15.7 %): IEC 60228 fixes the maximum
  // resistance and treats the "nominal" cross-section as a designation, so a 50 mm2 conductor may
  // be smaller than 50 mm2. Those exceptions are pinned below rather than hidden by a wider bound.
  const CLASS2_OVER_8 = new Set([50, 70]);

  it("IEC 60228 class 2: within 8 % of ρ/A (and not below it) for every size except 50 and 70 mm2", () => {
    for (const [mm2, c2] of IEC60228) {
      const computed = (RHO_CU / mm2) * 1000; // Ω/km
      expect(c2 / computed, `${mm2} mm2`).toBeGreaterThanOrEqual(1);
      const dev = c2 / computed - 1;
      if (CLASS2_OVER_8.has(mm2)) expect(dev, `${mm2} mm2`).toBeGreaterThan(0.08);
      else expect(dev, `${mm2} mm2`).toBeLessThanOrEqual(0.08);
      // the library's own class 2 value gives the same deviation
      const lib = tableOhmPerKm(`${mm2} mm2`, "copper", "class2")!.ohmPerKm;
      expectRel(lib / computed - 1, dev, 1e-9);
    }
  });

  it("IEC 60228 class 2 at 50 and 70 mm2: 12.2 % and 8.8 % above ρ/A (pinned)", () => {
    expect((0.387 / ((RHO_CU / 50) * 1000) - 1) * 100).toBeCloseTo(12.23, 2);
    expect((0.268 / ((RHO_CU / 70) * 1000) - 1) * 100).toBeCloseTo(8.81, 2);
  });

  it("IEC 60228 class 5 (fine flexible wires): 10–16 % above ρ/A, and above class 2 except at 50 mm2", () => {
    for (const [mm2, c2, c5] of IEC60228) {
      const computed = (RHO_CU / mm2) * 1000;
      expect(c5 / computed - 1, `${mm2} mm2`).toBeGreaterThan(0.10);
      expect(c5 / computed - 1, `${mm2} mm2`).toBeLessThan(0.16);
      if (mm2 !== 50) expect(c5, `${mm2} mm2`).toBeGreaterThan(c2);
    }
  });

  it("Table 8 copper, converted from 75 °C to 20 °C, is within 8 % of ρ/A for every AWG/kcmil size", () => {
    for (const [label, cmil, cuKft] of TABLE8) {
      const areaMm2 = cmil * MM2_PER_CMIL;
      const computedKm = (RHO_CU / areaMm2) * 1000;
      const table20Km = cuKft / FT / CU_20_TO_75;
      expect(Math.abs(table20Km / computedKm - 1), label).toBeLessThanOrEqual(0.08);
      expect(table20Km / computedKm, label).toBeGreaterThanOrEqual(1);
    }
  });

  it("the library's AWG areas match the cmil figures (1 cmil = 5.067e-4 mm²)", () => {
    for (const [label, cmil] of TABLE8) {
      const info = sizeInfo(label)!;
      expect(info.family).toBe("awg");
      expect(info.areaCmil).toBe(cmil);
      expect(Math.abs(info.areaMm2 / (cmil * MM2_PER_CMIL) - 1), label).toBeLessThan(1e-4);
    }
  });
});

describe("AWG diameter formula (ASTM B258): d = 0.127 mm × 92^((36 − n)/39)", () => {
  // Wikipedia "American wire gauge – Formula" (mirror liquisearch.com), ASTM B 258-02.
  // n = −1, −2, −3 for 2/0, 3/0, 4/0 (n = 1 − m for m/0); area in cmil = (d in mils)².
  const gauge = (label: string) => {
    const m = /^(\d)\/0 AWG$/.exec(label);
    return m ? 1 - Number(m[1]) : Number(label.split(" ")[0]);
  };
  const dMils = (n: number) => 5 * 92 ** ((36 - n) / 39);
  const dMm = (n: number) => 0.127 * 92 ** ((36 - n) / 39);

  it("reproduces REFERENCES.md's check values [D]", () => {
    expect(dMm(12)).toBeCloseTo(2.0525, 4);
    expect(dMils(12)).toBeCloseTo(80.81, 2);
    expect(Math.round(dMils(12) ** 2 / 10) * 10).toBe(6530);
    expect((Math.PI / 4) * dMm(12) ** 2).toBeCloseTo(3.309, 3);
    expect(dMm(10)).toBeCloseTo(2.5882, 4);
    expect((Math.PI / 4) * dMm(10) ** 2).toBeCloseTo(5.261, 3);
    expect(dMm(-3)).toBeCloseTo(11.684, 3);
    expect(dMils(-3) ** 2).toBeCloseTo(211600, 0);
    expect((Math.PI / 4) * dMm(-3) ** 2).toBeCloseTo(107.2, 1);
  });

  it("the library's circular-mil areas ([M]) agree with the formula within 2 % for 18 AWG … 4/0", () => {
    const labels = ["18 AWG", "16 AWG", "14 AWG", "12 AWG", "10 AWG", "8 AWG", "6 AWG", "4 AWG", "3 AWG", "2 AWG", "1 AWG", "1/0 AWG", "2/0 AWG", "3/0 AWG", "4/0 AWG"];
    for (const label of labels) {
      const area = sizeInfo(label)!.areaCmil!;
      expect(Math.abs(area / dMils(gauge(label)) ** 2 - 1), label).toBeLessThanOrEqual(0.02);
    }
  });

  it("solid-wire areas of Lessons in Electric Circuits Vol. V (copper wire gage table) within 0.1 % of the formula", () => {
    // 14 AWG 4,107; 12 AWG 6,530; 6 AWG 26,250; 1/0 105,500 cmil [S]
    for (const [n, cmil] of [[14, 4107], [12, 6530], [6, 26250], [0, 105500]] as const) {
      expect(Math.abs(dMils(n) ** 2 / cmil - 1), `${n} AWG`).toBeLessThan(0.001);
    }
  });
});

describe("K constant = R(Ω/kft) × cmil / 1000 (method of electricianmath.com)", () => {
  // Cu ≈ 12.9 (12.8–12.9) and Al ≈ 21.2 (21.1–21.2) for every Table 8 row; run over the library's
  // rows, so this also checks the [M] 300 and 400 kcmil rows, which REFERENCES.md does not list.
  const awg = ALL_SIZES.filter((s) => sizeInfo(s)!.family === "awg");
  const k = (label: string, material: Material) => (tableOhmPerKm(label, material)!.ohmPerKm * FT * sizeInfo(label)!.areaCmil!) / 1000;

  it("covers 18 AWG … 500 kcmil including 300 and 400 kcmil", () => {
    expect(awg).toContain("300 kcmil");
    expect(awg).toContain("400 kcmil");
    expect(awg.length).toBe(20);
  });

  it("copper K rounds to 12.8 or 12.9 for every row", () => {
    for (const s of awg) {
      const v = k(s, "copper");
      expect(v, s).toBeGreaterThanOrEqual(12.75);
      expect(v, s).toBeLessThan(12.95);
    }
  });

  it("aluminium K rounds to 21.1 or 21.2 for every row", () => {
    for (const s of awg) {
      const v = k(s, "aluminum");
      expect(v, s).toBeGreaterThanOrEqual(21.05);
      expect(v, s).toBeLessThan(21.25);
    }
  });

  it("matches the K columns of REFERENCES.md row by row (to 0.1)", () => {
    for (const [label, , , , , , kCu, kAl] of TABLE8) {
      expect(k(label, "copper").toFixed(1), label).toBe(kCu.toFixed(1));
      if (kAl !== null) expect(k(label, "aluminum").toFixed(1), label).toBe(kAl.toFixed(1));
    }
  });
});

describe("ampacity: NFPA 70 (2023) Table 310.16, copper, 30 °C, ≤ 3 current-carrying conductors", () => {
  // A published reproduction of "NEC Table 310.15(B)(16) (formerly 310.16)"; the 75 °C column is
  // confirmed at passyourelectricianexam.com. Pinned edition: 2023 (3 AWG 90 °C = 115, 1 AWG 90 °C = 145;
  // older tables printed 110 and 150; the edition of the change is [M]).
  const TABLE_310_16_CU: ReadonlyArray<readonly [string, number, number, number]> = [
    ["14 AWG", 15, 20, 25],
    ["12 AWG", 20, 25, 30],
    ["10 AWG", 30, 35, 40],
    ["8 AWG", 40, 50, 55],
    ["6 AWG", 55, 65, 75],
    ["4 AWG", 70, 85, 95],
    ["3 AWG", 85, 100, 115],
    ["2 AWG", 95, 115, 130],
    ["1 AWG", 110, 130, 145],
    ["1/0 AWG", 125, 150, 170],
    ["2/0 AWG", 145, 175, 195],
    ["3/0 AWG", 165, 200, 225],
    ["4/0 AWG", 195, 230, 260],
  ];
  for (const [label, a60, a75, a90] of TABLE_310_16_CU) {
    it(`${label} copper: ${a60} / ${a75} / ${a90} A at 60 / 75 / 90 °C`, () => {
      expect(ampacity(label, "copper", 60)).toBe(a60);
      expect(ampacity(label, "copper", 75)).toBe(a75);
      expect(ampacity(label, "copper", 90)).toBe(a90);
    });
  }

  it("pins the 2023 edition: 3 AWG 90 °C = 115 A and 1 AWG 90 °C = 145 A (not 110 / 150)", () => {
    expect(ampacity("3 AWG", "copper", 90)).toBe(115);
    expect(ampacity("1 AWG", "copper", 90)).toBe(145);
  });

  it("metric sizes, and 18/16 AWG (not in the table), have no ampacity", () => {
    for (const s of ALL_SIZES.filter((x) => sizeInfo(x)!.family === "metric")) {
      for (const t of [60, 75, 90] as InsulationC[]) {
        expect(ampacity(s, "copper", t), s).toBeUndefined();
        expect(ampacity(s, "aluminum", t), s).toBeUndefined();
      }
    }
    expect(ampacity("18 AWG", "copper", 75)).toBeUndefined();
    expect(ampacity("16 AWG", "copper", 90)).toBeUndefined();
    expect(ampacity("nonsense", "copper", 75)).toBeUndefined();
  });
});

describe("NFPA 70 240.4(D) small-conductor limits (text quoted at electricallicenserenewal.com)", () => {
  it("copper 14 / 12 / 10 AWG → 15 / 20 / 30 A", () => {
    expect(smallConductorFuseLimit("14 AWG", "copper")).toBe(15);
    expect(smallConductorFuseLimit("12 AWG", "copper")).toBe(20);
    expect(smallConductorFuseLimit("10 AWG", "copper")).toBe(30);
  });
  it("aluminium 12 / 10 AWG → 15 / 25 A", () => {
    expect(smallConductorFuseLimit("12 AWG", "aluminum")).toBe(15);
    expect(smallConductorFuseLimit("10 AWG", "aluminum")).toBe(25);
  });
  it("copper 18 / 16 AWG → 7 / 10 A ([M], 240.4(D)(1),(2))", () => {
    expect(smallConductorFuseLimit("18 AWG", "copper")).toBe(7);
    expect(smallConductorFuseLimit("16 AWG", "copper")).toBe(10);
  });
  it("no limit for 8 AWG and larger, or metric sizes", () => {
    expect(smallConductorFuseLimit("8 AWG", "copper")).toBeUndefined();
    expect(smallConductorFuseLimit("8 AWG", "aluminum")).toBeUndefined();
    expect(smallConductorFuseLimit("4 mm2", "copper")).toBeUndefined();
  });
});

describe("normalizeSize", () => {
  it.each([
    ["10 awg", "10 AWG"],
    ["#10", "10 AWG"],
    ["2/0", "2/0 AWG"],
    ["250 MCM", "250 kcmil"],
    ["16 mm²", "16 mm2"],
    ["16mm2", "16 mm2"],
    ["  4/0 AWG ", "4/0 AWG"],
    ["500 kcmil", "500 kcmil"],
    ["2.5 mm2", "2.5 mm2"],
  ])("accepts %j as %j", (text, label) => {
    expect(normalizeSize(text)).toBe(label);
  });

  it.each(["17 mm2", "0 AWG", "", "   ", "5/0", "20 AWG", "275 kcmil", "mm2", "16 mm3"])("rejects %j", (text) => {
    expect(normalizeSize(text)).toBeNull();
  });

  it("reads a bare number as AWG (\"16\" is 16 AWG, not 16 mm2)", () => {
    expect(normalizeSize("16")).toBe("16 AWG");
    expect(normalizeSize("25")).toBeNull(); // there is no 25 AWG in the library
  });
});
