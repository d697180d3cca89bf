// The columns of each entry table: what a cell shows, how typed text becomes a value, and where the
// value goes in the row. Validation itself is the shared schema's (see table-row.tsx).
import { ALL_SIZES, normalizeSize, sizeInfo } from "../../../../shared/engine/conductors";
import type { SystemInput } from "../../../../shared/engine/schema";
import { setOverride, type AnyRow, type CaseRow, type LoadRow, type PointRow, type RunRow, type SourceRow } from "./model";

export type Units = "metric" | "imperial";

export interface Option {
  value: string;
  label: string;
}

/** What every row of a table needs to know about the rest of the document. */
export interface TableContext {
  units: Units;
  nominalVoltage: number;
  systemTemperatureC: number;
  pointIds: ReadonlySet<string>;
  pointOptions: readonly Option[];
  sizeOptions: readonly Option[];
}

export type Parsed = { ok: true; value: unknown } | { ok: false; message: string };

export type Editor<R> =
  | {
      type: "text";
      text(row: R, ctx: TableContext): string;
      parse(text: string, row: R, ctx: TableContext): Parsed;
      placeholder?(row: R, ctx: TableContext): string;
      numeric?: boolean;
    }
  | {
      type: "combo";
      text(row: R, ctx: TableContext): string;
      parse(text: string, row: R, ctx: TableContext): Parsed;
      options(ctx: TableContext): readonly Option[];
    }
  | { type: "select"; value(row: R): string; options(row: R, ctx: TableContext): readonly Option[] }
  | { type: "check"; checked(row: R): boolean };

export interface Column<R> {
  /** Stable key of the column. */
  key: string;
  /** Header text, with its unit. */
  header(ctx: TableContext): string;
  /** The column's word in a cell's accessible name: "<label> of run r1". */
  label(row: R): string;
  /** The row's fields whose errors (local or from the server) show on this cell. */
  fields: readonly string[];
  /** False where the column does not apply to the row (a PV array's internal resistance). */
  applies?(row: R): boolean;
  /** Shown instead of "—" where the column does not apply. */
  staticText?(row: R): string;
  editor: Editor<R>;
  /** The row with the new value; `value` is what parse returned, a select's value or a checkbox's state. */
  apply(row: R, value: unknown, ctx: TableContext): R;
  /** Whether a value must be unique among the table's rows (ids, case names). */
  unique?: boolean;
  /** A stored value that is wrong for a reason the row schema cannot see (a run to a deleted point). */
  check?(row: R, ctx: TableContext): string | undefined;
  width: string;
}

// ------------------------------------------------------------------------------------------
// Values

/** The row with `key` set, or removed when the value is undefined (so defaults stay defaults). */
function setField<R extends object>(row: R, key: string, value: unknown): R {
  const next = { ...row } as Record<string, unknown>;
  if (value === undefined) delete next[key];
  else next[key] = value;
  return next as R;
}

const ok = (value: unknown): Parsed => ({ ok: true, value });
const REQUIRED: Parsed = { ok: false, message: "required" };

/** Numbers are read with Number() after trimming; anything else reaches the schema as NaN and gets its message. */
function parseNumber(text: string, required: boolean): Parsed {
  const t = text.trim();
  if (t === "") return required ? REQUIRED : ok(undefined);
  return ok(Number(t));
}

const showNumber = (n: number | undefined) => (n === undefined ? "" : String(n));

export const sizeLabel = (size: string) => size.replace(/ mm2$/, " mm²");

export function sizeOptionsFor(units: Units): Option[] {
  const family = units === "metric" ? "metric" : "awg";
  return ALL_SIZES.filter((s) => sizeInfo(s)?.family === family).map((s) => ({ value: s, label: sizeLabel(s) }));
}

// ------------------------------------------------------------------------------------------
// Column builders

type Row = AnyRow & Record<string, unknown>;

