// The bill of materials, checked against quantities worked out by hand (the arithmetic is written
// beside every expected value). Rules: README "Estimates" and shared/estimate/bill-of-materials.ts.
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { buildBillOfMaterials, roundUpTo, type BomSettings, type BomSystem } from "../../../shared/estimate/index.js";
import type { SystemInput } from "../../../shared/engine/schema.js";
import type { GeneratedLine, PriceItem } from "../../../shared/schemas/estimates.js";

type Item = Parameters<typeof buildBillOfMaterials>[1][number];
type RunInput = SystemInput["runs"][number];

const example = (name: "cabin-24v" | "garden-12v"): SystemInput =>
  JSON.parse(readFileSync(new URL(`../../../shared/engine/examples/${name}.json`, import.meta.url), "utf8")) as SystemInput;

/** A price item; its id is its SKU so lines can be checked by id. */
function item(values: Partial<PriceItem> & Pick<PriceItem, "sku" | "category" | "unit" | "unitCostMinor">): Item {
  return { id: values.sku, description: values.sku, sellPriceMinor: null, cableSize: null, cableMaterial: null, conductors: null, ratingA: null, ...values };
}
const cable = (sku: string, size: string, unitCostMinor: number, extra: Partial<PriceItem> = {}) =>
  item({ sku, category: "cable", unit: "m", unitCostMinor, cableSize: size, cableMaterial: "copper", conductors: 1, ...extra });

/** A minimal network document: the runs given, their end points, one battery. */
function network(runs: Array<Partial<RunInput> & Pick<RunInput, "id" | "length" | "size">>, units: "metric" | "imperial" = "metric", loads: SystemInput["loads"] = []): SystemInput {
  const full = runs.map((r, i) => ({ from: `a${i}`, to: `b${i}`, ...r }));
  const points = [...new Set(full.flatMap((r) => [r.from, r.to]).concat(loads.map((l) => l.point)))].map((id) => ({ id }));
  return {
    format: "runwright-system/1",
    units,
    nominalVoltage: 24,
    points,
    sources: [{ id: "bat", type: "battery", point: points[0]?.id ?? "a0", voltage: 24 }],
    runs: full,
    loads,
  };
}
const system = (document: unknown, id = "sys-1", name = "System 1"): BomSystem => ({ id, name, document });

/** 10 % waste and no labour unless a test says otherwise. */
const SETTINGS: BomSettings = { wastePercent: 10, labourMinutesPerRun: 0, labourMinutesPerMetre: 0, labourMinutesPerTermination: 0, labourRateMinor: 9500 };
/** A crimp lug for any size, so the terminations are priced. */
const LUG = { sku: "LUG", category: "termination", unit: "each", unitCostMinor: 100 } as const;
/** The company defaults (server/db/entities/company.entity.ts): 10 % waste, 20 min/run, 1 min/m, 4 min/termination. */
const DEFAULTS: BomSettings = { wastePercent: 10, labourMinutesPerRun: 20, labourMinutesPerMetre: 1, labourMinutesPerTermination: 4, labourRateMinor: 9500 };

const lineByKey = (lines: GeneratedLine[], key: string) => {
  const line = lines.find((l) => l.key === key);
  expect(line, `no line ${key} among ${lines.map((l) => l.key).join(", ")}`).toBeDefined();
  return line as GeneratedLine;
};

