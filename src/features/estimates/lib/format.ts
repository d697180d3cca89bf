import { EstimateLimits, type EstimateFinding, type PriceUnit } from "../../../../shared/schemas/estimates";
import { MAX_MONEY_MINOR, parseMoney } from "../../../../shared/money";
import { paths } from "../../../config/paths";

export const UNIT_LABELS: Record<PriceUnit, string> = { m: "m", ft: "ft", each: "each", hour: "h" };

/** The unit's name in a choice list. */
export const UNIT_CHOICES: Record<PriceUnit, string> = { m: "metre (m)", ft: "foot (ft)", each: "each", hour: "hour (h)" };

const quantityFormat = new Intl.NumberFormat("en-US", { maximumFractionDigits: 3 });

/** 48 → "48", 2.5 → "2.5", 1234.125 → "1,234.125". */
export const formatQuantity = (quantity: number) => quantityFormat.format(quantity);

/** 48, "m" → "48 m". */
export const formatAmount = (quantity: number, unit: PriceUnit | null | undefined) => (unit ? `${formatQuantity(quantity)} ${UNIT_LABELS[unit]}` : formatQuantity(quantity));

/** 30 → "30 %", 12.5 → "12.5 %". */
export const formatPercent = (percent: number) => `${quantityFormat.format(percent)} %`;

/** How a number goes into a text box: no grouping, no trailing zeros. */
export const numberText = (value: number | null | undefined) => (value === null || value === undefined ? "" : String(value));

export type Parsed<T> = { ok: true; value: T } | { ok: false; error: string };

/** Typed text → a number ≥ 0 with at most 3 decimals and at most `max` (the server's rules for quantities and percentages). */
function parseDecimal(text: string, what: string, max: number, unit = ""): Parsed<number> {
  const t = text.trim().replace(/\s*%$/, "");
  const m = /^(\d+)(?:\.(\d+))?$/.exec(t) ?? /^()\.(\d+)$/.exec(t);
  if (!m) return { ok: false, error: `${what} must be a number of 0 or more` };
  if ((m[2] ?? "").length > 3) return { ok: false, error: `${what} may have at most 3 decimal places` };
  const n = Number(t);
  if (n > max) return { ok: false, error: `${what} must be at most ${max}${unit}` };
  return { ok: true, value: n };
}

export const parseQuantity = (text: string) => parseDecimal(text, "quantity", EstimateLimits.quantityMax);
export const parsePercent = (text: string, what: string, max: number) => parseDecimal(text, what, max, " %");
/** Markup on cost: up to 1000 %. */
export const parseMarkup = (text: string) => parsePercent(text, "markup", 1000);

/** An amount typed in major units ("120", "120.50") → minor units. */
export function parseAmount(text: string, currency: string, what: string): Parsed<number> {
  const minor = parseMoney(text, currency);
  if (minor === null) return { ok: false, error: `${what} must be an amount such as 120.00` };
  if (minor > MAX_MONEY_MINOR) return { ok: false, error: `${what} is too large` };
  return { ok: true, value: minor };
}

/**
 * The price list's add form, pre-filled with what a MISSING_PRICE finding needs:
 * /price-list?add=cable&size=16+mm2&material=copper (empty fields are left out).
 */
export function priceListAddHref(need: NonNullable<EstimateFinding["need"]>): string {
  const query = new URLSearchParams({ add: need.category });
  if (need.cableSize) query.set("size", need.cableSize);
  if (need.cableMaterial) query.set("material", need.cableMaterial);
  if (need.ratingA !== null) query.set("rating", String(need.ratingA));
  return `${paths.priceList.getHref()}?${query.toString()}`;
}
