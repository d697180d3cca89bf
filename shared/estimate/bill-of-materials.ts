// The bill of materials of a job, made from the layouts the engine checked: pure, no I/O.
//
// Rules (README "Estimates"):
//  - Cable, per conductor size and material: 2 conductors × one-way length × parallel sets
//    × (1 + waste %), in the price item's unit (m or ft), rounded up to a whole unit. A run with a
//    return size counts its − conductor under that size. Twin (2-conductor) cable items need half
//    the length. Of several matching items the cheapest per metre of conductor is used.
//  - Terminations: one at each end of every conductor: 2 ends × 2 conductors × parallel sets per
//    run, priced from a termination item for that size, or else from one for any size.
//  - Fuses: one per run with a fuse rating, from a fuse item with exactly that rating; plus one
//    holder (a fuse item without a rating) per fused run.
//  - Loads the contractor supplies: one each of the chosen device.
//  - Labour: minutes per run + minutes per metre of one-way run length + minutes per termination,
//    rounded up to the quarter hour, at the company's labour rate.
// A needed item with no price is a MISSING_PRICE finding and no line: never a silent zero.
import { METRES_PER_FOOT, normalizeSize } from "../engine/conductors.js";
import { systemSchema, type System } from "../engine/schema.js";
import type { EstimateFinding, GeneratedLine, PriceItem, PriceUnit, SuppliedLoad } from "../schemas/estimates.js";

export interface BomSystem {
  id: string;
  name: string;
  /** The stored network document (lengths already numbers in the system's units). */
  document: unknown;
}

export interface BomSettings {
  wastePercent: number;
  labourMinutesPerRun: number;
  labourMinutesPerMetre: number;
  labourMinutesPerTermination: number;
  /** Per hour, minor units. */
  labourRateMinor: number;
}

export interface BillOfMaterials {
  lines: GeneratedLine[];
  findings: EstimateFinding[];
}

type PriceLike = Pick<PriceItem, "id" | "sku" | "description" | "category" | "unit" | "unitCostMinor" | "sellPriceMinor" | "cableSize" | "cableMaterial" | "conductors" | "ratingA">;

/** Rounds a quantity up to the next whole unit, ignoring floating-point dust (88.00000000001 → 88). */
export function roundUpTo(quantity: number, step: number): number {
  const units = Math.ceil(quantity / step - 1e-9);
  return Math.round(units * step * 1000) / 1000;
}

const fmt = (n: number) => (Math.round(n * 100) / 100).toString();
const cheapest = <T extends PriceLike>(items: T[], cost: (i: T) => number): T | undefined =>
  [...items].sort((a, b) => cost(a) - cost(b) || a.sku.localeCompare(b.sku))[0];

/** Metres per item unit (cable is sold by the m or the ft). */
const metresPer = (unit: PriceUnit) => (unit === "ft" ? METRES_PER_FOOT : 1);