describe("cable quantities", () => {
  it("a 40 m run of 16 mm² copper, one set, 10 % waste needs 88 m, and float dust does not round it to 89", () => {
    const bom = buildBillOfMaterials([system(network([{ id: "r", length: 40, size: "16 mm2" }]))], [cable("CU16", "16 mm2", 460), item(LUG)], SETTINGS);
    const line = lineByKey(bom.lines, "cable:copper:16 mm2");
    // 2 conductors × 40 m × 1 set × 1.1 = 88 m (80 × 1.1 is 88.00000000000001 in binary floating point)
    expect(line.quantity).toBe(88);
    expect(line.unit).toBe("m");
    expect(line.priceItemId).toBe("CU16");
    expect(line.unitCostMinor).toBe(460);
    expect(bom.findings).toEqual([]);
  });

  it("two parallel sets double the conductor length", () => {
    const bom = buildBillOfMaterials([system(network([{ id: "r", length: 40, size: "16 mm2", parallel: 2 }]))], [cable("CU16", "16 mm2", 460)], SETTINGS);
    // 2 conductors × 40 m × 2 sets × 1.1 = 176 m
    expect(lineByKey(bom.lines, "cable:copper:16 mm2").quantity).toBe(176);
  });

  it("a twin (2-conductor) cable needs half the length", () => {
    const twin = cable("TWIN16", "16 mm2", 900, { conductors: 2 });
    const bom = buildBillOfMaterials([system(network([{ id: "r", length: 40, size: "16 mm2" }]))], [twin], SETTINGS);
    // 2 conductors × 40 m × 1.1 = 88 conductor-metres ÷ 2 conductors per cable = 44 m of twin
    const line = lineByKey(bom.lines, "cable:copper:16 mm2");
    expect(line.quantity).toBe(44);
    expect(line.priceItemId).toBe("TWIN16");
  });

  it("rounds up to a whole unit: 12.3 m one-way at 10 % waste is 27.06 m, bought as 28 m", () => {
    const bom = buildBillOfMaterials([system(network([{ id: "r", length: 12.3, size: "16 mm2" }]))], [cable("CU16", "16 mm2", 460)], SETTINGS);
    // 2 × 12.3 × 1.1 = 27.06 → 28
    expect(lineByKey(bom.lines, "cable:copper:16 mm2").quantity).toBe(28);
  });

  it("adds the runs of one size and material together before rounding", () => {
    const runs = [
      { id: "r1", length: 12.3, size: "16 mm2" },
      { id: "r2", length: 12.3, size: "16 mm2" },
    ];
    const bom = buildBillOfMaterials([system(network(runs))], [cable("CU16", "16 mm2", 460)], SETTINGS);
    // (2 × 12.3 + 2 × 12.3) × 1.1 = 54.12 → 55 (rounding each run first would give 28 + 28 = 56)
    expect(lineByKey(bom.lines, "cable:copper:16 mm2").quantity).toBe(55);
  });

  it("takes the waste from the settings: 0 % leaves 80 m, 25 % makes 100 m", () => {
    const doc = network([{ id: "r", length: 40, size: "16 mm2" }]);
    // 2 × 40 × 1.00 = 80
    expect(lineByKey(buildBillOfMaterials([system(doc)], [cable("CU16", "16 mm2", 460)], { ...SETTINGS, wastePercent: 0 }).lines, "cable:copper:16 mm2").quantity).toBe(80);
    // 2 × 40 × 1.25 = 100
    expect(lineByKey(buildBillOfMaterials([system(doc)], [cable("CU16", "16 mm2", 460)], { ...SETTINGS, wastePercent: 25 }).lines, "cable:copper:16 mm2").quantity).toBe(100);
  });

  it("counts a return conductor of another size under its own size", () => {
    const doc = network([{ id: "r", length: 10, size: "16 mm2", returnSize: "10 mm2", parallel: 2 }]);
    const bom = buildBillOfMaterials([system(doc)], [cable("CU16", "16 mm2", 460), cable("CU10", "10 mm2", 300), item({ sku: "LUG", category: "termination", unit: "each", unitCostMinor: 100 })], SETTINGS);
    // + conductor: 1 × 10 m × 2 sets × 1.1 = 22 m of 16 mm²; − conductor: the same 22 m of 10 mm²
    expect(lineByKey(bom.lines, "cable:copper:16 mm2").quantity).toBe(22);
    expect(lineByKey(bom.lines, "cable:copper:10 mm2").quantity).toBe(22);
    // terminations: 2 ends × 1 conductor × 2 sets = 4 of each size (4 × parallel = 8 in all)
    expect(lineByKey(bom.lines, "termination:16 mm2").quantity).toBe(4);
    expect(lineByKey(bom.lines, "termination:10 mm2").quantity).toBe(4);
  });

  it("a return size equal to the size is one size", () => {
    const bom = buildBillOfMaterials([system(network([{ id: "r", length: 40, size: "16 mm2", returnSize: "16 mm2" }]))], [cable("CU16", "16 mm2", 460)], SETTINGS);
    // 2 × 40 × 1.1 = 88
    expect(bom.lines.filter((l) => l.category === "cable")).toHaveLength(1);
    expect(lineByKey(bom.lines, "cable:copper:16 mm2").quantity).toBe(88);
  });

  it("keeps copper and aluminum apart", () => {
    const doc = network([
      { id: "r1", length: 40, size: "16 mm2" },
      { id: "r2", length: 10, size: "16 mm2", material: "aluminum" },
    ]);
    const bom = buildBillOfMaterials([system(doc)], [cable("CU16", "16 mm2", 460), cable("AL16", "16 mm2", 200, { cableMaterial: "aluminum" })], SETTINGS);
    // copper: 2 × 40 × 1.1 = 88; aluminum: 2 × 10 × 1.1 = 22
    expect(lineByKey(bom.lines, "cable:copper:16 mm2")).toMatchObject({ quantity: 88, priceItemId: "CU16" });
    expect(lineByKey(bom.lines, "cable:aluminum:16 mm2")).toMatchObject({ quantity: 22, priceItemId: "AL16" });
  });

  it("prices a size the layout writes another way (\"16\" in a metric system is 16 mm², \"10 awg\" is 10 AWG)", () => {
    // The engine accepts these spellings (normalizeSize); the price list stores the label.
    const doc = network([
      { id: "r1", length: 40, size: "16" },
      { id: "r2", length: 10, size: "16 mm2" },
    ]);
    const bom = buildBillOfMaterials([system(doc)], [cable("CU16", "16 mm2", 460), item({ sku: "LUG", category: "termination", unit: "each", unitCostMinor: 100 })], SETTINGS);
    expect(bom.findings.filter((f) => f.code === "MISSING_PRICE")).toEqual([]);
    // both runs are 16 mm²: 2 × (40 + 10) × 1.1 = 110
    expect(bom.lines.filter((l) => l.category === "cable")).toHaveLength(1);
    expect(lineByKey(bom.lines, "cable:copper:16 mm2").quantity).toBe(110);
    // 2 runs × 4 ends
    expect(lineByKey(bom.lines, "termination:16 mm2").quantity).toBe(8);

    // a return size spelled another way is still the same size: one line, 2 × 10 × 1.1 = 22
    const same = buildBillOfMaterials([system(network([{ id: "r", length: 10, size: "16 mm2", returnSize: "16 mm²" }]))], [cable("CU16", "16 mm2", 460), item(LUG)], SETTINGS);
    expect(same.lines.filter((l) => l.category === "cable").map((l) => [l.key, l.quantity])).toEqual([["cable:copper:16 mm2", 22]]);

    const imperial = network([{ id: "r", length: 50, size: "10 awg" }], "imperial");
    const ft = buildBillOfMaterials([system(imperial)], [cable("CU10FT", "10 AWG", 45, { unit: "ft" }), item(LUG)], SETTINGS);
    expect(ft.findings.filter((f) => f.code === "MISSING_PRICE")).toEqual([]);
    // 2 × 50 ft × 1.1 = 110 ft
    expect(lineByKey(ft.lines, "cable:copper:10 AWG").quantity).toBe(110);
  });
});

