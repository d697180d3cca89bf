import Papa from "papaparse";
import type { DataSource, EntityManager } from "typeorm";
import { minorToPlain, parseMoney } from "../../shared/money.js";
import { EstimateLimits, PRICE_CATEGORIES, PriceItemInput, type PriceImportPreview, type PriceItemValues } from "../../shared/schemas/estimates.js";
import { Company, PriceItem } from "../db/entities/index.js";
import { AppError } from "../errors.js";
import { decodeUtf8, lineNumbers, neutralise, refuse, unneutralise, type RowError } from "./csv.js";
import { companyScope } from "./tenancy.js";

/** The price list, ordered by category then SKU. */
export async function listPriceItems(manager: EntityManager, companyId: string): Promise<PriceItem[]> {
  const items = await companyScope(manager, companyId).find(PriceItem, { order: { category: "ASC", sku: "ASC" } });
  const order = new Map(PRICE_CATEGORIES.map((c, i) => [c, i]));
  return items.sort((a, b) => (order.get(a.category) ?? 9) - (order.get(b.category) ?? 9) || a.sku.localeCompare(b.sku, "en", { numeric: true, sensitivity: "base" }));
}

async function companyCurrency(manager: EntityManager, companyId: string): Promise<string> {
  const company = await manager.findOneByOrFail(Company, { id: companyId });
  return company.currency;
}
export { companyCurrency };

async function refuseDuplicateSku(manager: EntityManager, companyId: string, sku: string, exceptId?: string) {
  const rows: Array<{ id: string }> = await manager.query(`SELECT id FROM price_item WHERE company_id = $1 AND lower(sku) = lower($2)`, [companyId, sku]);
  if (rows.some((r) => r.id !== exceptId)) throw new AppError("conflict", `sku: an item with SKU "${sku}" is already in the price list`, { field: "sku", fields: { sku: "this SKU is already in the price list" } });
}

// Creates and SKU changes are serialised per company (the company row is locked), so two
// requests with the same SKU get one 201 and one 409, never a unique-index 500.
const lockCompany = (tx: EntityManager, companyId: string) => tx.query(`SELECT id FROM company WHERE id = $1 FOR UPDATE`, [companyId]);

export async function createPriceItem(db: DataSource, companyId: string, input: PriceItemValues): Promise<PriceItem> {
  return db.transaction(async (tx) => {
    await lockCompany(tx, companyId);
    const count = await companyScope(tx, companyId).count(PriceItem);
    if (count >= EstimateLimits.priceItemsMax) throw new AppError("unprocessable", `A price list holds at most ${EstimateLimits.priceItemsMax} items`);
    await refuseDuplicateSku(tx, companyId, input.sku);
    return tx.save(tx.create(PriceItem, { ...input, companyId }));
  });
}

export async function updatePriceItem(db: DataSource, companyId: string, id: string, patch: unknown): Promise<PriceItem> {
  return db.transaction(async (tx) => {
    await lockCompany(tx, companyId);
    const item = await companyScope(tx, companyId).mustFind(PriceItem, { id }, "Price item", true);
    if (!patch || typeof patch !== "object" || Array.isArray(patch)) throw new AppError("invalid_input", "The body must be an object of the fields to change");
    // The patch is checked as a whole item, so the category rules see the result.
    const merged = PriceItemInput.parse({ ...itemValues(item), ...(patch as object) });
    await refuseDuplicateSku(tx, companyId, merged.sku, id);
    Object.assign(item, merged);
    return tx.save(item);
  });
}

export async function deletePriceItem(db: DataSource, companyId: string, id: string): Promise<void> {
  await db.transaction(async (tx) => {
    const scope = companyScope(tx, companyId);
    await scope.mustFind(PriceItem, { id }, "Price item", true);
    await scope.delete(PriceItem, { id });
  });
}

function itemValues(item: PriceItem): PriceItemValues {
  return {
    sku: item.sku,
    description: item.description,
    category: item.category,
    unit: item.unit,
    unitCostMinor: item.unitCostMinor,
    sellPriceMinor: item.sellPriceMinor,
    cableSize: item.cableSize,
    cableMaterial: item.cableMaterial,
    conductors: item.conductors,
    ratingA: item.ratingA,
  };
}