function idColumn<R extends { id: string }>(): Column<R> {
  return {
    key: "id",
    header: () => "Id",
    label: () => "Id",
    fields: ["id"],
    editor: { type: "text", text: (r) => r.id, parse: (t) => (t.trim() === "" ? REQUIRED : ok(t.trim())) },
    apply: (r, v) => ({ ...r, id: v as string }),
    unique: true,
    width: "w-28",
  };
}

function nameColumn<R extends { name?: string }>(): Column<R> {
  return {
    key: "name",
    header: () => "Name",
    label: () => "Name",
    fields: ["name"],
    editor: { type: "text", text: (r) => r.name ?? "", parse: (t) => ok(t.trim() === "" ? undefined : t.trim()) },
    apply: (r, v) => setField(r, "name", v),
    width: "w-48",
  };
}

interface NumberOptions<R> {
  key: string;
  header: string;
  label: string;
  /** An empty cell is "required" rather than removed. */
  required?: boolean | ((row: R) => boolean);
  placeholder?(row: R, ctx: TableContext): string;
  applies?(row: R): boolean;
  width?: string;
}

function numberColumn<R extends object>(o: NumberOptions<R>): Column<R> {
  return {
    key: o.key,
    header: () => o.header,
    label: () => o.label,
    fields: [o.key],
    applies: o.applies,
    editor: {
      type: "text",
      numeric: true,
      text: (r) => showNumber((r as Record<string, unknown>)[o.key] as number | undefined),
      parse: (t, r) => parseNumber(t, typeof o.required === "function" ? o.required(r) : (o.required ?? false)),
      placeholder: o.placeholder,
    },
    apply: (r, v) => setField(r, o.key, v),
    width: o.width ?? "w-24",
  };
}

function selectColumn<R extends object>(o: {
  key: string;
  header: string;
  label: string;
  options: readonly Option[];
  fallback: string;
  toValue?(value: string): unknown;
  applies?(row: R): boolean;
  width?: string;
}): Column<R> {
  return {
    key: o.key,
    header: () => o.header,
    label: () => o.label,
    fields: [o.key],
    applies: o.applies,
    editor: { type: "select", value: (r) => String((r as Record<string, unknown>)[o.key] ?? o.fallback), options: () => o.options },
    apply: (r, v) => setField(r, o.key, o.toValue ? o.toValue(v as string) : v),
    width: o.width ?? "w-28",
  };
}

/** A flag stored only when set (locked, primary): unticking removes it. */
function flagColumn<R extends object>(key: string, header: string, width = "w-16"): Column<R> {
  return {
    key,
    header: () => header,
    label: () => header,
    fields: [key],
    editor: { type: "check", checked: (r) => (r as Record<string, unknown>)[key] === true },
    apply: (r, v) => setField(r, key, v ? true : undefined),
    width,
  };
}

function pointColumn<R extends object>(key: string, header: string): Column<R> {
  const read = (r: R) => String((r as Record<string, unknown>)[key] ?? "");
  return {
    key,
    header: () => header,
    label: () => header,
    fields: [key],
    editor: {
      type: "combo",
      text: read,
      options: (ctx) => ctx.pointOptions,
      parse: (t, _r, ctx) => {
        const id = t.trim();
        if (id === "") return REQUIRED;
        return ctx.pointIds.has(id) ? ok(id) : { ok: false, message: `no point "${id}" in this system` };
      },
    },
    check: (r, ctx) => {
      const id = read(r);
      if (id === "") return "required";
      return ctx.pointIds.has(id) ? undefined : `no point "${id}" in this system`;
    },
    apply: (r, v) => setField(r, key, v),
    width: "w-32",
  };
}

// ------------------------------------------------------------------------------------------
// Tables

export const POINT_COLUMNS: Column<PointRow>[] = [
  idColumn(),
  nameColumn(),
  numberColumn({ key: "fuseInterruptingA", header: "Fuse interrupting rating (A)", label: "Fuse interrupting rating", width: "w-40" }),
];

