import Papa from "papaparse";
import { normalizeSize } from "../../shared/engine/conductors.js";
import { runSchema, type SystemInput } from "../../shared/engine/schema.js";
import { AppError } from "../errors.js";

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

export interface RowError {
  line: number;
  column: string | null;
  message: string;
}

// A cell a spreadsheet would run as a formula is written with a leading apostrophe (OWASP "CSV
// injection"); import takes the apostrophe off again.
const FORMULA_START = /^[=+\-@\t\r]/;
const neutralise = (v: string) => (FORMULA_START.test(v) ? `'${v}` : v);
const unneutralise = (v: string) => (v.startsWith("'") && FORMULA_START.test(v.slice(1)) ? v.slice(1) : v);

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

function decodeUtf8(bytes: Buffer): string {
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes).replace(/^\uFEFF/, "");
  } catch {
    throw new AppError("invalid_input", "file: the CSV is not UTF-8 text; save it from your spreadsheet as \"CSV UTF-8\"", {
      field: "file",
      rows: [{ line: 1, column: null, message: "not UTF-8 text" }],
    });
  }
}

function refuse(errors: RowError[]): never {
  const first = errors[0];
  const where = `line ${first.line}${first.column ? `, column ${first.column}` : ""}`;
  throw new AppError("invalid_input", `file: ${where}: ${first.message}${errors.length > 1 ? ` (and ${errors.length - 1} more)` : ""}; nothing was imported`, {
    field: "file",
    rows: errors.slice(0, 200),
  });
}

/**
 * Reads a CSV of runs against the system's points. Every row is checked; any error refuses the whole
 * file (nothing is saved), each error naming its line (the header is line 1) and column.
 */
export function runsFromCsv(bytes: Buffer, document: SystemInput): SystemInput["runs"] {
  const text = decodeUtf8(bytes);
  if (text.trim() === "") refuse([{ line: 1, column: null, message: "the file is empty; the first line must name the columns" }]);
  const parsed = Papa.parse<string[]>(text, { skipEmptyLines: "greedy" });
  const errors: RowError[] = [];
  for (const e of parsed.errors) errors.push({ line: (e.row ?? 0) + 1, column: null, message: e.message });
  const [header = [], ...rows] = parsed.data;
  // Papa reports the data's line numbers only through the rows it kept; blank lines are skipped,
  // so find each row's line in the text.
  const lines = lineNumbers(text, parsed.data.length);
  const names = header.map((h) => h.trim());
  names.forEach((name, i) => {
    if (!(RUN_COLUMNS as readonly string[]).includes(name)) {
      errors.push({ line: 1, column: name || `(column ${i + 1})`, message: `unknown column "${name}"; the columns are ${RUN_COLUMNS.join(", ")}` });
    }
    if (names.indexOf(name) !== i) errors.push({ line: 1, column: name, message: `column "${name}" appears twice` });
  });
  for (const column of REQUIRED) if (!names.includes(column)) errors.push({ line: 1, column, message: `the required column "${column}" is missing` });
  if (errors.length) refuse(errors);

  const pointIds = new Set(document.points.map((p) => p.id));
  const seen = new Map<string, number>();
  const runs: SystemInput["runs"] = [];
  rows.forEach((cells, index) => {
    const line = lines[index + 1];
    if (cells.length !== names.length) {
      errors.push({ line, column: null, message: `has ${cells.length} cells; the header has ${names.length}` });
      return;
    }
    const raw: Record<string, unknown> = {};
    const rowErrors: RowError[] = [];
    names.forEach((column, i) => {
      const cell = unneutralise(cells[i].trim());
      if (cell === "") return;
      if ((NUMERIC as string[]).includes(column)) {
        const n = Number(cell);
        if (!Number.isFinite(n)) rowErrors.push({ line, column, message: `"${cell}" is not a number` });
        else raw[column] = n;
      } else if (column === "length") {
        raw.length = /^[+-]?\d+(\.\d+)?$/.test(cell) ? Number(cell) : cell;
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

/** The 1-based line on which each of the first `count` non-blank records starts. */
function lineNumbers(text: string, count: number): number[] {
  const out: number[] = [];
  let line = 1;
  let inQuotes = false;
  let recordStarted = false;
  let blank = true;
  for (let i = 0; i < text.length && out.length < count; i++) {
    const ch = text[i];
    if (!recordStarted) {
      recordStarted = true;
      blank = true;
      out.push(line);
    }
    if (ch === '"') inQuotes = !inQuotes;
    if (ch === "\n") {
      line++;
      if (!inQuotes) {
        if (blank) out.pop();
        recordStarted = false;
      }
    } else if (!/[\s,;]/.test(ch)) {
      blank = false;
    }
  }
  return out;
}
