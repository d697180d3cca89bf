import Papa from "papaparse";
import { normalizeSize } from "../../shared/engine/conductors.js";
import { convertLength } from "../../shared/engine/lengths.js";
import { runSchema, type SystemInput } from "../../shared/engine/schema.js";
import { decodeUtf8, lineNumbers, neutralise, refuse, unneutralise, type RowError } from "./csv.js";

// The CSV of runs: one row per run, the network file's run fields as columns, lengths in the
// system's units (m or ft). The header row names the columns; order does not matter on import.
export const RUN_COLUMNS = [
  "id",
  "name",
  "from",
  "to",
  "length",
  "size",
  "material",
  "parallel",
  "kind",
  "fuseA",
  "fuseInterruptingA",
  "insulationC",
  "stranding",
  "returnSize",
  "locked",
] as const;
type Column = (typeof RUN_COLUMNS)[number];
const REQUIRED: Column[] = ["id", "from", "to", "length", "size"];
const NUMERIC: Column[] = ["parallel", "fuseA", "fuseInterruptingA", "insulationC"];

/** The runs of a document as CSV text (RFC 4180, CRLF line ends, header row). */
export function runsToCsv(document: SystemInput): string {
  const rows = document.runs.map((run) =>
    RUN_COLUMNS.map((column) => {
      const value = (run as Record<string, unknown>)[column];
      if (value === undefined || value === null) return "";
      return typeof value === "string" ? neutralise(value) : String(value);
    }),
  );
  return Papa.unparse({ fields: [...RUN_COLUMNS], data: rows }, { newline: "\r\n" });
}

/**
 * Reads a CSV of runs against the system's points. Every row is checked; any error refuses the whole
 * file (nothing is saved), each error naming its line (the header is line 1) and column.
 */
export async function runsFromCsv(bytes: Buffer, document: SystemInput): Promise<SystemInput["runs"]> {
  // CR-only (old Mac) and CRLF line ends are read as LF, so line numbers count every kind.
  const text = decodeUtf8(bytes).replace(/\r\n?/g, "\n");
  if (text.trim() === "") refuse([{ line: 1, column: null, message: "the file is empty; the first line must name the columns" }]);
  // The header may name each known column once: a longer one is refused before any per-column work.
  const firstLine = text.slice(0, text.indexOf("\n") === -1 ? text.length : text.indexOf("\n"));
  if (firstLine.split(/[,;\t|]/).length > RUN_COLUMNS.length * 2) {
    refuse([{ line: 1, column: null, message: `the header has more columns than the ${RUN_COLUMNS.length} a CSV of runs can have (${RUN_COLUMNS.join(", ")})` }]);
  }
  const parsed = Papa.parse<string[]>(text, { skipEmptyLines: "greedy" });
  const errors: RowError[] = [];
  for (const e of parsed.errors) errors.push({ line: (e.row ?? 0) + 1, column: null, message: e.message });
  const [header = [], ...rows] = parsed.data;
  // Papa reports the data's line numbers only through the rows it kept; blank lines are skipped,
  // so find each row's line in the text.
  const lines = lineNumbers(text, parsed.data.length, parsed.meta.delimiter || ",");
  const names = header.map((h) => h.trim());
  const seenColumns = new Set<string>();
  names.forEach((name, i) => {
    if (!(RUN_COLUMNS as readonly string[]).includes(name)) {
      errors.push({ line: 1, column: name || `(column ${i + 1})`, message: `unknown column "${name}"; the columns are ${RUN_COLUMNS.join(", ")}` });
    }
    if (seenColumns.has(name)) errors.push({ line: 1, column: name, message: `column "${name}" appears twice` });
    seenColumns.add(name);
  });
  for (const column of REQUIRED) if (!names.includes(column)) errors.push({ line: 1, column, message: `the required column "${column}" is missing` });
  if (errors.length) refuse(errors);
  if (rows.length === 0) refuse([{ line: 2, column: null, message: "the file has no runs under its header; importing it would remove every run" }]);

  const pointIds = new Set(document.points.map((p) => p.id));
  const seen = new Map<string, number>();
  const runs: SystemInput["runs"] = [];
  // Lengths typed with a unit ("130 ft") are converted to the system's units here, so a bad one is
  // reported with its line like any other cell.
  const lengths = await Promise.all(
    rows.map(async (cells) => {
      const i = names.indexOf("length");
      const cell = i >= 0 && cells.length === names.length ? cells[i].trim() : "";
      return cell === "" || /^[+-]?\d+(\.\d+)?$/.test(cell) ? null : convertLength(cell, document.units);
    }),
  );
  rows.forEach((cells, index) => {
    const line = lines[index + 1] ?? index + 2;
    if (cells.length !== names.length) {
      errors.push({ line, column: null, message: `has ${cells.length} cells; the header has ${names.length}` });
      return;
    }
    const raw: Record<string, unknown> = {};
    const rowErrors: RowError[] = [];
    names.forEach((column, i) => {
      // A name keeps its spaces; every other cell is an id, a number or a choice.
      const cell = unneutralise(column === "name" ? cells[i] : cells[i].trim());
      if (cell.trim() === "") return;
      if ((NUMERIC as string[]).includes(column)) {
        const n = Number(cell);
        if (!Number.isFinite(n)) rowErrors.push({ line, column, message: `"${cell}" is not a number` });
        else raw[column] = n;
      } else if (column === "length") {
        const converted = lengths[index];
        if (converted && typeof converted === "object") rowErrors.push({ line, column, message: converted.error });
        raw.length = converted === null ? Number(cell) : typeof converted === "number" ? converted : cell;
        if (typeof raw.length === "number" && raw.length <= 0) rowErrors.push({ line, column, message: "must be more than 0 (a one-way length)" });
      } else if (column === "locked") {
        const v = cell.toLowerCase();
        if (["true", "yes", "1", "y"].includes(v)) raw.locked = true;
        else if (["false", "no", "0", "n"].includes(v)) raw.locked = false;
        else rowErrors.push({ line, column, message: `"${cell}" must be yes or no` });
      } else if (column === "size" || column === "returnSize") {
        const size = normalizeSize(cell, document.units);
        if (!size) rowErrors.push({ line, column, message: `"${cell}" is not a conductor size we know (e.g. "16 mm2", "10 AWG", "250 kcmil")` });
        else raw[column] = size;
      } else if (column === "material") {
        const v = cell.toLowerCase();
        raw.material = v === "aluminium" ? "aluminum" : v;
      } else {
        raw[column] = cell;
      }
    });
    const checked = runSchema.safeParse(raw);
    if (!checked.success) {
      for (const issue of checked.error.issues) {
        const column = issue.path[0] === undefined ? null : String(issue.path[0]);
        if (!rowErrors.some((e) => e.column === column)) rowErrors.push({ line, column, message: issue.message });
      }
    }
    for (const end of ["from", "to"] as const) {
      const id = raw[end];
      if (typeof id === "string" && !pointIds.has(id) && !rowErrors.some((e) => e.column === end)) {
        rowErrors.push({ line, column: end, message: `no point "${id}" in this system; add the point first` });
      }
    }
    const id = raw.id;
    if (typeof id === "string") {
      const earlier = seen.get(id);
      if (earlier !== undefined) rowErrors.push({ line, column: "id", message: `run "${id}" is already on line ${earlier}` });
      else seen.set(id, line);
    }
    errors.push(...rowErrors);
    if (rowErrors.length === 0) runs.push(raw as SystemInput["runs"][number]);
  });
  if (errors.length) refuse(errors.sort((a, b) => a.line - b.line));
  return runs;
}