const MATERIALS: Option[] = [
  { value: "copper", label: "Copper" },
  { value: "aluminum", label: "Aluminium" },
];
const RUN_KINDS: Option[] = [
  { value: "branch", label: "Branch" },
  { value: "feeder", label: "Feeder" },
];
const INSULATION: Option[] = [
  { value: "60", label: "60 °C" },
  { value: "75", label: "75 °C" },
  { value: "90", label: "90 °C" },
];

export const RUN_COLUMNS: Column<RunRow>[] = [
  idColumn(),
  nameColumn(),
  pointColumn("from", "From"),
  pointColumn("to", "To"),
  {
    key: "length",
    header: (ctx) => `Length (${ctx.units === "metric" ? "m" : "ft"})`,
    label: () => "Length",
    fields: ["length"],
    editor: {
      type: "text",
      numeric: true,
      text: (r) => String(r.length),
      placeholder: (_r, ctx) => (ctx.units === "metric" ? "m" : "ft"),
      parse: (t) => {
        const text = t.trim();
        if (text === "") return REQUIRED;
        const n = Number(text);
        if (Number.isFinite(n)) return ok(n);
        // Text with its unit ("130 ft", "40 m") goes to the engine, which converts it.
        if (!/\d/.test(text)) return { ok: false, message: `give a number, or a length with its unit ("130 ft")` };
        return ok(text);
      },
    },
    // A new run's length is left empty for the estimator to type; it shows as required until then.
    check: (r) => (r.length === "" ? "required" : undefined),
    apply: (r, v) => ({ ...r, length: v as number | string }),
    width: "w-20",
  },
  {
    key: "size",
    header: (ctx) => `Size (${ctx.units === "metric" ? "mm²" : "AWG"})`,
    label: () => "Size",
    fields: ["size"],
    editor: {
      type: "combo",
      text: (r) => sizeLabel(r.size),
      options: (ctx) => ctx.sizeOptions,
      parse: (t, _r, ctx) => {
        if (t.trim() === "") return REQUIRED;
        const size = normalizeSize(t, ctx.units);
        return size ? ok(size) : { ok: false, message: "unknown size" };
      },
    },
    check: (r, ctx) => (r.size !== "" && !sizeInfo(r.size) && !normalizeSize(r.size, ctx.units) ? "unknown size" : undefined),
    apply: (r, v) => ({ ...r, size: v as string }),
    width: "w-28",
  },
  selectColumn({ key: "material", header: "Material", label: "Material", options: MATERIALS, fallback: "copper", width: "w-28" }),
  numberColumn({ key: "parallel", header: "Parallel sets", label: "Parallel sets", placeholder: () => "1", width: "w-20" }),
  selectColumn({ key: "kind", header: "Kind", label: "Kind", options: RUN_KINDS, fallback: "branch", width: "w-24" }),
  numberColumn({ key: "fuseA", header: "Fuse (A)", label: "Fuse", width: "w-20" }),
  numberColumn({ key: "fuseInterruptingA", header: "Fuse interrupting rating (A)", label: "Fuse interrupting rating", width: "w-28" }),
  selectColumn({ key: "insulationC", header: "Insulation", label: "Insulation", options: INSULATION, fallback: "75", toValue: Number, width: "w-24" }),
  flagColumn("locked", "Locked"),
];

const SOURCE_TYPES: Option[] = [
  { value: "battery", label: "Battery bank" },
  { value: "supply", label: "Power supply" },
  { value: "pvArray", label: "PV array" },
];

const isPv = (s: SourceRow) => s.type === "pvArray";

/** A source of another type keeps what still applies: a PV array has no internal resistance and
 *  needs a current; a battery or supply needs a voltage. */