// ---------------------------------------------------------------- CSV

export const PRICE_COLUMNS = ["sku", "description", "category", "unit", "unit_cost", "sell_price", "size", "material", "conductors", "rating_a"] as const;
const REQUIRED_COLUMNS = ["sku", "description", "category", "unit", "unit_cost"];
const FIELD_OF: Record<string, string> = { cableSize: "size", cableMaterial: "material", unitCostMinor: "unit_cost", sellPriceMinor: "sell_price", ratingA: "rating_a" };

/** The price list as CSV (money in major units, "12.50"; formula-like text neutralised). */
export function priceListToCsv(items: PriceItem[], currency: string): string {
  const rows = items.map((i) => [
    neutralise(i.sku),
    neutralise(i.description),
    i.category,
    i.unit,
    minorToPlain(i.unitCostMinor, currency),
    i.sellPriceMinor === null ? "" : minorToPlain(i.sellPriceMinor, currency),
    i.cableSize ?? "",
    i.cableMaterial ?? "",
    i.conductors === null ? "" : String(i.conductors),
    i.ratingA === null ? "" : String(i.ratingA),
  ]);
  return Papa.unparse({ fields: [...PRICE_COLUMNS], data: rows }, { newline: "\r\n" });
}

/** Reads a price list CSV: every row checked, any error refuses the whole file. */
export function priceItemsFromCsv(bytes: Buffer, currency: string): Array<{ line: number; values: PriceItemValues }> {
  const text = decodeUtf8(bytes).replace(/\r\n?/g, "\n");
  if (text.trim() === "") refuse([{ line: 1, column: null, message: "the file is empty; the first line must name the columns" }]);
  const firstLine = text.slice(0, text.indexOf("\n") === -1 ? text.length : text.indexOf("\n"));
  if (firstLine.split(/[,;\t|]/).length > PRICE_COLUMNS.length * 2) {
    refuse([{ line: 1, column: null, message: `the header has more columns than the ${PRICE_COLUMNS.length} a price list can have (${PRICE_COLUMNS.join(", ")})` }]);
  }
  if (!firstLine.includes(",")) {
    const other = [";", "\t", "|"].find((d) => firstLine.includes(d));
    if (other) refuse([{ line: 1, column: null, message: `the cells are separated by ${other === "\t" ? "tabs" : `"${other}"`}; save the file with commas between cells (CSV)` }]);
  }
  const parsed = Papa.parse<string[]>(text, { skipEmptyLines: "greedy", delimiter: "," });
  const errors: RowError[] = parsed.errors.map((e) => ({ line: (e.row ?? 0) + 1, column: null, message: e.message }));
  const [header = [], ...rows] = parsed.data;
  const lines = lineNumbers(text, parsed.data.length, ",");
  const names = header.map((h) => h.trim().toLowerCase());
  const seenColumns = new Set<string>();
  names.forEach((name, i) => {
    if (!(PRICE_COLUMNS as readonly string[]).includes(name)) errors.push({ line: 1, column: name || `(column ${i + 1})`, message: `unknown column "${name}"; the columns are ${PRICE_COLUMNS.join(", ")}` });
    if (seenColumns.has(name)) errors.push({ line: 1, column: name, message: `column "${name}" appears twice` });
    seenColumns.add(name);
  });
  for (const column of REQUIRED_COLUMNS) if (!names.includes(column)) errors.push({ line: 1, column, message: `the required column "${column}" is missing` });
  if (errors.length) refuse(errors);
  if (rows.length === 0) refuse([{ line: 2, column: null, message: "the file has no items under its header" }]);
  if (rows.length > EstimateLimits.priceItemsMax) refuse([{ line: 1, column: null, message: `the file has ${rows.length} items; a price list holds at most ${EstimateLimits.priceItemsMax}` }]);

  const out: Array<{ line: number; values: PriceItemValues }> = [];
  const seenSku = new Map<string, number>();
  rows.forEach((cells, index) => {
    const line = lines[index + 1] ?? index + 2;
    if (cells.length !== names.length) {
      errors.push({ line, column: null, message: `has ${cells.length} cells; the header has ${names.length}` });
      return;
    }
    const cell = (column: string) => {
      const i = names.indexOf(column);
      return i < 0 ? "" : unneutralise(column === "description" ? cells[i] : cells[i].trim());
    };
    const rowErrors: RowError[] = [];
    const moneyCell = (column: string, optional: boolean): number | null => {
      const v = cell(column);
      if (v === "") {
        if (!optional) rowErrors.push({ line, column, message: "is required" });
        return null;
      }
      const minor = parseMoney(v, currency);
      if (minor === null) rowErrors.push({ line, column, message: `"${v}" is not an amount in ${currency} (e.g. 12.50)` });
      return minor;
    };
    const numberCell = (column: string): number | null => {
      const v = cell(column);
      if (v === "") return null;
      const n = Number(v);
      if (!Number.isFinite(n)) rowErrors.push({ line, column, message: `"${v}" is not a number` });
      return n;
    };
    const material = cell("material").toLowerCase();
    const raw = {
      sku: cell("sku"),
      description: cell("description").trim(),
      category: cell("category").toLowerCase(),
      unit: cell("unit").toLowerCase(),
      unitCostMinor: moneyCell("unit_cost", false),
      sellPriceMinor: moneyCell("sell_price", true),
      cableSize: cell("size") === "" ? null : cell("size"),
      cableMaterial: material === "" ? null : material === "aluminium" ? "aluminum" : material,
      conductors: numberCell("conductors"),
      ratingA: numberCell("rating_a"),
    };
    if (rowErrors.length === 0) {
      const checked = PriceItemInput.safeParse(raw);
      if (!checked.success) {
        for (const issue of checked.error.issues) {
          const key = issue.path[0] === undefined ? null : String(issue.path[0]);
          const column = key === null ? null : (FIELD_OF[key] ?? key);
          if (!rowErrors.some((e) => e.column === column)) rowErrors.push({ line, column, message: issue.message });
        }
      } else {
        const sku = checked.data.sku.toLowerCase();
        const earlier = seenSku.get(sku);
        if (earlier !== undefined) rowErrors.push({ line, column: "sku", message: `SKU "${checked.data.sku}" is already on line ${earlier}` });
        else seenSku.set(sku, line);
        if (rowErrors.length === 0) out.push({ line, values: checked.data });
      }
    }
    errors.push(...rowErrors);
  });
  if (errors.length) refuse(errors.sort((a, b) => a.line - b.line));
  return out;
}