export function buildBillOfMaterials(systems: readonly BomSystem[], items: readonly PriceLike[], settings: BomSettings, supplied: readonly SuppliedLoad[] = []): BillOfMaterials {
  const findings: EstimateFinding[] = [];
  const lines: GeneratedLine[] = [];
  const waste = 1 + settings.wastePercent / 100;

  // conductor metres per material|size, and the runs behind them
  const cable = new Map<string, { material: "copper" | "aluminum"; size: string; metres: number; runs: Set<string>; imperial: boolean }>();
  const terminations = new Map<string, number>(); // size → count
  const fuses = new Map<number, number>(); // rating → count
  let fusedRuns = 0;
  let labourMinutes = 0;
  let terminationCount = 0;
  const parsed: Array<{ system: BomSystem; doc: System }> = [];

  if (systems.length === 0) {
    findings.push({ code: "NO_SYSTEMS", severity: "warning", message: "This job has no systems yet: add one to build the bill of materials from its layout." });
  }
  for (const system of systems) {
    const result = systemSchema.safeParse(system.document);
    if (!result.success) {
      findings.push({ code: "SYSTEM_NOT_SOLVED", severity: "error", message: `${system.name}: the layout is not complete (${result.error.issues[0]?.message ?? "invalid"}); fix it in the System editor.` });
      continue;
    }
    const doc = result.data;
    parsed.push({ system, doc });
    const toMetres = doc.units === "imperial" ? METRES_PER_FOOT : 1;
    for (const run of doc.runs) {
      const lengthM = (typeof run.length === "number" ? run.length : Number.NaN) * toMetres;
      if (!Number.isFinite(lengthM)) continue;
      const add = (size: string, conductors: number) => {
        const key = `${run.material}|${size}`;
        const entry = cable.get(key) ?? { material: run.material, size, metres: 0, runs: new Set<string>(), imperial: true };
        // A missing price is asked for per ft only when every run of the size is in an imperial system.
        entry.imperial &&= doc.units === "imperial";
        entry.metres += lengthM * conductors;
        entry.runs.add(`${system.id}/${run.id}`);
        cable.set(key, entry);
        terminations.set(size, (terminations.get(size) ?? 0) + 2 * conductors);
      };
      // The layout may spell a size as the engine reads it ("16" in a metric system, "10 awg");
      // the price list holds the label ("16 mm2", "10 AWG").
      const size = normalizeSize(run.size, doc.units) ?? run.size;
      const returnSize = run.returnSize ? (normalizeSize(run.returnSize, doc.units) ?? run.returnSize) : size;
      if (returnSize !== size) {
        add(size, run.parallel);
        add(returnSize, run.parallel);
      } else {
        add(size, 2 * run.parallel);
      }
      const ends = 4 * run.parallel;
      terminationCount += ends;
      labourMinutes += settings.labourMinutesPerRun + settings.labourMinutesPerMetre * lengthM;
      if (run.fuseA !== undefined) {
        fuses.set(run.fuseA, (fuses.get(run.fuseA) ?? 0) + 1);
        fusedRuns += 1;
      }
    }
  }
  labourMinutes += settings.labourMinutesPerTermination * terminationCount;

  const missing = (need: NonNullable<EstimateFinding["need"]>) =>
    findings.push({ code: "MISSING_PRICE", severity: "error", message: `No price for ${need.description}: add it to the price list.`, need });

  // Cable
  for (const entry of [...cable.values()].sort((a, b) => a.material.localeCompare(b.material) || a.size.localeCompare(b.size, "en", { numeric: true }))) {
    const candidates = items.filter((i) => i.category === "cable" && i.cableSize === entry.size && i.cableMaterial === entry.material);
    const perConductorMetre = (i: PriceLike) => i.unitCostMinor / (i.conductors ?? 1) / metresPer(i.unit);
    const item = cheapest(candidates, perConductorMetre);
    const label = `${entry.size.replace("mm2", "mm²")} ${entry.material} cable`;
    if (!item) {
      missing({ category: "cable", unit: entry.imperial ? "ft" : "m", cableSize: entry.size, cableMaterial: entry.material, ratingA: null, description: label });
      continue;
    }
    const per = item.conductors ?? 1;
    const exact = (entry.metres * waste) / per / metresPer(item.unit);
    const quantity = roundUpTo(exact, 1);
    const conductorLength = entry.metres / metresPer(item.unit);
    lines.push({
      key: `cable:${entry.material}:${entry.size}`,
      category: "cable",
      description: item.description,
      detail: `${fmt(conductorLength)} ${item.unit} of conductor in ${entry.runs.size} run${entry.runs.size === 1 ? "" : "s"}${per === 2 ? " ÷ 2 conductors per cable" : ""} + ${fmt(settings.wastePercent)} % waste`,
      priceItemId: item.id,
      sku: item.sku,
      quantity,
      unit: item.unit,
      unitCostMinor: item.unitCostMinor,
      sellPriceMinor: item.sellPriceMinor,
    });
  }

  // Terminations
  for (const [size, count] of [...terminations.entries()].sort((a, b) => a[0].localeCompare(b[0], "en", { numeric: true }))) {
    const forSize = items.filter((i) => i.category === "termination" && i.cableSize === size);
    const any = items.filter((i) => i.category === "termination" && i.cableSize === null);
    const item = cheapest(forSize.length ? forSize : any, (i) => i.unitCostMinor);
    const label = `terminations for ${size.replace("mm2", "mm²")}`;
    if (!item) {
      missing({ category: "termination", unit: "each", cableSize: size, cableMaterial: null, ratingA: null, description: label });
      continue;
    }
    lines.push({
      key: `termination:${size}`,
      category: "termination",
      description: item.description,
      detail: `${count} conductor ends of ${size.replace("mm2", "mm²")}`,
      priceItemId: item.id,
      sku: item.sku,
      quantity: count,
      unit: item.unit,
      unitCostMinor: item.unitCostMinor,
      sellPriceMinor: item.sellPriceMinor,
    });
  }

  // Fuses and holders
  for (const [rating, count] of [...fuses.entries()].sort((a, b) => a[0] - b[0])) {
    const item = cheapest(items.filter((i) => i.category === "fuse" && i.ratingA === rating), (i) => i.unitCostMinor);
    if (!item) {
      missing({ category: "fuse", unit: "each", cableSize: null, cableMaterial: null, ratingA: rating, description: `a ${fmt(rating)} A fuse` });
      continue;
    }
    lines.push({ key: `fuse:${rating}`, category: "fuse", description: item.description, detail: `${count} fused run${count === 1 ? "" : "s"} at ${fmt(rating)} A`, priceItemId: item.id, sku: item.sku, quantity: count, unit: item.unit, unitCostMinor: item.unitCostMinor, sellPriceMinor: item.sellPriceMinor });
  }
  if (fusedRuns > 0) {
    const holder = cheapest(items.filter((i) => i.category === "fuse" && i.ratingA === null), (i) => i.unitCostMinor);
    if (!holder) missing({ category: "fuse", unit: "each", cableSize: null, cableMaterial: null, ratingA: null, description: "a fuse holder (a fuse item without a rating)" });
    else lines.push({ key: "fuse-holder", category: "fuse", description: holder.description, detail: `one per fused run (${fusedRuns})`, priceItemId: holder.id, sku: holder.sku, quantity: fusedRuns, unit: holder.unit, unitCostMinor: holder.unitCostMinor, sellPriceMinor: holder.sellPriceMinor });
  }

  // Loads the contractor supplies
  const devices = new Map<string, string[]>(); // price item id → load names
  for (const s of supplied) {
    const entry = parsed.find((p) => p.system.id === s.systemId);
    const load = entry?.doc.loads.find((l) => l.id === s.loadId);
    if (!entry || !load) {
      findings.push({ code: "UNKNOWN_SUPPLIED_LOAD", severity: "warning", message: `A supplied load (${s.loadId}) is no longer in the layout; it is left out.` });
      continue;
    }
    devices.set(s.priceItemId, [...(devices.get(s.priceItemId) ?? []), load.name ?? load.id]);
  }
  for (const [itemId, names] of devices) {
    const item = items.find((i) => i.id === itemId);
    if (!item) {
      missing({ category: "device", unit: "each", cableSize: null, cableMaterial: null, ratingA: null, description: `the device chosen for ${names.join(", ")} (it was removed from the price list)` });
      continue;
    }
    lines.push({ key: `device:${itemId}`, category: item.category, description: item.description, detail: `supplied for ${names.join(", ")}`, priceItemId: item.id, sku: item.sku, quantity: names.length, unit: item.unit, unitCostMinor: item.unitCostMinor, sellPriceMinor: item.sellPriceMinor });
  }

  // Labour
  if (labourMinutes > 0) {
    const hours = roundUpTo(labourMinutes / 60, 0.25);
    if (settings.labourRateMinor <= 0) {
      findings.push({ code: "NO_LABOUR_RATE", severity: "warning", message: `Labour comes to ${fmt(hours)} h but your labour rate is 0: set it in Settings.` });
    }
    lines.push({
      key: "labour",
      category: "labour",
      description: "Installation labour",
      detail: `${fmt(labourMinutes)} min for runs and ${terminationCount} terminations, rounded up to the quarter hour`,
      priceItemId: null,
      sku: null,
      quantity: hours,
      unit: "hour",
      unitCostMinor: settings.labourRateMinor,
      sellPriceMinor: null,
    });
  }
  return { lines, findings };
}
