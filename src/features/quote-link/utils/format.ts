// How the client's page writes sizes, quantities, dates and contact links.
import type { PriceUnit } from "../../../../shared/schemas/estimates";
import { formatDate } from "../../../utils/format-date";

/** "16 mm2" → "16 mm²"; AWG and kcmil as they are. */
export const formatSize = (size: string) => size.replace(/\bmm2\b/i, "mm²");

/** Up to 3 decimals, grouped: 1250.5 → "1,250.5". */
const quantityFormat = new Intl.NumberFormat("en-US", { maximumFractionDigits: 3 });

/** "40 m", "6 each", "1 hour", "3.5 hours". */
export function formatQuantity(quantity: number, unit: PriceUnit): string {
  const n = quantityFormat.format(quantity);
  if (unit === "hour") return `${n} ${quantity === 1 ? "hour" : "hours"}`;
  return `${n} ${unit}`;
}

/** A figure with a fixed number of decimals, "—" when there is none. */
export const fixed = (value: number | null, digits: number) => (value !== null && Number.isFinite(value) ? value.toFixed(digits) : "—");

/** A percentage as the trade writes it, up to 3 decimals: 8.25 → "8.25 %". */
export const formatPercent = (value: number) => `${quantityFormat.format(value)} %`;

const dayFormat = new Intl.DateTimeFormat(undefined, { day: "numeric", month: "short", year: "numeric", timeZone: "UTC" });

/** A timestamp, or a calendar date ("2026-04-30") read as that day wherever the reader is. */
export function formatDay(value: string): string {
  if (/^\d{4}-\d{2}-\d{2}$/.test(value)) {
    const date = new Date(`${value}T00:00:00Z`);
    return Number.isNaN(date.getTime()) ? value : dayFormat.format(date);
  }
  return formatDate(value);
}

/** A phone number as a tel: link keeps digits and a leading +; null when nothing dialable is left. */
export function telHref(phone: string): string | null {
  const trimmed = phone.trim();
  const digits = trimmed.replace(/\D/g, "");
  if (!digits) return null;
  return `tel:${trimmed.startsWith("+") ? "+" : ""}${digits}`;
}

/** mailto: with the address encoded, so nothing in it can add headers or change the scheme. */
export const mailtoHref = (email: string) => `mailto:${encodeURIComponent(email.trim()).replace(/%40/g, "@")}`;

/** Only PNG and JPEG logos in plain base64 become an image source (the server stores only those). */
export function logoSrc(logo: { mediaType: string; base64: string } | null): string | null {
  if (!logo) return null;
  if (logo.mediaType !== "image/png" && logo.mediaType !== "image/jpeg") return null;
  if (!/^[A-Za-z0-9+/]+={0,2}$/.test(logo.base64)) return null;
  return `data:${logo.mediaType};base64,${logo.base64}`;
}
