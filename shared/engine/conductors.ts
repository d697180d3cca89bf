// Conductor library: sizes, DC resistance and ampacity, each table with its source.
//
// Pure data and arithmetic; no I/O. Every figure below is copied from the published
// table named beside it. Figures marked [M] were not found in a citable reproduction
// and are from memory; each is consistent with its neighbours (see the K-constant
// test) but check the standard before relying on the last digit.

export type Material = "copper" | "aluminum";
export type Stranding = "class5" | "class2";
export type InsulationC = 60 | 75 | 90;

export interface SizeInfo {
  /** The canonical label as written in the network file: "10 AWG", "2/0 AWG", "250 kcmil", "16 mm2". */
  label: string;
  family: "awg" | "metric";
  /** Cross-section in mm² (nominal for metric; from the circular-mil area for AWG/kcmil). */
  areaMm2: number;
  /** Area in circular mils (AWG/kcmil only). */
  areaCmil?: number;
  /** Index in ascending order within its family (used for "one step up"). */
  rank: number;
}

/** 1 circular mil in mm²: π/4 · (0.0254 mm)². */
export const MM2_PER_CMIL = (Math.PI / 4) * 0.0254 * 0.0254;
export const METRES_PER_FOOT = 0.3048;

/** Resistance-temperature coefficients at 20 °C.
 *  Source: K.C. Agrawal, Industrial Power Engineering and Applications Handbook, table of
 *  conductor properties (copper IACS α = 3.93×10⁻³ /°C; aluminium 61 % IACS α = 4.03×10⁻³ /°C),
 *  the same figures as IEC 60287-1-1 Table 1. */
export const ALPHA_20: Record<Material, number> = { copper: 0.00393, aluminum: 0.00403 };

/** Resistivity at 20 °C in Ω·mm²/m. Copper: IEC 60028 annealed copper standard, 1/58.
 *  Aluminium: 61 % IACS, 1/(58 × 0.61) = 0.028264 (IEC 60287 rounds it to 2.826×10⁻⁸ Ω·m). */
export const RESISTIVITY_20: Record<Material, number> = { copper: 1 / 58, aluminum: 0.028264 };

/** R_T / R_ref for a conductor at T given its value at refC, by R_T = R_20·(1 + α(T − 20)). */
export function temperatureFactor(material: Material, fromC: number, toC: number): number {
  const a = ALPHA_20[material];
  return (1 + a * (toC - 20)) / (1 + a * (fromC - 20));
}

// ---------------------------------------------------------------------------------------
// AWG / kcmil: NFPA 70 (National Electrical Code) Chapter 9 Table 8 "Conductor Properties",
// DC resistance at 75 °C of stranded, uncoated conductors, Ω per 1000 ft. Values unchanged
// over the 2011–2023 editions; read from the 2011 table as reproduced at
// electrical-design-tutor.com ("Conductor Resistance (from NEC 2011 Chapter 9, Table 8)").
// Circular-mil areas are Table 8's stranded areas [M]. 300 and 400 kcmil are [M].
// Aluminium 18–14 AWG are the parenthesised Table 8 values (aluminium is not used that small).
const AWG_TABLE: ReadonlyArray<readonly [label: string, cmil: number, cuOhmPerKft: number, alOhmPerKft: number]> = [
  ["18 AWG", 1620, 7.95, 13.1],
  ["16 AWG", 2580, 4.99, 8.21],
  ["14 AWG", 4110, 3.14, 5.17],
  ["12 AWG", 6530, 1.98, 3.25],
  ["10 AWG", 10380, 1.24, 2.04],
  ["8 AWG", 16510, 0.778, 1.28],
  ["6 AWG", 26240, 0.491, 0.808],
  ["4 AWG", 41740, 0.308, 0.508],
  ["3 AWG", 52620, 0.245, 0.403],
  ["2 AWG", 66360, 0.194, 0.319],
  ["1 AWG", 83690, 0.154, 0.253],
  ["1/0 AWG", 105600, 0.122, 0.201],
  ["2/0 AWG", 133100, 0.0967, 0.159],
  ["3/0 AWG", 167800, 0.0766, 0.126],
  ["4/0 AWG", 211600, 0.0608, 0.1],
  ["250 kcmil", 250000, 0.0515, 0.0847],
  ["300 kcmil", 300000, 0.0429, 0.0707],
  ["350 kcmil", 350000, 0.0367, 0.0605],
  ["400 kcmil", 400000, 0.0321, 0.0529],
  ["500 kcmil", 500000, 0.0258, 0.0424],
];
export const TABLE8_REFERENCE_C = 75;
export const TABLE8_SOURCE = "NFPA 70 Chapter 9 Table 8 (DC resistance, stranded uncoated, 75 °C)";

