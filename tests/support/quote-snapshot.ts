// Quote snapshots of an invented job for the PDF tests and the PDF benchmark. The names, places
// and firms are made up. Lines and totals come from the real pricing (shared/estimate), so the
// totals always add up the way a saved quote's do; every snapshot is checked against the contract
// schema before it is returned.
import { CAUTIONS } from "../../shared/engine/cautions.js";
import { priceEstimate } from "../../shared/estimate/index.js";
import { QuoteSnapshotSchema, type EstimateSettings, type GeneratedLine, type ManualLine, type QuoteSnapshot, type SnapshotSystem } from "../../shared/schemas/estimates.js";

/** A 64 × 24 PNG: a copper zigzag on slate, standing in for a company logo. */
export const SAMPLE_LOGO_PNG_BASE64 =
  "iVBORw0KGgoAAAANSUhEUgAAAEAAAAAYCAIAAADF1mwTAAAAc0lEQVR42u2WsQ3AMAgEbxMPkC5NNsqMGS9FajCp4KWXqKwTr7MtbNZxSRcWsIAFLDBT4LnPX426eCL6q3r3Lp6ELmb08iSulYx2nvyk8owJPNtew9dR2emIR+WuRzwq0ybiUZn3EY/Ki+vPnAUsYIGZ9QIrOqFuH1qpZQAAAABJRU5ErkJggg==";

const SETTINGS: EstimateSettings = {
  markupPercent: 25,
  discountMinor: 150_00,
  taxRatePercent: 8.25,
  depositMode: "percent",
  depositPercent: 30,
  depositFixedMinor: 0,
  wastePercent: 10,
};

type RunInput = Omit<SnapshotSystem["runs"][number], "name" | "returnSize" | "parallel" | "material" | "ampacityA"> &
  Partial<Pick<SnapshotSystem["runs"][number], "name" | "returnSize" | "parallel" | "material" | "ampacityA">>;

const run = (r: RunInput): SnapshotSystem["runs"][number] => ({ name: "", returnSize: null, parallel: 1, material: "copper", ampacityA: null, ...r });

/** System 1: a 24 V battery bank feeding a pump shed and a cabin; lengths in metres. */
function cabinSystem(): SnapshotSystem {
  return {
    id: "8d0f6a7e-3b7c-4f0e-9d8e-0a4c2b1f5e01",
    name: "Cabin 24 V bank",
    nominalVoltage: 24,
    units: "metric",
    limitProfile: { name: "Cabin standard", branchPercent: 3, totalPercent: 5, criticalPercent: 3 },
    solved: true,
    caseNames: ["Evening, all on", "Pump start"],
    points: [
      { id: "bus", name: "Battery bus bar" },
      { id: "shed", name: "Pump shed junction box" },
      { id: "pump", name: "Well pump controller" },
      { id: "cabin", name: "Cabin distribution block" },
      { id: "fridge", name: "Galley fridge outlet" },
      { id: "studio", name: "Studio light track" },
    ],
    loads: [
      { id: "pump", name: "Well pump", worstCase: "Pump start", voltage: 23.35, dropPercent: 2.71, limitPercent: 3, status: "near" },
      { id: "fridge", name: "Galley fridge", worstCase: "Evening, all on", voltage: 23.79, dropPercent: 0.88, limitPercent: 3, status: "within" },
      { id: "studio", name: "Studio lights", worstCase: "Evening, all on", voltage: 23.13, dropPercent: 3.62, limitPercent: 3, status: "over" },
    ],
    runs: [
      run({ id: "feed-shed", from: "bus", to: "shed", size: "16 mm2", length: 8, fuseA: 60, maxCurrentA: 38.2, ampacityA: 85 }),
      run({ id: "shed-pump", name: "Pump tail", from: "shed", to: "pump", size: "16 mm2", length: 22, fuseA: null, maxCurrentA: 38.2 }),
      run({ id: "feed-cabin", from: "bus", to: "cabin", size: "35 mm2", returnSize: "25 mm2", parallel: 2, length: 12.5, fuseA: 125, maxCurrentA: 96.4 }),
      run({ id: "cabin-fridge", from: "cabin", to: "fridge", size: "4 mm2", length: 6.4, fuseA: 15, maxCurrentA: 6.1 }),
      run({ id: "cabin-studio", from: "cabin", to: "studio", size: "2.5 mm2", length: 17, fuseA: 10, maxCurrentA: 7.9 }),
    ],
    findings: [{ severity: "error", message: "Load studio is over limit: 3.62 % branch voltage drop in \"Evening, all on\" against a limit of 3 %." }],
    document: { format: "runwright-system/1", name: "Cabin 24 V bank", units: "metric", nominalVoltage: 24 },
  };
}

