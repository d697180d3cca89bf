// How the System editor writes figures, sizes, statuses and limits. One place, so the tables,
// the diagram and the charts say the same thing the same way.
import type { LoadResult, LoadStatus } from "../../../../shared/engine/system";
import { LOAD_STATUS_LABELS } from "../../../components/ui/load-status";

export const STATUS_LABEL: Record<LoadStatus, string> = LOAD_STATUS_LABELS;

/** Worst first. */
export const STATUS_RANK: Record<LoadStatus, number> = { over: 2, near: 1, within: 0 };

/** Stroke / fill colours for SVG and charts (tailwind.config.ts: within / near / over 600, 50). Always with a word or an icon too. */
export const STATUS_COLOUR: Record<LoadStatus, { stroke: string; fill: string; text: string }> = {
  within: { stroke: "#147066", fill: "#ecf8f6", text: "#0f5851" },
  near: { stroke: "#9d6f08", fill: "#fdf6e7", text: "#7a5606" },
  over: { stroke: "#963524", fill: "#fbeeeb", text: "#76291c" },
};

export const INK = { 900: "#19222a", 700: "#35424d", 500: "#5d6d7a", 300: "#a9b5bf", 200: "#cbd3da", 100: "#e6eaee", 50: "#f4f6f8" };
export const COPPER = { 500: "#b86632", 600: "#9c5228", 100: "#f5e3d4", 50: "#fbf4ee" };

export const fixed = (value: number, digits: number) => (Number.isFinite(value) ? value.toFixed(digits) : "—");

/** "16 mm2" → "16 mm²"; AWG and kcmil as they are. */
export const formatSize = (size: string) => size.replace(/\bmm2\b/i, "mm²");

export const lengthUnit = (units: "metric" | "imperial") => (units === "imperial" ? "ft" : "m");

/** A run length from the document: a number, or text such as "130 ft" the server resolves. */
export function lengthNumber(length: number | string): number {
  if (typeof length === "number") return length;
  const n = Number.parseFloat(length);
  return Number.isFinite(n) ? n : 0;
}

export function formatLength(length: number | string, units: "metric" | "imperial"): string {
  if (typeof length === "string") return length;
  return `${Number.isInteger(length) ? length : fixed(length, 1)} ${lengthUnit(units)}`;
}

/** Fault current: kA from 1000 A on, "—" when it cannot be estimated. */
export function formatFault(amps: number | null): string {
  if (amps === null || !Number.isFinite(amps)) return "—";
  if (Math.abs(amps) >= 1000) return `${fixed(amps / 1000, 1)} kA`;
  return `${Math.round(amps)} A`;
}

const LIMIT_WORD: Record<LoadResult["governingLimit"], string> = { branch: "branch", total: "total", critical: "critical" };

/** "3 % branch", "5 % total", "3 % critical". */
export const limitText = (governingLimit: LoadResult["governingLimit"], limitPercent: number) => `${limitPercent} % ${LIMIT_WORD[governingLimit]}`;

/** The drop that was compared with the limit: the branch drop for the branch limit, the total drop otherwise. */
export const checkedDrop = (lr: Pick<LoadResult, "governingLimit" | "branchDropPercent" | "dropPercent">) =>
  lr.governingLimit === "branch" ? lr.branchDropPercent : lr.dropPercent;

export function formatMoney(amount: number, currency: string | undefined): string {
  if (!Number.isFinite(amount)) return "—";
  if (!currency) return amount.toFixed(2);
  try {
    return new Intl.NumberFormat(undefined, { style: "currency", currency }).format(amount);
  } catch {
    return `${amount.toFixed(2)} ${currency}`;
  }
}
