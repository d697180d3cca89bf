// The server's and the engine's errors arrive keyed by document path ("runs[2].size", or
// "document.runs[2].size" from a save); the tables need them per row and field.
import type { TableTab } from "./types";

/** field ("" for the row itself) → message, for one row. */
export type RowErrors = Readonly<Record<string, string>>;
export type TableErrors = ReadonlyMap<number, RowErrors>;

const PATH = /^(?:document\.)?(points|runs|sources|loads|cases)\[(\d+)\](?:\.(.+))?$/;

/** Groups errors by table and row. A message that repeats its own path ("runs[2].size: …", as
 *  the engine writes them) loses that prefix: the cell already says where it is. */
export function groupErrors(errors: Record<string, string> | undefined): ReadonlyMap<TableTab, TableErrors> {
  const byTable = new Map<TableTab, Map<number, Record<string, string>>>();
  if (!errors) return byTable;
  for (const [path, message] of Object.entries(errors)) {
    const m = PATH.exec(path);
    if (!m) continue;
    const tab = m[1] as TableTab;
    const index = Number(m[2]);
    const field = m[3] ?? "";
    const bare = path.replace(/^document\./, "");
    const text = message.startsWith(`${bare}: `) ? message.slice(bare.length + 2) : message;
    let rows = byTable.get(tab);
    if (!rows) byTable.set(tab, (rows = new Map()));
    const row = rows.get(index) ?? {};
    row[field] = row[field] ? `${row[field]}; ${text}` : text;
    rows.set(index, row);
  }
  return byTable;
}

/** The message for a cell owning `fields`: the first field with one; the row's own message and
 *  those of fields no column shows go on the first cell. */
export function cellError(rowErrors: RowErrors | undefined, fields: readonly string[], first: boolean, shown: ReadonlySet<string>): string | undefined {
  if (!rowErrors) return undefined;
  for (const field of fields) if (rowErrors[field]) return rowErrors[field];
  if (!first) return undefined;
  const rest = Object.entries(rowErrors).filter(([field]) => !shown.has(field));
  if (rest.length === 0) return undefined;
  return rest.map(([field, message]) => (field ? `${field}: ${message}` : message)).join("; ");
}