describe("imperial systems", () => {
  const garden = example("garden-12v");

  it("prices a run in feet from an item sold by the foot", () => {
    const items = [cable("CU10FT", "10 AWG", 45, { unit: "ft" }), cable("CU12FT", "12 AWG", 30, { unit: "ft" })];
    const bom = buildBillOfMaterials([system(garden)], items, SETTINGS);
    // home: 2 × 50 ft × 1.1 = 110 ft (through metres: 50 × 0.3048 × 2 × 1.1 ÷ 0.3048)
    expect(lineByKey(bom.lines, "cable:copper:10 AWG")).toMatchObject({ quantity: 110, unit: "ft", priceItemId: "CU10FT" });
    // r01…r18: 18 × 10 ft = 180 ft one-way; 2 × 180 × 1.1 = 396 ft
    expect(lineByKey(bom.lines, "cable:copper:12 AWG")).toMatchObject({ quantity: 396, unit: "ft" });
  });

  it("prices a run in feet from an item sold by the metre (0.3048 m per ft exactly)", () => {
    const items = [cable("CU10M", "10 AWG", 150), cable("CU12M", "12 AWG", 100)];
    const bom = buildBillOfMaterials([system(garden)], items, SETTINGS);
    // home: 50 ft × 0.3048 = 15.24 m; 2 × 15.24 × 1.1 = 33.528 m → 34 m
    expect(lineByKey(bom.lines, "cable:copper:10 AWG")).toMatchObject({ quantity: 34, unit: "m" });
    // 12 AWG: 180 ft × 0.3048 = 54.864 m; 2 × 54.864 × 1.1 = 120.7008 m → 121 m
    expect(lineByKey(bom.lines, "cable:copper:12 AWG")).toMatchObject({ quantity: 121, unit: "m" });
  });

  it("a metric system priced from a per-ft item converts metres to feet", () => {
    const bom = buildBillOfMaterials([system(network([{ id: "r", length: 30.48, size: "16 mm2" }]))], [cable("CU16FT", "16 mm2", 140, { unit: "ft" })], SETTINGS);
    // 30.48 m = 100 ft; 2 × 100 ft × 1.1 = 220 ft
    expect(lineByKey(bom.lines, "cable:copper:16 mm2")).toMatchObject({ quantity: 220, unit: "ft" });
  });
});