/** System 2: a 12 V boathouse with a winch and dock lights; lengths in feet. */
function boathouseSystem(): SnapshotSystem {
  return {
    id: "8d0f6a7e-3b7c-4f0e-9d8e-0a4c2b1f5e02",
    name: "Boathouse 12 V",
    nominalVoltage: 12,
    units: "imperial",
    limitProfile: { name: "Dock circuits", branchPercent: 3, totalPercent: 10, criticalPercent: 3 },
    solved: true,
    caseNames: ["Winch hauling", "Night lighting"],
    points: [
      { id: "bh-bus", name: "Boathouse battery" },
      { id: "post", name: "Dock post" },
      { id: "winch", name: "Anchor winch contactor" },
      { id: "lights", name: "Dock light string" },
      { id: "bilge", name: "Bilge pump float switch" },
    ],
    loads: [
      { id: "winch", name: "Anchor winch", worstCase: "Winch hauling", voltage: 10.66, dropPercent: 11.2, limitPercent: 10, status: "over" },
      { id: "lights", name: "Dock lights", worstCase: "Night lighting", voltage: 11.86, dropPercent: 1.2, limitPercent: 3, status: "within" },
      { id: "bilge", name: "Bilge pump", worstCase: "Winch hauling", voltage: 11.68, dropPercent: 2.65, limitPercent: 3, status: "near" },
    ],
    runs: [
      run({ id: "bh-post", from: "bh-bus", to: "post", size: "2/0 AWG", material: "aluminum", length: 40, fuseA: 150, maxCurrentA: 121.5 }),
      run({ id: "post-winch", from: "post", to: "winch", size: "4 AWG", length: 18, fuseA: null, maxCurrentA: 110 }),
      run({ id: "post-lights", from: "post", to: "lights", size: "14 AWG", length: 65, fuseA: 7.5, maxCurrentA: 2.4 }),
      run({ id: "post-bilge", from: "post", to: "bilge", size: "10 AWG", length: 23.5, fuseA: 20, maxCurrentA: 9 }),
    ],
    findings: [],
    document: { format: "runwright-system/1", name: "Boathouse 12 V", units: "imperial", nominalVoltage: 12 },
  };
}

const gen = (key: string, category: GeneratedLine["category"], description: string, detail: string, sku: string | null, quantity: number, unit: GeneratedLine["unit"], unitCostMinor: number, sellPriceMinor: number | null = null): GeneratedLine => ({
  key,
  category,
  description,
  detail,
  priceItemId: null,
  sku,
  quantity,
  unit,
  unitCostMinor,
  sellPriceMinor,
});

function sampleGenerated(): GeneratedLine[] {
  return [
    gen("cable:copper:16 mm2", "cable", "Tinned copper cable 16 mm², single core", "2 conductors × 30 m × 1 set + 10 % waste", "CU-16-1C", 66, "m", 412),
    gen("cable:copper:35 mm2", "cable", "Tinned copper cable 35 mm², single core", "2 conductors × 12.5 m × 2 sets + 10 % waste", "CU-35-1C", 28, "m", 1034),
    gen("cable:copper:25 mm2", "cable", "Tinned copper cable 25 mm², single core", "return of the cabin feeder: 12.5 m × 2 sets + 10 % waste", "CU-25-1C", 28, "m", 760),
    gen("cable:copper:4 mm2", "cable", "Twin copper cable 4 mm²", "2 conductors × 6.4 m + 10 % waste, twin cable", "CU-4-2C", 8, "m", 218),
    gen("cable:aluminum:2/0 AWG", "cable", "Aluminum cable 2/0 AWG, single conductor", "2 conductors × 40 ft + 10 % waste", "AL-2/0", 88, "ft", 295),
    gen("cable:copper:14 AWG", "cable", "Duplex copper cable 14 AWG", "2 conductors × 65 ft + 10 % waste, duplex", "CU-14-DX", 72, "ft", 61),
    gen("fuse:150", "fuse", "Bolt-down fuse 150 A", "1 fused run", "FZ-150", 1, "each", 1890, 2900),
    gen("fuse:125", "fuse", "Bolt-down fuse 125 A", "1 fused run", "FZ-125", 1, "each", 1790, 2750),
    gen("fuse-holder", "fuse", "Fuse holder, sealed", "one per fused run", "FH-SEAL", 8, "each", 940),
    gen("termination:16 mm2", "termination", "Crimp lug 16 mm², tinned", "2 ends × 2 conductors × 2 runs", "LUG-16", 8, "each", 95),
    gen("termination:any", "termination", "Heat-shrink crimp terminal", "2 ends × 2 conductors, sizes without their own lug", "TERM-HS", 42, "each", 38),
    gen("device:pump", "device", "Well pump controller, 24 V", "supplied by us", "DEV-WPC24", 1, "each", 31800),
    gen("labour", "labour", "Installation labour", "9 runs × 20 min + 182 m × 1.5 min + 58 terminations × 4 min, rounded up to the quarter hour", "LAB", 12.25, "hour", 8500),
  ];
}