// Metric: IEC 60228:2004 "Conductors of insulated cables", maximum DC resistance at 20 °C
// of plain (uncoated) copper conductors, Ω/km. Class 2 (stranded) and class 5 (flexible).
// 0.5–120 mm² cross-checked digit for digit on etechnik-synergie.com (DIN VDE 0295 / IEC 60228
// / HD 383) and mycableengineering.com; 150–240 mm² are [M]. Note that at 50 mm² the class 5
// limit (0.386) is lower than the class 2 limit (0.387): that is in the standard.
const METRIC_TABLE: ReadonlyArray<readonly [mm2: number, class2: number | null, class5: number]> = [
  [0.5, 36.0, 39.0],
  [0.75, 24.5, 26.0],
  [1, 18.1, 19.5],
  [1.5, 12.1, 13.3],
  [2.5, 7.41, 7.98],
  [4, 4.61, 4.95],
  [6, 3.08, 3.3],
  [10, 1.83, 1.91],
  [16, 1.15, 1.21],
  [25, 0.727, 0.78],
  [35, 0.524, 0.554],
  [50, 0.387, 0.386],
  [70, 0.268, 0.272],
  [95, 0.193, 0.206],
  [120, 0.153, 0.161],
  [150, 0.124, 0.129],
  [185, 0.0991, 0.106],
  [240, 0.0754, 0.0801],
];
export const IEC60228_REFERENCE_C = 20;
export const IEC60228_SOURCE = "IEC 60228:2004 maximum DC resistance of plain copper at 20 °C";

// Ampacity: NFPA 70 Table 310.16 (2023 edition; numbered 310.15(B)(16) in 2011–2017),
// not more than three current-carrying conductors in raceway, cable or earth, 30 °C ambient,
// columns 60 / 75 / 90 °C insulation. Copper 14 AWG – 4/0 copied from the table
// (a published reproduction of "NEC Table 310.15(B)(16)"; 75 °C column confirmed at passyourelectricianexam.com);
// copper 250–500 kcmil and all aluminium figures are [M]. 2023 values: 3 AWG 90 °C = 115 and
// 1 AWG 90 °C = 145 (older editions printed 110 and 150). 18 and 16 AWG are not in the table.
export const AMPACITY_SOURCE = "NFPA 70 (2023) Table 310.16, 30 °C ambient, ≤ 3 current-carrying conductors";
const AMPACITY: Record<Material, Record<string, readonly [number, number, number]>> = {
  copper: {
    "14 AWG": [15, 20, 25],
    "12 AWG": [20, 25, 30],
    "10 AWG": [30, 35, 40],
    "8 AWG": [40, 50, 55],
    "6 AWG": [55, 65, 75],
    "4 AWG": [70, 85, 95],
    "3 AWG": [85, 100, 115],
    "2 AWG": [95, 115, 130],
    "1 AWG": [110, 130, 145],
    "1/0 AWG": [125, 150, 170],
    "2/0 AWG": [145, 175, 195],
    "3/0 AWG": [165, 200, 225],
    "4/0 AWG": [195, 230, 260],
    "250 kcmil": [215, 255, 290],
    "300 kcmil": [240, 285, 320],
    "350 kcmil": [260, 310, 350],
    "400 kcmil": [280, 335, 380],
    "500 kcmil": [320, 380, 430],
  },
  aluminum: {
    "12 AWG": [15, 20, 25],
    "10 AWG": [25, 30, 35],
    "8 AWG": [35, 40, 45],
    "6 AWG": [40, 50, 55],
    "4 AWG": [55, 65, 75],
    "3 AWG": [65, 75, 85],
    "2 AWG": [75, 90, 100],
    "1 AWG": [85, 100, 115],
    "1/0 AWG": [100, 120, 135],
    "2/0 AWG": [115, 135, 150],
    "3/0 AWG": [130, 155, 175],
    "4/0 AWG": [150, 180, 205],
    "250 kcmil": [170, 205, 230],
    "300 kcmil": [195, 230, 260],
    "350 kcmil": [210, 250, 280],
    "400 kcmil": [225, 270, 305],
    "500 kcmil": [260, 310, 350],
  },
};

/** NFPA 70 240.4(D) small-conductor overcurrent-protection limits (A). Copper 14/12/10 AWG and
 *  aluminium 12/10 AWG as quoted from the code text (electricallicenserenewal.com course);
 *  copper 18 and 16 AWG (240.4(D)(1),(2)) are [M]. */
export const SMALL_CONDUCTOR_LIMIT_SOURCE = "NFPA 70 240.4(D)";
const SMALL_CONDUCTOR_LIMIT: Record<Material, Record<string, number>> = {
  copper: { "18 AWG": 7, "16 AWG": 10, "14 AWG": 15, "12 AWG": 20, "10 AWG": 30 },
  aluminum: { "12 AWG": 15, "10 AWG": 25 },
};

const SIZES = new Map<string, SizeInfo>();
AWG_TABLE.forEach(([label, cmil], rank) =>
  SIZES.set(label, { label, family: "awg", areaCmil: cmil, areaMm2: cmil * MM2_PER_CMIL, rank }),
);
METRIC_TABLE.forEach(([mm2], rank) => {
  const label = `${mm2} mm2`;
  SIZES.set(label, { label, family: "metric", areaMm2: mm2, rank });
});