describe("choosing among several items", () => {
  it("takes the cheapest per metre of conductor, whatever the unit and the number of conductors", () => {
    const items = [
      cable("A-SINGLE-M", "16 mm2", 460), // 460 per conductor-metre
      cable("B-SINGLE-FT", "16 mm2", 130, { unit: "ft" }), // 130 ÷ 0.3048 = 426.5 per conductor-metre
      cable("C-TWIN-M", "16 mm2", 820, { conductors: 2 }), // 820 ÷ 2 = 410 per conductor-metre: the cheapest
      cable("D-TWIN-FT", "16 mm2", 130, { unit: "ft", conductors: 2, cableMaterial: "aluminum" }), // another material: not a candidate
    ];
    const bom = buildBillOfMaterials([system(network([{ id: "r", length: 40, size: "16 mm2" }]))], items, SETTINGS);
    const line = lineByKey(bom.lines, "cable:copper:16 mm2");
    expect(line.priceItemId).toBe("C-TWIN-M");
    // 88 conductor-metres ÷ 2 = 44 m
    expect(line.quantity).toBe(44);
    expect(line.unitCostMinor).toBe(820);
  });

  it("a per-foot item that is cheaper per metre wins over a per-metre one", () => {
    const items = [cable("M", "16 mm2", 460), cable("FT", "16 mm2", 120, { unit: "ft" })]; // 120 ÷ 0.3048 = 393.7 per m
    const bom = buildBillOfMaterials([system(network([{ id: "r", length: 40, size: "16 mm2" }]))], items, SETTINGS);
    // 88 m ÷ 0.3048 = 288.71 ft → 289 ft
    expect(lineByKey(bom.lines, "cable:copper:16 mm2")).toMatchObject({ priceItemId: "FT", unit: "ft", quantity: 289 });
  });

  it("breaks a tie by SKU, so the choice does not depend on the list's order", () => {
    const a = cable("CU-A", "16 mm2", 460);
    const b = cable("CU-B", "16 mm2", 460);
    const doc = network([{ id: "r", length: 40, size: "16 mm2" }]);
    expect(lineByKey(buildBillOfMaterials([system(doc)], [b, a], SETTINGS).lines, "cable:copper:16 mm2").priceItemId).toBe("CU-A");
    expect(lineByKey(buildBillOfMaterials([system(doc)], [a, b], SETTINGS).lines, "cable:copper:16 mm2").priceItemId).toBe("CU-A");
  });
});

