// How the price list writes an item's units, sizes and the fields an import changed.
import type { PriceItem, PriceUnit } from "../../../../shared/schemas/estimates";
import { formatSize } from "../../system-editor/lib/format";

export const UNIT_LABELS: Record<PriceUnit, string> = { m: "per m", ft: "per ft", each: "each", hour: "per hour" };

export const MATERIAL_LABELS = { copper: "Copper", aluminum: "Aluminium" } as const;

/** What sets the item apart within its category: "16 mm² copper, twin", "30 A", "Holder", "Any size"; "" when nothing does. */
export function itemSpec(item: Pick<PriceItem, "category" | "cableSize" | "cableMaterial" | "conductors" | "ratingA">): string {
  switch (item.category) {
    case "cable": {
      const parts = [item.cableSize ? formatSize(item.cableSize) : null, item.cableMaterial ? MATERIAL_LABELS[item.cableMaterial].toLowerCase() : null].filter(Boolean);
      const conductors = item.conductors === 2 ? "twin" : "single";
      return `${parts.join(" ")}${parts.length ? ", " : ""}${conductors}`;
    }
    case "termination":
      return item.cableSize ? formatSize(item.cableSize) : "Any size";
    case "fuse":
      return item.ratingA === null ? "Holder" : `${item.ratingA} A`;
    default:
      return "";
  }
}

/** Field names as the import reports them (CSV columns or API fields) → words. */
const FIELD_WORDS: Record<string, string> = {
  sku: "SKU",
  description: "description",
  category: "category",
  unit: "unit",
  unit_cost: "unit cost",
  unitCostMinor: "unit cost",
  sell_price: "sell price",
  sellPriceMinor: "sell price",
  size: "size",
  cableSize: "size",
  material: "material",
  cableMaterial: "material",
  conductors: "conductors",
  rating_a: "rating",
  ratingA: "rating",
};

export const fieldWords = (field: string) => FIELD_WORDS[field] ?? field.replace(/_/g, " ");
