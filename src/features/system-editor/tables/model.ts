// Pure operations on the network document for the entry tables: which list a table edits, new and
// duplicated rows with unique ids, deletes, and id renames carried to everything that refers to them.
import type { SystemInput } from "../../../../shared/engine/schema";
import type { ElementKind } from "../selection";
import type { TableTab } from "./types";

export type PointRow = SystemInput["points"][number];
export type RunRow = SystemInput["runs"][number];
export type SourceRow = SystemInput["sources"][number];
export type LoadRow = SystemInput["loads"][number];
export type CaseRow = NonNullable<SystemInput["cases"]>[number];
export type AnyRow = PointRow | RunRow | SourceRow | LoadRow | CaseRow;

export interface TableInfo {
  tab: TableTab;
  kind: ElementKind;
  /** Heading and tab name. */
  title: string;
  /** The element's word in labels: "run" in "Length of run r1". */
  noun: string;
  /** Prefix of the ids of new rows: "r" → r1, r2 … */
  prefix: string;
}

export const TABLES: readonly TableInfo[] = [
  { tab: "points", kind: "point", title: "Points", noun: "point", prefix: "p" },
  { tab: "runs", kind: "run", title: "Runs", noun: "run", prefix: "r" },
  { tab: "sources", kind: "source", title: "Sources", noun: "source", prefix: "s" },
  { tab: "loads", kind: "load", title: "Loads", noun: "load", prefix: "l" },
  { tab: "cases", kind: "case", title: "Cases", noun: "case", prefix: "Case " },
];
export const TABLE_BY_TAB: Record<TableTab, TableInfo> = Object.fromEntries(TABLES.map((t) => [t.tab, t])) as Record<TableTab, TableInfo>;

export const capitalise = (word: string) => word.charAt(0).toUpperCase() + word.slice(1);

/** A case is identified by its name; every other element by its id. */
export function rowId(row: AnyRow): string {
  return "id" in row ? row.id : row.name;
}

export function rowsOf(doc: SystemInput, tab: TableTab): readonly AnyRow[] {
  return tab === "cases" ? (doc.cases ?? []) : doc[tab];
}

/** The document with the list of `tab` replaced (an empty cases list is left out: the schema wants at least one). */
export function withRows(doc: SystemInput, tab: TableTab, rows: readonly AnyRow[]): SystemInput {
  if (tab === "cases") {
    if (rows.length > 0) return { ...doc, cases: rows as CaseRow[] };
    const { cases: _none, ...rest } = doc;
    return rest;
  }
  return { ...doc, [tab]: rows };
}

/** An id not used by any row of the table: "r5" after r1…r4; a copy of "well-pump" is "well-pump-2". */
export function uniqueId(taken: ReadonlySet<string>, base: string, separator = "-"): string {
  if (!taken.has(base)) return base;
  const numbered = /^(.*?)(\d+)$/.exec(base);
  const stem = numbered ? numbered[1] : `${base}${separator}`;
  let n = numbered ? Number(numbered[2]) + 1 : 2;
  while (taken.has(`${stem}${n}`)) n += 1;
  return `${stem}${n}`;
}

const idsOf = (rows: readonly AnyRow[]) => new Set(rows.map(rowId));

/** The id a new row of this table gets: the prefix and the first free number from the row count up. */
export function nextId(doc: SystemInput, tab: TableTab): string {
  const rows = rowsOf(doc, tab);
  const taken = idsOf(rows);
  const info = TABLE_BY_TAB[tab];
  let n = rows.length + 1;
  while (taken.has(`${info.prefix}${n}`)) n += 1;
  return `${info.prefix}${n}`;
}

/** A new row with what can be guessed filled in and what cannot (a run's length) left empty, so the
 *  estimator types it rather than a made-up figure going into the solve. */
export function newRow(doc: SystemInput, tab: TableTab): AnyRow {
  const id = nextId(doc, tab);
  switch (tab) {
    case "points":
      return { id };
    case "runs": {
      const previous = doc.runs.at(-1);
      const from = previous?.to ?? doc.points[0]?.id ?? "";
      // The first point nothing feeds yet is the likeliest far end.
      const fed = new Set(doc.runs.map((r) => r.to));
      const to = doc.points.find((p) => p.id !== from && !fed.has(p.id))?.id ?? doc.points.find((p) => p.id !== from)?.id ?? "";
      const run: RunRow = { id, from, to, length: "", size: previous?.size ?? (doc.units === "metric" ? "2.5 mm2" : "12 AWG") };
      if (previous?.material) run.material = previous.material;
      return run;
    }
    case "sources":
      return { id, type: "battery", point: doc.sources.at(-1)?.point ?? doc.points[0]?.id ?? "", voltage: doc.nominalVoltage };
    case "loads":
      return { id, point: doc.loads.at(-1)?.point ?? doc.points.at(-1)?.id ?? "", model: "constantPower", watts: 0 };
    case "cases":
      return { name: id };
  }
}