describe("terminations and fuses", () => {
  it("counts 4 × parallel terminations per run, from the item for that size, else the one for any size", () => {
    const doc = network([
      { id: "r1", length: 5, size: "16 mm2", parallel: 3 },
      { id: "r2", length: 5, size: "2.5 mm2" },
    ]);
    const items = [
      cable("CU16", "16 mm2", 460),
      cable("CU2.5", "2.5 mm2", 85),
      item({ sku: "LUG-16", category: "termination", unit: "each", unitCostMinor: 300, cableSize: "16 mm2" }),
      item({ sku: "LUG-ANY", category: "termination", unit: "each", unitCostMinor: 100 }), // cheaper, but 16 mm² has its own
    ];
    const bom = buildBillOfMaterials([system(doc)], items, SETTINGS);
    // r1: 4 × 3 sets = 12 ends of 16 mm², from the sized lug
    expect(lineByKey(bom.lines, "termination:16 mm2")).toMatchObject({ quantity: 12, priceItemId: "LUG-16", unitCostMinor: 300 });
    // r2: 4 × 1 = 4 ends of 2.5 mm², from the any-size lug
    expect(lineByKey(bom.lines, "termination:2.5 mm2")).toMatchObject({ quantity: 4, priceItemId: "LUG-ANY" });
  });

  it("a termination sized for another conductor is not used", () => {
    const items = [cable("CU16", "16 mm2", 460), item({ sku: "LUG-25", category: "termination", unit: "each", unitCostMinor: 300, cableSize: "25 mm2" })];
    const bom = buildBillOfMaterials([system(network([{ id: "r", length: 5, size: "16 mm2" }]))], items, SETTINGS);
    expect(bom.lines.some((l) => l.category === "termination")).toBe(false);
    expect(bom.findings).toEqual([expect.objectContaining({ code: "MISSING_PRICE", severity: "error", need: expect.objectContaining({ category: "termination", cableSize: "16 mm2" }) })]);
  });

  it("prices fuses by exact rating and adds one holder per fused run", () => {
    const doc = network([
      { id: "r1", length: 5, size: "16 mm2", fuseA: 60 },
      { id: "r2", length: 5, size: "16 mm2", fuseA: 60 },
      { id: "r3", length: 5, size: "16 mm2", fuseA: 80 },
      { id: "r4", length: 5, size: "16 mm2" },
    ]);
    const items = [
      cable("CU16", "16 mm2", 460),
      item({ sku: "F60", category: "fuse", unit: "each", unitCostMinor: 1850, ratingA: 60 }),
      item({ sku: "F63", category: "fuse", unit: "each", unitCostMinor: 900, ratingA: 63 }), // close is not enough
      item({ sku: "F80", category: "fuse", unit: "each", unitCostMinor: 1950, ratingA: 80 }),
      item({ sku: "FH", category: "fuse", unit: "each", unitCostMinor: 1475 }),
    ];
    const bom = buildBillOfMaterials([system(doc)], items, SETTINGS);
    expect(lineByKey(bom.lines, "fuse:60")).toMatchObject({ quantity: 2, priceItemId: "F60" });
    expect(lineByKey(bom.lines, "fuse:80")).toMatchObject({ quantity: 1, priceItemId: "F80" });
    expect(bom.lines.some((l) => l.key === "fuse:63")).toBe(false);
    // three fused runs (r4 has no fuse)
    expect(lineByKey(bom.lines, "fuse-holder")).toMatchObject({ quantity: 3, priceItemId: "FH" });
  });

  it("a rating with no exact item is a MISSING_PRICE with the rating, and no holder line without a holder item", () => {
    const doc = network([{ id: "r1", length: 5, size: "16 mm2", fuseA: 60 }]);
    const items = [cable("CU16", "16 mm2", 460), item({ sku: "LUG", category: "termination", unit: "each", unitCostMinor: 100 }), item({ sku: "F63", category: "fuse", unit: "each", unitCostMinor: 900, ratingA: 63 })];
    const bom = buildBillOfMaterials([system(doc)], items, SETTINGS);
    expect(bom.lines.filter((l) => l.category === "fuse")).toEqual([]);
    const needs = bom.findings.filter((f) => f.code === "MISSING_PRICE").map((f) => f.need);
    expect(needs).toEqual([
      expect.objectContaining({ category: "fuse", unit: "each", ratingA: 60, cableSize: null }),
      expect.objectContaining({ category: "fuse", unit: "each", ratingA: null }),
    ]);
  });
});

