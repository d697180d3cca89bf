// Money in integer minor units (cents), never binary floating-point sums.
//
// Rounding rule, used everywhere a price is multiplied: half up (0.5 of a minor unit and more
// rounds away from zero, less rounds toward it), applied once per line and once to each of
// discount, tax and deposit; totals are sums of already-rounded integers, so the lines on the
// quote always add up to its totals.
//
// Quantities carry at most 3 decimals and are handled as integer thousandths; percentages carry
// at most 3 decimals and are handled as integer thousandths of a percent. Products go through
// BigInt, so 999,999.999 m × 1,000,000.00 per m stays exact.

/** Largest amount of money the product stores, in minor units (10 billion in major units). */
export const MAX_MONEY_MINOR = 1_000_000_000_000;

/** a / b rounded half up, for a ≥ 0 and b > 0. */
function divideHalfUp(a: bigint, b: bigint): bigint {
  return (2n * a + b) / (2n * b);
}

/** Signed half-up (half away from zero). */
function divideRounded(a: bigint, b: bigint): bigint {
  return a < 0n ? -divideHalfUp(-a, b) : divideHalfUp(a, b);
}

/** A quantity (≤ 3 decimals) as integer thousandths. */
export function toMilli(quantity: number): bigint {
  return BigInt(Math.round(quantity * 1000));
}

/** quantity × unit price, rounded half up to the minor unit. */
export function lineAmount(quantity: number, unitMinor: number): number {
  return Number(divideRounded(toMilli(quantity) * BigInt(unitMinor), 1000n));
}

/** amount × percent / 100, rounded half up (percent with ≤ 3 decimals). */
export function percentOf(amountMinor: number, percent: number): number {
  return Number(divideRounded(BigInt(amountMinor) * BigInt(Math.round(percent * 1000)), 100_000n));
}

/** amount × (100 + markup) / 100, rounded half up. */
export function withMarkup(amountMinor: number, markupPercent: number): number {
  return amountMinor + percentOf(amountMinor, markupPercent);
}

// Building an Intl.NumberFormat costs far more than using one (about 10 % of a quote PDF's
// render before these caches), so each is made once per currency and locale.
const digitsCache = new Map<string, number>();
const formatCache = new Map<string, Intl.NumberFormat>();

/** Digits after the decimal point of a currency's minor unit (2 for USD, 0 for JPY). */
export function currencyDigits(currency: string): number {
  let digits = digitsCache.get(currency);
  if (digits === undefined) {
    try {
      digits = new Intl.NumberFormat("en", { style: "currency", currency }).resolvedOptions().maximumFractionDigits ?? 2;
    } catch {
      digits = 2;
    }
    digitsCache.set(currency, digits);
  }
  return digits;
}

/**
 * "1234.5", "1,234.50" or "$12.50" (major units, as typed in a CSV or a form) → minor units; null
 * when it is not a plain amount. A comma is read only as a thousands separator in groups of three,
 * so a decimal comma ("12,50") is refused rather than read as 1,250.
 */
export function parseMoney(text: string, currency: string): number | null {
  const digits = currencyDigits(currency);
  const t = text.trim().replace(/^(?:[$€£¥]|[A-Z]{3}\s?)/, "").trim();
  const m = /^(\d{1,13}|\d{1,3}(?:,\d{3}){1,4})(?:\.(\d+))?$/.exec(t);
  if (!m) return null;
  const fraction = m[2] ?? "";
  if (fraction.length > digits) return null;
  return Number(m[1].replace(/,/g, "")) * 10 ** digits + Number(fraction.padEnd(digits, "0") || "0");
}

/** 123450 → "1234.50" (for CSV export: no grouping, no symbol). */
export function minorToPlain(minor: number, currency: string): string {
  const digits = currencyDigits(currency);
  const sign = minor < 0 ? "-" : "";
  const abs = Math.abs(minor);
  if (digits === 0) return `${sign}${abs}`;
  const s = String(abs).padStart(digits + 1, "0");
  return `${sign}${s.slice(0, -digits)}.${s.slice(-digits)}`;
}

/** 123450, "USD" → "$1,234.50" in the given locale. */
export function formatMoney(minor: number, currency: string, locale = "en-US"): string {
  const digits = currencyDigits(currency);
  const key = `${locale}|${currency}`;
  let format = formatCache.get(key);
  if (!format) {
    format = new Intl.NumberFormat(locale, { style: "currency", currency, minimumFractionDigits: digits, maximumFractionDigits: digits });
    formatCache.set(key, format);
  }
  return format.format(minor / 10 ** digits);
}