function changeSourceType(row: SourceRow, type: SourceRow["type"], ctx: TableContext): SourceRow {
  if (type === row.type) return row;
  const { id, name, point, primary } = row;
  const common = { id, point, ...(name !== undefined && { name }), ...(primary !== undefined && { primary }) };
  if (type === "pvArray") {
    return { ...common, type, currentA: row.type === "pvArray" ? row.currentA : 0, ...(row.voltage !== undefined && { voltage: row.voltage }) };
  }
  const internal = row.type !== "pvArray" ? row.internalResistanceOhm : undefined;
  return { ...common, type, voltage: row.voltage ?? ctx.nominalVoltage, ...(internal !== undefined && { internalResistanceOhm: internal }) };
}

export const SOURCE_COLUMNS: Column<SourceRow>[] = [
  idColumn(),
  nameColumn(),
  {
    key: "type",
    header: () => "Type",
    label: () => "Type",
    fields: ["type"],
    editor: { type: "select", value: (r) => r.type, options: () => SOURCE_TYPES },
    apply: (r, v, ctx) => changeSourceType(r, v as SourceRow["type"], ctx),
    width: "w-32",
  },
  pointColumn("point", "Point"),
  numberColumn({ key: "voltage", header: "Voltage (V)", label: "Voltage", required: (r) => !isPv(r), placeholder: (r) => (isPv(r) ? "optional" : "") }),
  numberColumn({ key: "internalResistanceOhm", header: "Internal resistance (Ω)", label: "Internal resistance", placeholder: () => "0", applies: (r) => !isPv(r), width: "w-28" }),
  numberColumn({ key: "currentA", header: "Current (A)", label: "Current", required: true, applies: isPv }),
  flagColumn("primary", "Primary"),
];

const LOAD_MODELS: Option[] = [
  { value: "constantResistance", label: "Constant resistance" },
  { value: "constantCurrent", label: "Constant current" },
  { value: "constantPower", label: "Constant power" },
];

/** Rounds a converted figure to 4 significant digits (3.75 A, 0.9600 Ω). */
const round4 = (n: number) => (Number.isFinite(n) && n !== 0 ? Number(n.toPrecision(4)) : n);

/** The load's demand at nominal voltage, in watts, whatever its model. */
function wattsAtNominal(row: LoadRow, v: number): number | undefined {
  if (row.model === "constantPower") return row.watts;
  if (row.model === "constantCurrent") return row.amps * v;
  if (row.watts !== undefined) return row.watts;
  return row.ohms !== undefined && row.ohms > 0 ? (v * v) / row.ohms : undefined;
}

/** Another model keeps the same demand at nominal voltage (600 W at 24 V becomes 25 A). */
function changeLoadModel(row: LoadRow, model: LoadRow["model"], ctx: TableContext): LoadRow {
  if (model === row.model) return row;
  const { id, name, point, critical, minVoltage } = row;
  const common = { id, point, ...(name !== undefined && { name }), ...(critical !== undefined && { critical }), ...(minVoltage !== undefined && { minVoltage }) };
  const watts = wattsAtNominal(row, ctx.nominalVoltage) ?? 0;
  if (model === "constantPower") return { ...common, model, watts: round4(watts) };
  if (model === "constantCurrent") return { ...common, model, amps: round4(watts / ctx.nominalVoltage) };
  return { ...common, model, watts: round4(watts) };
}

type DemandField = "watts" | "amps" | "ohms";
function demandField(row: LoadRow): DemandField {
  if (row.model === "constantCurrent") return "amps";
  if (row.model === "constantResistance" && row.watts === undefined && row.ohms !== undefined) return "ohms";
  return "watts";
}
const DEMAND_WORD: Record<DemandField, string> = { watts: "Watts", amps: "Amps", ohms: "Ohms" };
const DEMAND_UNIT: Record<DemandField, string> = { watts: "W", amps: "A", ohms: "Ω" };