describe("labour", () => {
  it("adds minutes per run, per metre of one-way length and per termination, rounded up to the quarter hour", () => {
    const settings = { ...SETTINGS, labourMinutesPerRun: 20, labourMinutesPerMetre: 1, labourMinutesPerTermination: 4 };
    const bom = buildBillOfMaterials([system(network([{ id: "r", length: 40, size: "16 mm2" }]))], [cable("CU16", "16 mm2", 460)], settings);
    // 20 + 40 m × 1 + 4 terminations × 4 = 76 min = 1.267 h → 1.5 h
    const labour = lineByKey(bom.lines, "labour");
    expect(labour).toMatchObject({ quantity: 1.5, unit: "hour", unitCostMinor: 9500, priceItemId: null, sellPriceMinor: null, category: "labour" });
  });

  it("an exact quarter hour stays as it is", () => {
    const settings = { ...SETTINGS, labourMinutesPerRun: 20, labourMinutesPerMetre: 0, labourMinutesPerTermination: 10 };
    const doc = network([{ id: "r", length: 40, size: "16 mm2" }]);
    // 20 + 4 × 10 = 60 min = 1 h exactly
    expect(lineByKey(buildBillOfMaterials([system(doc)], [], settings).lines, "labour").quantity).toBe(1);
    // 21 + 4 × 10 = 61 min → 1.25 h
    expect(lineByKey(buildBillOfMaterials([system(doc)], [], { ...settings, labourMinutesPerRun: 21 }).lines, "labour").quantity).toBe(1.25);
    // 0.1 min/m × 30 m = 3 min (0.1 × 30 is 3.0000000000000004), + 12 = 15 min = 0.25 h exactly
    expect(lineByKey(buildBillOfMaterials([system(network([{ id: "r", length: 30, size: "16 mm2" }]))], [], { ...settings, labourMinutesPerRun: 12, labourMinutesPerMetre: 0.1, labourMinutesPerTermination: 0 }).lines, "labour").quantity).toBe(0.25);
  });

  it("counts metres, not feet, and one-way length once whatever the parallel sets, and every set's terminations", () => {
    const doc = network([{ id: "r", length: 100, size: "10 AWG", parallel: 2 }], "imperial");
    const settings = { ...SETTINGS, labourMinutesPerRun: 10, labourMinutesPerMetre: 1, labourMinutesPerTermination: 2 };
    // 10 + 100 ft × 0.3048 = 30.48 min + 8 terminations × 2 = 16 → 56.48 min = 0.941 h → 1 h
    expect(lineByKey(buildBillOfMaterials([system(doc)], [], settings).lines, "labour").quantity).toBe(1);
  });

  it("a zero labour rate is a NO_LABOUR_RATE warning", () => {
    const bom = buildBillOfMaterials([system(network([{ id: "r", length: 40, size: "16 mm2" }]))], [cable("CU16", "16 mm2", 460), item(LUG)], { ...DEFAULTS, labourRateMinor: 0 });
    expect(bom.findings).toEqual([expect.objectContaining({ code: "NO_LABOUR_RATE", severity: "warning" })]);
  });
});