function sampleManual(): ManualLine[] {
  return [
    { id: "2f1c6b8a-1d4e-4b7a-8f3a-6c5d9e0b7a11", category: "other", description: "Cable tray and saddles, pump shed wall", quantity: 1, unit: "each", unitCostMinor: 6400, markupPercent: null },
    { id: "2f1c6b8a-1d4e-4b7a-8f3a-6c5d9e0b7a12", category: "labour", description: "Commissioning and voltage checks on site", quantity: 2.5, unit: "hour", unitCostMinor: 8500, markupPercent: 0 },
  ];
}

function baseSnapshot(generated: GeneratedLine[], manual: ManualLine[]): QuoteSnapshot {
  const priced = priceEstimate({ generated, manual, overrides: {}, settings: SETTINGS });
  return {
    company: {
      name: "Kestrel Creek DC Works",
      licenceNumber: "LV-20418",
      contactEmail: "quotes@kestrelcreek.example",
      phone: "+1 555 0142",
      address: "14 Foundry Row, Millbrook Harbour, ME 04099",
      logo: { mediaType: "image/png", base64: SAMPLE_LOGO_PNG_BASE64 },
    },
    client: { name: "Morwenna Ashdale", email: "morwenna@ashdale.example", phone: "+1 555 0178", billingAddress: "3 Larchmere Lane, Saltmarsh Cove, ME 04100" },
    job: { id: "5b7e2c1d-9a8f-4e3b-a2c1-0d9e8f7a6b5c", title: "Off-grid cabin and boathouse wiring", siteAddress: "Larchmere Point, Lot 7, Saltmarsh Cove" },
    currency: "USD",
    number: "Q-2026-0042",
    revision: 2,
    issuedAt: "2026-03-04T15:20:00.000Z",
    validUntil: "2026-04-03",
    terms:
      "Prices are fixed for the items and lengths listed while the quote is valid. Work beyond the scope above is charged at the labour rate after your agreement.\n\nThe deposit secures materials and a start date; the balance is due on completion. Equipment supplied by you is installed as delivered.",
    scope: [
      "Supply and install the 24 V battery feeders to the pump shed and the cabin distribution block.",
      "Wire the well pump, galley fridge and studio lights from the cabin block, each with its own fuse.",
      "Run the 12 V boathouse circuits to the dock post: anchor winch, dock lights and bilge pump.",
      "Label every conductor at both ends and hand over the cut list and voltage-drop results.",
    ],
    lines: priced.lines,
    totals: priced.totals,
    systems: [cabinSystem(), boathouseSystem()],
    cautions: [...CAUTIONS],
    wastePercent: SETTINGS.wastePercent,
  };
}

/** The sample job; `overrides` replace whole top-level fields (spread the sample's own to edit one). */
export function sampleSnapshot(overrides: Partial<QuoteSnapshot> = {}): QuoteSnapshot {
  return QuoteSnapshotSchema.parse({ ...baseSnapshot(sampleGenerated(), sampleManual()), ...overrides });
}

const LARGE_ITEMS: Array<[GeneratedLine["category"], string, GeneratedLine["unit"], number]> = [
  ["cable", "Tinned copper cable, single core", "m", 520],
  ["cable", "Duplex copper cable", "ft", 74],
  ["fuse", "Blade fuse and inline holder", "each", 410],
  ["termination", "Crimp lug, tinned, with boot", "each", 88],
  ["device", "Isolator switch, sealed", "each", 2650],
  ["labour", "Pull, terminate and label run", "hour", 8500],
  ["other", "Cable ties, saddles and glands", "each", 1275],
];

/** The sample job with `lineCount` priced lines spread over every category (for the benchmark). */
export function largeSnapshot(lineCount: number): QuoteSnapshot {
  const generated = Array.from({ length: lineCount }, (_, i) => {
    const [category, description, unit, cost] = LARGE_ITEMS[i % LARGE_ITEMS.length];
    const n = i + 1;
    const quantity = unit === "hour" ? 0.25 * ((n % 12) + 1) : unit === "each" ? (n % 9) + 1 : 4 + ((n * 7) % 60) + 0.5 * (n % 2);
    return gen(`bench:${n}`, category, `${description}, item ${n}`, `run W${1 + (n % 2)}.${String(n).padStart(2, "0")}: ${formatQuantity(quantity)} ${unit}`, `BN-${String(n).padStart(4, "0")}`, quantity, unit, cost + (n % 13) * 7);
  });
  return QuoteSnapshotSchema.parse(baseSnapshot(generated, []));
}

function formatQuantity(q: number): string {
  return String(Math.round(q * 1000) / 1000);
}