export const LOAD_COLUMNS: Column<LoadRow>[] = [
  idColumn(),
  nameColumn(),
  pointColumn("point", "Point"),
  {
    key: "model",
    header: () => "Model",
    label: () => "Model",
    fields: ["model"],
    editor: { type: "select", value: (r) => r.model, options: () => LOAD_MODELS },
    apply: (r, v, ctx) => changeLoadModel(r, v as LoadRow["model"], ctx),
    width: "w-40",
  },
  {
    key: "demand",
    header: () => "Demand",
    label: (r) => DEMAND_WORD[demandField(r)],
    fields: ["watts", "amps", "ohms"],
    editor: {
      type: "text",
      numeric: true,
      text: (r) => showNumber((r as Row)[demandField(r)] as number | undefined),
      parse: (t) => parseNumber(t, true),
      placeholder: (r) => DEMAND_UNIT[demandField(r)],
    },
    apply: (r, v) => ({ ...r, [demandField(r)]: v }) as LoadRow,
    width: "w-20",
  },
  {
    key: "demandUnit",
    header: () => "Unit",
    label: () => "Demand unit",
    fields: [],
    applies: (r) => r.model === "constantResistance",
    staticText: (r) => DEMAND_UNIT[demandField(r)],
    editor: {
      type: "select",
      value: (r) => demandField(r),
      options: () => [
        { value: "watts", label: "W at nominal" },
        { value: "ohms", label: "Ω" },
      ],
    },
    apply: (r, v, ctx) => {
      if (r.model !== "constantResistance" || v === demandField(r)) return r;
      const { watts, ohms, ...rest } = r;
      const vn = ctx.nominalVoltage;
      // R = V²/P at nominal voltage, both ways.
      if (v === "ohms") return { ...rest, ohms: watts !== undefined && watts > 0 ? round4((vn * vn) / watts) : 0 };
      return { ...rest, watts: ohms !== undefined && ohms > 0 ? round4((vn * vn) / ohms) : 0 };
    },
    width: "w-28",
  },
  {
    key: "critical",
    header: () => "Critical",
    label: () => "Critical",
    fields: ["critical"],
    editor: { type: "check", checked: (r) => r.critical === true },
    apply: (r, v) => ({ ...r, critical: Boolean(v) }),
    width: "w-16",
  },
  numberColumn({ key: "minVoltage", header: "Min. voltage (V)", label: "Min. voltage" }),
];

/** One column per source override: a voltage for each battery or supply, a current for each PV array. */
export function caseColumns(sources: SystemInput["sources"]): Column<CaseRow>[] {
  const overrides = sources.map((s): Column<CaseRow> => {
    const record = s.type === "pvArray" ? "sourceCurrents" : "sourceVoltages";
    const unit = s.type === "pvArray" ? "A" : "V";
    const word = s.type === "pvArray" ? "current" : "voltage";
    return {
      key: `${record}.${s.id}`,
      header: () => `${s.id} ${word} (${unit})`,
      label: () => `${s.id} ${word}`,
      fields: [`${record}.${s.id}`],
      editor: {
        type: "text",
        numeric: true,
        text: (r) => showNumber(r[record]?.[s.id]),
        parse: (t) => parseNumber(t, false),
        placeholder: () => (s.type === "pvArray" ? "" : String(s.voltage ?? "")),
      },
      apply: (r, v) => setOverride(r, record, s.id, v as number | undefined),
      width: "w-28",
    };
  });
  return [
    {
      key: "name",
      header: () => "Name",
      label: () => "Name",
      fields: ["name"],
      editor: { type: "text", text: (r) => r.name, parse: (t) => (t.trim() === "" ? REQUIRED : ok(t.trim())) },
      apply: (r, v) => ({ ...r, name: v as string }),
      unique: true,
      width: "w-48",
    },
    ...overrides,
    numberColumn({
      key: "conductorTemperatureC",
      header: "Conductor temperature (°C)",
      label: "Conductor temperature",
      placeholder: (_r, ctx) => `${ctx.systemTemperatureC} (system)`,
      width: "w-32",
    }),
    numberColumn({ key: "loadFactor", header: "Load factor (×)", label: "Load factor", placeholder: () => "1" }),
  ];
}