describe("the example cabin (metric), with the company's defaults", () => {
  const cabin = example("cabin-24v");
  const ITEMS = [
    cable("T-CU-16", "16 mm2", 460),
    cable("T-CU-2.5", "2.5 mm2", 85),
    item({ sku: "T-LUG", category: "termination", unit: "each", unitCostMinor: 120 }),
    item({ sku: "T-FUSE-60", category: "fuse", unit: "each", unitCostMinor: 1850, ratingA: 60 }),
    item({ sku: "T-FUSE-80", category: "fuse", unit: "each", unitCostMinor: 1850, ratingA: 80 }),
    item({ sku: "T-FH", category: "fuse", unit: "each", unitCostMinor: 1475 }),
  ];

  it("lists every line with the quantity worked out by hand", () => {
    const bom = buildBillOfMaterials([system(cabin)], ITEMS, DEFAULTS);
    expect(bom.findings).toEqual([]);
    const quantities = Object.fromEntries(bom.lines.map((l) => [l.key, l.quantity]));
    expect(quantities).toEqual({
      // feed-shed 8 + shed-pump 22 + feed-cabin 6 = 36 m one-way; 2 × 36 × 1.1 = 79.2 → 80 m
      "cable:copper:16 mm2": 80,
      // cabin-studio 18 m; 2 × 18 × 1.1 = 39.6 → 40 m
      "cable:copper:2.5 mm2": 40,
      // 3 runs × 4 ends
      "termination:16 mm2": 12,
      // 1 run × 4 ends
      "termination:2.5 mm2": 4,
      "fuse:60": 1,
      "fuse:80": 1,
      "fuse-holder": 2,
      // 4 runs × 20 min + 54 m × 1 min + 16 terminations × 4 min = 80 + 54 + 64 = 198 min = 3.3 h → 3.5 h
      labour: 3.5,
    });
  });

  it("with nothing priced: a MISSING_PRICE (with what to add) for every item, and no zero-priced line", () => {
    const bom = buildBillOfMaterials([system(cabin)], [], DEFAULTS);
    expect(bom.lines.map((l) => l.key)).toEqual(["labour"]);
    const missing = bom.findings.filter((f) => f.code === "MISSING_PRICE");
    expect(missing.every((f) => f.severity === "error")).toBe(true);
    expect(missing.map((f) => f.need)).toEqual([
      expect.objectContaining({ category: "cable", unit: "m", cableSize: "2.5 mm2", cableMaterial: "copper", ratingA: null }),
      expect.objectContaining({ category: "cable", unit: "m", cableSize: "16 mm2", cableMaterial: "copper", ratingA: null }),
      expect.objectContaining({ category: "termination", unit: "each", cableSize: "2.5 mm2", cableMaterial: null }),
      expect.objectContaining({ category: "termination", unit: "each", cableSize: "16 mm2", cableMaterial: null }),
      expect.objectContaining({ category: "fuse", ratingA: 60 }),
      expect.objectContaining({ category: "fuse", ratingA: 80 }),
      expect.objectContaining({ category: "fuse", ratingA: null }),
    ]);
    for (const f of missing) expect(f.need?.description.length).toBeGreaterThan(0);
  });

  it("leaves out only the size without a price", () => {
    const bom = buildBillOfMaterials([system(cabin)], ITEMS.filter((i) => i.sku !== "T-CU-2.5"), DEFAULTS);
    expect(bom.lines.some((l) => l.key === "cable:copper:2.5 mm2")).toBe(false);
    expect(lineByKey(bom.lines, "cable:copper:16 mm2").quantity).toBe(80);
    expect(bom.findings).toEqual([expect.objectContaining({ code: "MISSING_PRICE", need: expect.objectContaining({ category: "cable", cableSize: "2.5 mm2" }) })]);
    for (const line of bom.lines) expect(line.unitCostMinor, line.key).toBeGreaterThan(0);
  });

  it("adds up two systems of one job", () => {
    const bom = buildBillOfMaterials([system(cabin, "s1", "Cabin"), system(cabin, "s2", "Annex")], ITEMS, DEFAULTS);
    // 2 × 72 conductor-metres × 1.1 = 158.4 → 159 m (not 2 × 80)
    expect(lineByKey(bom.lines, "cable:copper:16 mm2").quantity).toBe(159);
    expect(lineByKey(bom.lines, "fuse-holder").quantity).toBe(4);
    // 2 × (80 + 54 + 64) = 396 min = 6.6 h → 6.75 h
    expect(lineByKey(bom.lines, "labour").quantity).toBe(6.75);
  });
});

