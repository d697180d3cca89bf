// Prices an estimate's lines and totals it: pure, integer minor units throughout.
//
//  line cost  = quantity × unit cost                        (half up, shared/money.ts)
//  line sell  = quantity × the item's sell price when it has one, else cost × (1 + markup %)
//  subtotal   = Σ line sell;  discount ≤ subtotal;  taxable = subtotal − discount
//  tax        = taxable × tax rate %;  total = taxable + tax
//  deposit    = total × deposit %, or a fixed amount (at most the total)
// Markup: the line's override, else the manual line's own, else the estimate's; labour made from
// the layout is charged at the labour rate (markup 0) unless overridden.
import { MAX_MONEY_MINOR, lineAmount, percentOf, withMarkup } from "../money.js";
import type { EstimateFinding, EstimateSettings, EstimateTotals, GeneratedLine, LineChange, LineOverride, ManualLine, PricedLine } from "../schemas/estimates.js";

export interface PricedEstimate {
  lines: PricedLine[];
  totals: EstimateTotals;
  findings: EstimateFinding[];
}

export function priceEstimate(input: {
  generated: readonly GeneratedLine[];
  manual: readonly ManualLine[];
  overrides: Readonly<Record<string, LineOverride>>;
  settings: EstimateSettings;
}): PricedEstimate {
  const { settings } = input;
  const findings: EstimateFinding[] = [];
  const lines: PricedLine[] = [];

  for (const g of input.generated) {
    const o = input.overrides[g.key] ?? {};
    const quantity = o.quantity ?? g.quantity;
    const costMinor = lineAmount(quantity, g.unitCostMinor);
    const fixedSell = g.sellPriceMinor !== null && o.markupPercent === undefined;
    const markup = fixedSell ? null : (o.markupPercent ?? (g.category === "labour" && g.key === "labour" ? 0 : settings.markupPercent));
    const sellMinor = markup === null ? lineAmount(quantity, g.sellPriceMinor as number) : withMarkup(costMinor, markup);
    lines.push({
      key: g.key,
      source: "layout",
      category: g.category,
      description: g.description,
      detail: g.detail,
      sku: g.sku,
      quantity,
      unit: g.unit,
      unitCostMinor: g.unitCostMinor,
      markupPercent: markup,
      costMinor,
      sellMinor,
      overridden: o.quantity !== undefined || o.markupPercent !== undefined,
    });
  }
  for (const m of input.manual) {
    const costMinor = lineAmount(m.quantity, m.unitCostMinor);
    const markup = m.markupPercent ?? settings.markupPercent;
    lines.push({
      key: `manual:${m.id}`,
      source: "manual",
      category: m.category,
      description: m.description,
      detail: "added by hand",
      sku: null,
      quantity: m.quantity,
      unit: m.unit,
      unitCostMinor: m.unitCostMinor,
      markupPercent: markup,
      costMinor,
      sellMinor: withMarkup(costMinor, markup),
      overridden: m.markupPercent !== null,
    });
  }

  const costMinor = lines.reduce((s, l) => s + l.costMinor, 0);
  const subtotalMinor = lines.reduce((s, l) => s + l.sellMinor, 0);
  let discountMinor = settings.discountMinor;
  if (discountMinor > subtotalMinor) {
    findings.push({ code: "DISCOUNT_CAPPED", severity: "warning", message: "The discount is larger than the subtotal; it is capped at the subtotal." });
    discountMinor = subtotalMinor;
  }
  const taxableMinor = subtotalMinor - discountMinor;
  const taxMinor = percentOf(taxableMinor, settings.taxRatePercent);
  const totalMinor = taxableMinor + taxMinor;
  // Amounts beyond this are typing mistakes, and past 2^53 cents a Number would no longer be exact.
  if (totalMinor > MAX_MONEY_MINOR) {
    findings.push({ code: "AMOUNT_TOO_LARGE", severity: "error", message: "The total is larger than any quote can carry; check the quantities and prices." });
  }
  const depositMinor = settings.depositMode === "fixed" ? Math.min(settings.depositFixedMinor, totalMinor) : percentOf(totalMinor, settings.depositPercent);
  return {
    lines,
    findings,
    totals: { costMinor, subtotalMinor, discountMinor, taxableMinor, taxRatePercent: settings.taxRatePercent, taxMinor, totalMinor, depositMinor, marginMinor: subtotalMinor - costMinor },
  };
}

/** What a regeneration changed, line by line (by key). */
export function diffGenerated(before: readonly GeneratedLine[], after: readonly GeneratedLine[]): LineChange[] {
  const old = new Map(before.map((l) => [l.key, l]));
  const changes: LineChange[] = [];
  for (const line of after) {
    const prev = old.get(line.key);
    old.delete(line.key);
    const now = { quantity: line.quantity, unitCostMinor: line.unitCostMinor };
    if (!prev) changes.push({ key: line.key, description: line.description, change: "added", before: null, after: now });
    else if (prev.quantity !== line.quantity || prev.unitCostMinor !== line.unitCostMinor || prev.priceItemId !== line.priceItemId) {
      changes.push({ key: line.key, description: line.description, change: "changed", before: { quantity: prev.quantity, unitCostMinor: prev.unitCostMinor }, after: now });
    }
  }
  for (const prev of old.values()) changes.push({ key: prev.key, description: prev.description, change: "removed", before: { quantity: prev.quantity, unitCostMinor: prev.unitCostMinor }, after: null });
  return changes;
}
