// Money and pricing: integer minor units, half up once per line and once per discount, tax and
// deposit; totals are sums of rounded lines. Expected values are worked out by hand beside each.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { diffGenerated, priceEstimate } from "../../../shared/estimate/index.js";
import { formatMoney, lineAmount, minorToPlain, parseMoney, percentOf, withMarkup } from "../../../shared/money.js";
import type { EstimateSettings, GeneratedLine, LineOverride, ManualLine } from "../../../shared/schemas/estimates.js";

const SETTINGS: EstimateSettings = { markupPercent: 20, discountMinor: 0, taxRatePercent: 0, depositMode: "percent", depositPercent: 30, depositFixedMinor: 0, wastePercent: 10 };

function generated(values: Partial<GeneratedLine> & Pick<GeneratedLine, "key" | "quantity" | "unitCostMinor">): GeneratedLine {
  return { category: "cable", description: values.key, detail: "", priceItemId: `item-${values.key}`, sku: values.key, unit: "m", sellPriceMinor: null, ...values };
}
function manual(values: Partial<ManualLine> & Pick<ManualLine, "id" | "quantity" | "unitCostMinor">): ManualLine {
  return { category: "other", description: values.id, unit: "each", markupPercent: null, ...values };
}
const labour = (hours: number, rate: number) => generated({ key: "labour", category: "labour", unit: "hour", quantity: hours, unitCostMinor: rate, priceItemId: null, sku: null });

const price = (input: { generated?: GeneratedLine[]; manual?: ManualLine[]; overrides?: Record<string, LineOverride>; settings?: Partial<EstimateSettings> }) =>
  priceEstimate({ generated: input.generated ?? [], manual: input.manual ?? [], overrides: input.overrides ?? {}, settings: { ...SETTINGS, ...input.settings } });

describe("money rounding (shared/money.ts)", () => {
  it("multiplies a quantity by a unit price exactly and rounds half up at the cent", () => {
    expect(lineAmount(0.25, 9500)).toBe(2375); // 0.25 h × $95.00 = $23.75 exactly
    expect(lineAmount(1.005, 100)).toBe(101); // 1.005 × 100 = 100.5 → 101 (1.005 * 100 in floats is 100.49999999999999)
    expect(lineAmount(0.29, 100)).toBe(29); // 0.29 * 100 in floats is 28.999999999999996
    expect(lineAmount(0.125, 4)).toBe(1); // 0.5 → 1 (half up, not half to even: that would give 0)
    expect(lineAmount(0.375, 4)).toBe(2); // 1.5 → 2
    expect(lineAmount(0.625, 4)).toBe(3); // 2.5 → 3 (half to even would give 2)
    expect(lineAmount(0.124, 4)).toBe(0); // 0.496 → 0
    expect(lineAmount(3, 335)).toBe(1005);
    expect(lineAmount(88, 460)).toBe(40480); // 88 m × $4.60
    expect(lineAmount(0, 460)).toBe(0);
  });

  it("takes a percentage half up", () => {
    expect(percentOf(1001, 12.5)).toBe(125); // 125.125 → 125
    expect(withMarkup(1001, 12.5)).toBe(1126); // 1001 + 125
    expect(percentOf(10000, 8.875)).toBe(888); // 887.5 → 888
    expect(percentOf(9999, 8.875)).toBe(887); // 887.41125 → 887
    expect(percentOf(10001, 8.875)).toBe(888); // 887.58875 → 888
    expect(percentOf(1, 50)).toBe(1); // 0.5 → 1
    expect(percentOf(5, 50)).toBe(3); // 2.5 → 3
    expect(percentOf(12345, 0)).toBe(0);
    expect(percentOf(12345, 100)).toBe(12345);
    expect(percentOf(1000, 8.11)).toBe(81); // 81.1 → 81 (8.11 × 1000 is 8109.999999999999 in floats)
  });

  it("keeps large products exact (through BigInt)", () => {
    // 999,999.999 × 100,000,000 cents = 99,999,999,900,000,000 thousandths ÷ 1000 = 99,999,999,900,000 cents
    const expected = (999_999_999n * 100_000_000n) / 1000n;
    expect(expected).toBe(99_999_999_900_000n);
    expect(lineAmount(999_999.999, 100_000_000)).toBe(Number(expected));
    // 123,456.789 m × $9,999,999.99: 123,456,789 × 999,999,999 = 123,456,788,876,543,211 thousandths → 123,456,788,876,543.211 → …543
    expect(lineAmount(123_456.789, 999_999_999)).toBe(123_456_788_876_543);
    // 99,999,999,900,000 × 8.875 % = 8,874,999,991,125 exactly
    expect(percentOf(99_999_999_900_000, 8.875)).toBe(8_874_999_991_125);
  });

  it("parses and writes amounts in major units", () => {
    expect(parseMoney("12.50", "USD")).toBe(1250);
    expect(parseMoney("$1,234.5", "USD")).toBe(123450);
    expect(parseMoney("0.1", "USD")).toBe(10);
    expect(parseMoney("12.345", "USD")).toBeNull(); // more decimals than the currency has
    // A decimal comma is refused, never read as a thousands separator (12,50 is not 1,250.00).
    expect(parseMoney("12,50", "USD")).toBeNull();
    expect(parseMoney("1,5", "USD")).toBeNull();
    expect(parseMoney("12,345,678.90", "USD")).toBe(1234567890);
    // Words around a number are refused, not skipped.
    expect(parseMoney("abc5", "USD")).toBeNull();
    expect(parseMoney("approx 5", "USD")).toBeNull();
    expect(parseMoney("1200", "JPY")).toBe(1200);
    expect(parseMoney("12.5", "JPY")).toBeNull();
    expect(parseMoney("abc", "USD")).toBeNull();
    expect(minorToPlain(123450, "USD")).toBe("1234.50");
    expect(minorToPlain(5, "USD")).toBe("0.05");
    expect(minorToPlain(1200, "JPY")).toBe("1200");
    expect(formatMoney(123450, "USD")).toBe("$1,234.50");
  });
});