describe("supplied loads", () => {
  const cabin = example("cabin-24v");
  const fridge = item({ sku: "DEV-FRIDGE", category: "device", unit: "each", unitCostMinor: 89000 });
  const driver = item({ sku: "DEV-LED", category: "device", unit: "each", unitCostMinor: 4500 });

  it("adds one of the chosen device per supplied load", () => {
    const bom = buildBillOfMaterials([system(cabin, "s1")], [fridge, driver], SETTINGS, [
      { systemId: "s1", loadId: "fridge", priceItemId: "DEV-FRIDGE" },
      { systemId: "s1", loadId: "cabin-lights", priceItemId: "DEV-LED" },
      { systemId: "s1", loadId: "studio-lights", priceItemId: "DEV-LED" },
    ]);
    expect(lineByKey(bom.lines, "device:DEV-FRIDGE")).toMatchObject({ quantity: 1, category: "device", unitCostMinor: 89000 });
    const led = lineByKey(bom.lines, "device:DEV-LED");
    expect(led.quantity).toBe(2);
    expect(led.detail).toContain("Cabin LED drivers");
    expect(led.detail).toContain("Studio LED drivers");
  });

  it("a load no longer in the layout is a warning; a device gone from the price list is a MISSING_PRICE", () => {
    const bom = buildBillOfMaterials([system(cabin, "s1")], [fridge], SETTINGS, [
      { systemId: "s1", loadId: "sauna", priceItemId: "DEV-FRIDGE" },
      { systemId: "s2", loadId: "fridge", priceItemId: "DEV-FRIDGE" },
      { systemId: "s1", loadId: "well-pump", priceItemId: "DEV-GONE" },
    ]);
    expect(bom.findings.filter((f) => f.code === "UNKNOWN_SUPPLIED_LOAD")).toHaveLength(2);
    // (the cabin's cable, lugs and fuses are not priced here: only the device findings matter)
    expect(bom.findings.filter((f) => f.code === "MISSING_PRICE" && f.need?.category === "device")).toHaveLength(1);
    expect(bom.lines.some((l) => l.key.startsWith("device:"))).toBe(false);
  });
});

describe("layouts that cannot be read", () => {
  it("no systems is a warning; a document that is not a network is an error naming the system", () => {
    expect(buildBillOfMaterials([], [], DEFAULTS).findings).toEqual([expect.objectContaining({ code: "NO_SYSTEMS", severity: "warning" })]);
    const bad = buildBillOfMaterials([system({ format: "runwright-system/1" }, "s1", "Broken shed")], [], DEFAULTS);
    expect(bad.lines).toEqual([]);
    expect(bad.findings).toEqual([expect.objectContaining({ code: "SYSTEM_NOT_SOLVED", severity: "error", message: expect.stringContaining("Broken shed") })]);
  });
});

describe("roundUpTo", () => {
  it("rounds up to the step and ignores floating-point dust only", () => {
    expect(roundUpTo(88.00000000000001, 1)).toBe(88); // 80 × 1.1
    expect(roundUpTo(27.060000000000002, 1)).toBe(28);
    expect(roundUpTo(1.0001, 1)).toBe(2); // a real excess is bought
    expect(roundUpTo(3.3, 0.25)).toBe(3.5);
    expect(roundUpTo(0.75, 0.25)).toBe(0.75);
    expect(roundUpTo(0, 1) === 0).toBe(true);
  });
});

describe("a missing cable price asks for the unit the layout is drawn in", () => {
  it("per ft when every run of the size is imperial, per m when any is metric", () => {
    // Garden (imperial, 10 AWG and 12 AWG) and a metric system with 10 AWG too: 12 AWG only in ft.
    const metric = network([{ id: "m1", length: 5, size: "10 AWG" }]);
    const bom = buildBillOfMaterials([system(example("garden-12v"), "g"), system(metric, "m")], [], SETTINGS);
    const needs = bom.findings.filter((f) => f.code === "MISSING_PRICE" && f.need?.category === "cable").map((f) => [f.need?.cableSize, f.need?.unit]);
    expect(needs).toEqual(expect.arrayContaining([["12 AWG", "ft"], ["10 AWG", "m"]]));
    expect(bom.lines.filter((l) => l.category === "cable")).toEqual([]);
  });
});