export function withRowId(row: AnyRow, id: string): AnyRow {
  return "id" in row ? { ...row, id } : { ...row, name: id };
}

export function duplicateRow(doc: SystemInput, tab: TableTab, index: number): { doc: SystemInput; index: number } {
  const rows = rowsOf(doc, tab);
  const source = rows[index];
  const copy = withRowId(structuredClone(source), uniqueId(idsOf(rows), rowId(source), tab === "cases" ? " " : "-"));
  return { doc: withRows(doc, tab, [...rows.slice(0, index + 1), copy, ...rows.slice(index + 1)]), index: index + 1 };
}

export function insertRow(doc: SystemInput, tab: TableTab, index: number, row: AnyRow): SystemInput {
  const rows = rowsOf(doc, tab);
  const at = Math.min(Math.max(index, 0), rows.length);
  return withRows(doc, tab, [...rows.slice(0, at), row, ...rows.slice(at)]);
}

export function deleteRow(doc: SystemInput, tab: TableTab, index: number): SystemInput {
  const rows = rowsOf(doc, tab);
  const next = withRows(doc, tab, rows.filter((_, i) => i !== index));
  if (tab === "sources") {
    // A case's override for a source that no longer exists would only be an error in the solve.
    const gone = rowId(rows[index]);
    return withoutCaseOverrides(next, gone);
  }
  return next;
}

function withoutCaseOverrides(doc: SystemInput, sourceId: string): SystemInput {
  if (!doc.cases?.some((c) => c.sourceVoltages?.[sourceId] !== undefined || c.sourceCurrents?.[sourceId] !== undefined)) return doc;
  return { ...doc, cases: doc.cases.map((c) => setOverride(setOverride(c, "sourceVoltages", sourceId, undefined), "sourceCurrents", sourceId, undefined)) };
}

/** Sets (or, with undefined, removes) a case's per-source override; an emptied record is left out. */
export function setOverride(row: CaseRow, record: "sourceVoltages" | "sourceCurrents", sourceId: string, value: number | undefined): CaseRow {
  const current = row[record];
  if (value === undefined && current?.[sourceId] === undefined) return row;
  const nextRecord = { ...current };
  if (value === undefined) delete nextRecord[sourceId];
  else nextRecord[sourceId] = value;
  const next = { ...row, [record]: nextRecord };
  if (Object.keys(nextRecord).length === 0) delete next[record];
  return next;
}

/** Replaces one row; when its id changed, every reference to the old id follows (a point's runs,
 *  sources and loads; a source's case overrides). A source marked primary un-marks the others. */
export function replaceRow(doc: SystemInput, tab: TableTab, index: number, row: AnyRow): SystemInput {
  const rows = rowsOf(doc, tab);
  const before = rows[index];
  let next = withRows(doc, tab, rows.map((r, i) => (i === index ? row : r)));
  const oldId = rowId(before);
  const newId = rowId(row);
  if (tab === "points" && oldId !== newId) {
    const moved = <T extends { point: string }>(r: T): T => (r.point === oldId ? { ...r, point: newId } : r);
    next = {
      ...next,
      runs: next.runs.map((r) => (r.from === oldId || r.to === oldId ? { ...r, from: r.from === oldId ? newId : r.from, to: r.to === oldId ? newId : r.to } : r)),
      sources: next.sources.map(moved),
      loads: next.loads.map(moved),
    };
  }
  if (tab === "sources" && oldId !== newId && next.cases) {
    next = {
      ...next,
      cases: next.cases.map((c) => {
        let out = c;
        for (const record of ["sourceVoltages", "sourceCurrents"] as const) {
          const value = c[record]?.[oldId];
          if (value !== undefined) out = setOverride(setOverride(out, record, oldId, undefined), record, newId, value);
        }
        return out;
      }),
    };
  }
  if (tab === "sources" && (row as SourceRow).primary && !(before as SourceRow).primary) {
    next = {
      ...next,
      sources: next.sources.map((s, i) => {
        if (i === index || !s.primary) return s;
        const { primary: _dropped, ...rest } = s;
        return rest as SourceRow;
      }),
    };
  }
  return next;
}

/** Whether two rows hold the same values (rows are small JSON objects). */
export function sameRow(a: AnyRow, b: AnyRow): boolean {
  return a === b || JSON.stringify(a) === JSON.stringify(b);
}