describe("priceEstimate", () => {
  it("sells a line at cost plus the estimate's markup", () => {
    const { lines, totals } = price({ generated: [generated({ key: "cable:copper:16 mm2", quantity: 80, unitCostMinor: 460 })] });
    // cost 80 × 460 = 36,800; sell 36,800 × 1.2 = 44,160
    expect(lines[0]).toMatchObject({ costMinor: 36800, sellMinor: 44160, markupPercent: 20, overridden: false, source: "layout" });
    expect(totals).toMatchObject({ costMinor: 36800, subtotalMinor: 44160, marginMinor: 7360 });
  });

  it("rounds the markup half up once per line: 12.5 % on 1,001 cents is 1,126", () => {
    const { lines } = price({ generated: [generated({ key: "x", quantity: 1, unitCostMinor: 1001 })], settings: { markupPercent: 12.5 } });
    // 1001 × 12.5 % = 125.125 → 125; 1001 + 125 = 1126
    expect(lines[0].sellMinor).toBe(1126);
  });

  it("charges labour from the layout at the labour rate (markup 0) unless overridden", () => {
    const plain = price({ generated: [labour(2.5, 9500)] });
    // 2.5 h × 9,500 = 23,750, no markup although the estimate's is 20 %
    expect(plain.lines[0]).toMatchObject({ costMinor: 23750, sellMinor: 23750, markupPercent: 0, overridden: false });
    const marked = price({ generated: [labour(2.5, 9500)], overrides: { labour: { markupPercent: 10 } } });
    // 23,750 × 1.1 = 26,125
    expect(marked.lines[0]).toMatchObject({ sellMinor: 26125, markupPercent: 10, overridden: true });
  });

  it("a manual labour line takes the estimate's markup (only the layout's labour is at cost)", () => {
    const { lines } = price({ manual: [manual({ id: "m1", category: "labour", unit: "hour", quantity: 1, unitCostMinor: 9500 })] });
    // 9,500 × 1.2 = 11,400
    expect(lines[0]).toMatchObject({ key: "manual:m1", source: "manual", sellMinor: 11400, markupPercent: 20 });
  });

  it("an item's sell price replaces cost + markup; a markup override on the line wins over the sell price", () => {
    const line = generated({ key: "cable:copper:16 mm2", quantity: 80, unitCostMinor: 460, sellPriceMinor: 600 });
    const fixed = price({ generated: [line] });
    // sell 80 × 600 = 48,000; cost stays 80 × 460 = 36,800
    expect(fixed.lines[0]).toMatchObject({ costMinor: 36800, sellMinor: 48000, markupPercent: null });
    const overridden = price({ generated: [line], overrides: { [line.key]: { markupPercent: 15 } } });
    // 36,800 × 1.15 = 42,320
    expect(overridden.lines[0]).toMatchObject({ sellMinor: 42320, markupPercent: 15, overridden: true });
  });

  it("a per-line override of quantity and markup applies to that line only", () => {
    const a = generated({ key: "a", quantity: 80, unitCostMinor: 460 });
    const b = generated({ key: "b", quantity: 10, unitCostMinor: 100 });
    const { lines, totals } = price({ generated: [a, b], overrides: { a: { quantity: 100, markupPercent: 0 } } });
    // a: 100 × 460 = 46,000 at 0 %; b: 10 × 100 = 1,000 × 1.2 = 1,200
    expect(lines.map((l) => [l.key, l.quantity, l.costMinor, l.sellMinor, l.overridden])).toEqual([
      ["a", 100, 46000, 46000, true],
      ["b", 10, 1000, 1200, false],
    ]);
    expect(totals.subtotalMinor).toBe(47200);
    // an override for a key no line has changes nothing
    expect(price({ generated: [b], overrides: { gone: { quantity: 5 } } }).totals.subtotalMinor).toBe(1200);
  });

  it("a manual line's own markup replaces the estimate's", () => {
    const { lines } = price({ manual: [manual({ id: "m1", quantity: 2, unitCostMinor: 1250, markupPercent: 50 }), manual({ id: "m2", quantity: 0.25, unitCostMinor: 9500 })] });
    // m1: 2 × 1,250 = 2,500 × 1.5 = 3,750; m2: 0.25 × 9,500 = 2,375 × 1.2 = 2,850
    expect(lines.map((l) => [l.key, l.costMinor, l.sellMinor, l.overridden])).toEqual([
      ["manual:m1", 2500, 3750, true],
      ["manual:m2", 2375, 2850, false],
    ]);
  });

  it("applies the discount, then the tax on what is left, half up: 8.875 %", () => {
    const { totals, findings } = price({ generated: [generated({ key: "x", quantity: 1, unitCostMinor: 11000 })], settings: { markupPercent: 0, discountMinor: 1000, taxRatePercent: 8.875 } });
    // subtotal 11,000 − discount 1,000 = 10,000 taxable; tax 887.5 → 888; total 10,888
    expect(totals).toMatchObject({ subtotalMinor: 11000, discountMinor: 1000, taxableMinor: 10000, taxRatePercent: 8.875, taxMinor: 888, totalMinor: 10888 });
    // deposit 30 % of 10,888 = 3,266.4 → 3,266
    expect(totals.depositMinor).toBe(3266);
    expect(findings).toEqual([]);
  });

  it("caps the discount at the subtotal with a DISCOUNT_CAPPED warning", () => {
    const { totals, findings } = price({ generated: [generated({ key: "x", quantity: 1, unitCostMinor: 1000 })], settings: { markupPercent: 0, discountMinor: 5000, taxRatePercent: 10 } });
    expect(totals).toMatchObject({ subtotalMinor: 1000, discountMinor: 1000, taxableMinor: 0, taxMinor: 0, totalMinor: 0, depositMinor: 0 });
    expect(findings).toEqual([expect.objectContaining({ code: "DISCOUNT_CAPPED", severity: "warning" })]);
    // a discount equal to the subtotal is not capped
    expect(price({ generated: [generated({ key: "x", quantity: 1, unitCostMinor: 1000 })], settings: { markupPercent: 0, discountMinor: 1000 } }).findings).toEqual([]);
  });

  it("takes the deposit as a percentage of the total or a fixed amount at most the total", () => {
    const lines = [generated({ key: "x", quantity: 1, unitCostMinor: 10000 })];
    // total 10,000 × 1.2 = 12,000; 12.5 % = 1,500
    expect(price({ generated: lines, settings: { depositPercent: 12.5 } }).totals.depositMinor).toBe(1500);
    expect(price({ generated: lines, settings: { depositMode: "fixed", depositFixedMinor: 2000 } }).totals.depositMinor).toBe(2000);
    // 50,000 fixed > 12,000 total → 12,000
    expect(price({ generated: lines, settings: { depositMode: "fixed", depositFixedMinor: 50000 } }).totals.depositMinor).toBe(12000);
    // the percentage is not used in fixed mode
    expect(price({ generated: lines, settings: { depositMode: "fixed", depositPercent: 50, depositFixedMinor: 0 } }).totals.depositMinor).toBe(0);
  });

  it("an empty estimate totals zero", () => {
    const { totals, lines } = price({});
    expect(lines).toEqual([]);
    expect(totals).toMatchObject({ costMinor: 0, subtotalMinor: 0, discountMinor: 0, taxMinor: 0, totalMinor: 0, depositMinor: 0, marginMinor: 0 });
  });

  it("keeps a large estimate exact", () => {
    const { lines, totals } = price({ generated: [generated({ key: "x", quantity: 999_999.999, unitCostMinor: 100_000_000 })], settings: { markupPercent: 0, taxRatePercent: 8.875 } });
    expect(lines[0].costMinor).toBe(99_999_999_900_000);
    expect(totals.taxMinor).toBe(8_874_999_991_125);
    // 99,999,999,900,000 + 8,874,999,991,125
    expect(totals.totalMinor).toBe(108_874_999_891_125);
  });

  describe("totals are the sums of the rounded lines (property)", () => {
    /** a × b / c rounded half up, for a, b ≥ 0: the rule of shared/money.ts, written out independently. */
    const halfUp = (a: bigint, c: bigint) => (a * 2n + c) / (2n * c);
    const milli = fc.integer({ min: 0, max: 1_000_000_000 }); // 0 … 1,000,000.000
    const cents = fc.integer({ min: 0, max: 10_000_000 });
    const pct = (max: number) => fc.integer({ min: 0, max: max * 1000 }).map((n) => n / 1000);
    const genLine = fc.record({ quantityMilli: milli, unitCostMinor: cents, sellPriceMinor: fc.option(cents, { nil: null }), labour: fc.boolean(), overrideMarkup: fc.option(pct(200), { nil: undefined }), overrideQuantityMilli: fc.option(milli, { nil: undefined }) });
    const manLine = fc.record({ quantityMilli: milli, unitCostMinor: cents, markupPercent: fc.option(pct(200), { nil: null }) });

    it("for random lines and settings", () => {
      fc.assert(
        fc.property(
          fc.array(genLine, { maxLength: 12 }),
          fc.array(manLine, { maxLength: 6 }),
          fc.record({ markupPercent: pct(1000), discountMinor: fc.integer({ min: 0, max: 100_000_000 }), taxRatePercent: pct(100), depositPercent: pct(100), depositFixed: fc.option(fc.integer({ min: 0, max: 100_000_000 }), { nil: null }) }),
          (gen, man, s) => {
            const generatedLines = gen.map((g, i) =>
              g.labour
                ? labour(g.quantityMilli / 1000, g.unitCostMinor)
                : generated({ key: `g${i}`, quantity: g.quantityMilli / 1000, unitCostMinor: g.unitCostMinor, sellPriceMinor: g.sellPriceMinor }),
            );
            // at most one layout labour line (its key is "labour")
            const seen = new Set<string>();
            const unique = generatedLines.filter((l) => (seen.has(l.key) ? false : (seen.add(l.key), true)));
            const overrides: Record<string, LineOverride> = {};
            gen.forEach((g, i) => {
              const key = g.labour ? "labour" : `g${i}`;
              const o: LineOverride = {};
              if (g.overrideMarkup !== undefined) o.markupPercent = g.overrideMarkup;
              if (g.overrideQuantityMilli !== undefined) o.quantity = g.overrideQuantityMilli / 1000;
              if (Object.keys(o).length && !(key in overrides)) overrides[key] = o;
            });
            const manualLines = man.map((m, i) => manual({ id: `m${i}`, quantity: m.quantityMilli / 1000, unitCostMinor: m.unitCostMinor, markupPercent: m.markupPercent }));
            const settings: EstimateSettings = {
              ...SETTINGS,
              markupPercent: s.markupPercent,
              discountMinor: s.discountMinor,
              taxRatePercent: s.taxRatePercent,
              depositMode: s.depositFixed === null ? "percent" : "fixed",
              depositPercent: s.depositPercent,
              depositFixedMinor: s.depositFixed ?? 0,
            };
            const { lines, totals, findings } = priceEstimate({ generated: unique, manual: manualLines, overrides, settings });
            expect(lines).toHaveLength(unique.length + manualLines.length);

            // every line against the rule, computed here with BigInt
            for (const line of lines) {
              const qty = BigInt(Math.round(line.quantity * 1000));
              const cost = halfUp(qty * BigInt(line.unitCostMinor), 1000n);
              expect(BigInt(line.costMinor)).toBe(cost);
              const source = unique.find((g) => g.key === line.key);
              if (line.markupPercent === null) {
                expect(source?.sellPriceMinor).not.toBeNull();
                expect(BigInt(line.sellMinor)).toBe(halfUp(qty * BigInt(source?.sellPriceMinor as number), 1000n));
              } else {
                expect(BigInt(line.sellMinor)).toBe(cost + halfUp(cost * BigInt(Math.round(line.markupPercent * 1000)), 100_000n));
              }
            }

            const sum = (f: (l: (typeof lines)[number]) => number) => lines.reduce((a, l) => a + BigInt(f(l)), 0n);
            for (const v of Object.values(totals)) expect(Number.isInteger(v) || v === totals.taxRatePercent).toBe(true);
            expect(BigInt(totals.subtotalMinor)).toBe(sum((l) => l.sellMinor));
            expect(BigInt(totals.costMinor)).toBe(sum((l) => l.costMinor));
            expect(totals.marginMinor).toBe(totals.subtotalMinor - totals.costMinor);
            expect(totals.discountMinor).toBe(Math.min(settings.discountMinor, totals.subtotalMinor));
            expect(findings.some((f) => f.code === "DISCOUNT_CAPPED")).toBe(settings.discountMinor > totals.subtotalMinor);
            expect(totals.taxableMinor).toBe(totals.subtotalMinor - totals.discountMinor);
            expect(BigInt(totals.taxMinor)).toBe(halfUp(BigInt(totals.taxableMinor) * BigInt(Math.round(settings.taxRatePercent * 1000)), 100_000n));
            expect(totals.totalMinor).toBe(totals.taxableMinor + totals.taxMinor);
            expect(totals.depositMinor).toBeGreaterThanOrEqual(0);
            expect(totals.depositMinor).toBeLessThanOrEqual(totals.totalMinor);
            expect(Number.isSafeInteger(totals.totalMinor)).toBe(true);
          },
        ),
        { numRuns: 300 },
      );
    });
  });
});