/** Every size the engine knows, in ascending order within each family. */
export const ALL_SIZES: readonly string[] = [...SIZES.keys()];

/** Turns what a person types ("10 awg", "2/0", "#6", "250 MCM", "16 mm²", "16mm2") into the
 *  canonical label, or null when it is not a size we know. A bare number is read by `units`. */
export function normalizeSize(text: string, units?: "metric" | "imperial"): string | null {
  const t = text.trim().replace(/²/g, "2").replace(/\s+/g, " ");
  // A bare number means mm² in a metric system ("16") and AWG otherwise ("10", "#10").
  if (units === "metric" && /^\d+(?:\.\d+)?$/.test(t)) {
    const label = `${Number(t)} mm2`;
    return SIZES.has(label) ? label : null;
  }
  let m = /^(?:#\s*)?(\d{1,2}|[1-4]\/0)\s*(?:awg|ga|gauge)?$/i.exec(t);
  if (m) {
    const label = `${m[1]} AWG`;
    return SIZES.has(label) ? label : null;
  }
  m = /^(\d{3})\s*(?:kcmil|mcm)$/i.exec(t);
  if (m) {
    const label = `${m[1]} kcmil`;
    return SIZES.has(label) ? label : null;
  }
  m = /^(\d+(?:\.\d+)?)\s*(?:mm2|mm\^2|sq\s*mm|sqmm)$/i.exec(t);
  if (m) {
    const label = `${Number(m[1])} mm2`;
    return SIZES.has(label) ? label : null;
  }
  return null;
}

export function sizeInfo(label: string): SizeInfo | undefined {
  return SIZES.get(label);
}

export interface ConductorResistance {
  /** Ω per metre of one conductor at the requested temperature. */
  ohmPerMetre: number;
  /** Where the figure came from. */
  basis: "table" | "resistivity";
  source: string;
}

/** Ω/km of one conductor at its table's reference temperature, straight from the table,
 *  or undefined when the table has no value (metric aluminium). */
export function tableOhmPerKm(label: string, material: Material, stranding: Stranding = "class5"):
  { ohmPerKm: number; referenceC: number; source: string } | undefined {
  const info = SIZES.get(label);
  if (!info) return undefined;
  if (info.family === "awg") {
    const row = AWG_TABLE[info.rank];
    const perKft = material === "copper" ? row[2] : row[3];
    return { ohmPerKm: perKft / METRES_PER_FOOT, referenceC: TABLE8_REFERENCE_C, source: TABLE8_SOURCE };
  }
  if (material !== "copper") return undefined;
  const row = METRIC_TABLE[info.rank];
  const value = stranding === "class2" ? row[1] : row[2];
  if (value === null) return undefined;
  return { ohmPerKm: value, referenceC: IEC60228_REFERENCE_C, source: `${IEC60228_SOURCE}, ${stranding === "class2" ? "class 2" : "class 5"}` };
}

/** Ω/m of one conductor at temperatureC. Uses the published table, corrected from the table's
 *  reference temperature with R_T = R_20·(1 + α(T − 20)); where there is no table value, computes
 *  R = ρ₂₀·L/A at 20 °C from the resistivity and corrects the same way. */
export function conductorResistance(
  label: string,
  material: Material,
  temperatureC: number,
  stranding: Stranding = "class5",
): ConductorResistance | undefined {
  const info = SIZES.get(label);
  if (!info) return undefined;
  const table = tableOhmPerKm(label, material, stranding);
  if (table) {
    return {
      ohmPerMetre: (table.ohmPerKm / 1000) * temperatureFactor(material, table.referenceC, temperatureC),
      basis: "table",
      source: table.source,
    };
  }
  const at20 = RESISTIVITY_20[material] / info.areaMm2;
  return {
    ohmPerMetre: at20 * temperatureFactor(material, 20, temperatureC),
    basis: "resistivity",
    source: `computed from resistivity ${RESISTIVITY_20[material].toFixed(6)} Ω·mm²/m at 20 °C and ${info.areaMm2} mm²`,
  };
}

/** Ampacity in A for one conductor, or undefined when the reference table has no value
 *  (18/16 AWG, and every metric size: metric ampacity is not checked). */
export function ampacity(label: string, material: Material, insulationC: InsulationC): number | undefined {
  const row = AMPACITY[material][label];
  if (!row) return undefined;
  return row[insulationC === 60 ? 0 : insulationC === 75 ? 1 : 2];
}

/** The 240.4(D) overcurrent-protection ceiling for small conductors, or undefined. */
export function smallConductorFuseLimit(label: string, material: Material): number | undefined {
  return SMALL_CONDUCTOR_LIMIT[material][label];
}

/** Exposed for the table tests: the raw rows exactly as copied from the tables. */
export const RAW_TABLES = { AWG_TABLE, METRIC_TABLE, AMPACITY, SMALL_CONDUCTOR_LIMIT };