const COMPARED: Array<keyof PriceItemValues> = ["sku", "description", "category", "unit", "unitCostMinor", "sellPriceMinor", "cableSize", "cableMaterial", "conductors", "ratingA"];

/** Previews a price list CSV against the current list and, with `apply`, writes it (all or nothing). */
export async function importPriceList(db: DataSource, companyId: string, bytes: Buffer, apply: boolean): Promise<PriceImportPreview> {
  return db.transaction(async (tx) => {
    await lockCompany(tx, companyId);
    const currency = await companyCurrency(tx, companyId);
    const rows = priceItemsFromCsv(bytes, currency);
    const existing = await companyScope(tx, companyId).find(PriceItem);
    const bySku = new Map(existing.map((i) => [i.sku.toLowerCase(), i]));
    const preview: PriceImportPreview = { added: [], changed: [], unchanged: 0, applied: apply };
    const toSave: PriceItem[] = [];
    for (const { values } of rows) {
      const current = bySku.get(values.sku.toLowerCase());
      if (!current) {
        preview.added.push({ sku: values.sku, description: values.description });
        toSave.push(tx.create(PriceItem, { ...values, companyId }));
        continue;
      }
      const before = itemValues(current);
      const fields = COMPARED.filter((k) => before[k] !== values[k]);
      if (fields.length === 0) preview.unchanged += 1;
      else {
        preview.changed.push({ sku: values.sku, description: values.description, fields: fields.map((f) => FIELD_OF[f] ?? f) });
        Object.assign(current, values);
        toSave.push(current);
      }
    }
    if (existing.length + preview.added.length > EstimateLimits.priceItemsMax) {
      throw new AppError("unprocessable", `The price list would hold ${existing.length + preview.added.length} items; at most ${EstimateLimits.priceItemsMax}`);
    }
    if (apply && toSave.length) await tx.save(toSave, { chunk: 200 });
    return preview;
  });
}