describe("diffGenerated", () => {
  const a = generated({ key: "cable:copper:16 mm2", quantity: 80, unitCostMinor: 460 });
  const b = generated({ key: "termination:16 mm2", quantity: 12, unitCostMinor: 120, category: "termination", unit: "each" });
  const c = generated({ key: "fuse:60", quantity: 1, unitCostMinor: 1850, category: "fuse", unit: "each" });

  it("lists added, removed and changed lines by key, and nothing for an unchanged one", () => {
    const d = generated({ key: "fuse:80", quantity: 1, unitCostMinor: 1850, category: "fuse", unit: "each" });
    const changes = diffGenerated([a, b, c], [{ ...a, quantity: 90 }, c, d]);
    expect(changes).toHaveLength(3);
    expect(changes).toEqual(
      expect.arrayContaining([
        { key: a.key, description: a.description, change: "changed", before: { quantity: 80, unitCostMinor: 460 }, after: { quantity: 90, unitCostMinor: 460 } },
        { key: d.key, description: d.description, change: "added", before: null, after: { quantity: 1, unitCostMinor: 1850 } },
        { key: b.key, description: b.description, change: "removed", before: { quantity: 12, unitCostMinor: 120 }, after: null },
      ]),
    );
  });

  it("a new price or another item is a change; identical lists are no change", () => {
    expect(diffGenerated([a], [{ ...a, unitCostMinor: 500 }])).toEqual([expect.objectContaining({ change: "changed", before: { quantity: 80, unitCostMinor: 460 }, after: { quantity: 80, unitCostMinor: 500 } })]);
    expect(diffGenerated([a], [{ ...a, priceItemId: "another" }])).toEqual([expect.objectContaining({ key: a.key, change: "changed" })]);
    expect(diffGenerated([a, b, c], [a, b, c])).toEqual([]);
    expect(diffGenerated([], [])).toEqual([]);
  });
});

describe("a total no quote can carry", () => {
  it("is an error finding past 10 billion in major units, and exact below it", () => {
    // 100,000 × 10,000,000.00 = 1,000,000,000,000.00 → 1e14 cents: past the 1e12-cent ceiling (shared/money.ts).
    const big = price({ generated: [generated({ key: "x", quantity: 100_000, unitCostMinor: 1_000_000_000 })], settings: { markupPercent: 0 } });
    expect(big.totals.totalMinor).toBe(100_000_000_000_000);
    expect(big.findings.map((f) => [f.code, f.severity])).toContainEqual(["AMOUNT_TOO_LARGE", "error"]);
    // 1,000 × $1,000.00 = $1,000,000.00: fine.
    const fine = price({ generated: [generated({ key: "x", quantity: 1000, unitCostMinor: 100_000 })], settings: { markupPercent: 0 } });
    expect(fine.findings.filter((f) => f.code === "AMOUNT_TOO_LARGE")).toEqual([]);
  });
});
