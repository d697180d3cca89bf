// CSV helpers shared by every import and export: UTF-8 only, formula cells neutralised on export,
// errors as {line, column, message} with RFC 4180 line counting.
import { AppError } from "../errors.js";

export interface RowError {
  line: number;
  column: string | null;
  message: string;
}

// A cell a spreadsheet would run as a formula is written with a leading apostrophe (OWASP "CSV
// injection"); import takes the apostrophe off again.
const FORMULA_START = /^[=+\-@\t\r]/;
// A text that itself starts with an apostrophe gets one more, so import gives back exactly what was exported.
export const neutralise = (v: string) => (FORMULA_START.test(v) || v.startsWith("'") ? `'${v}` : v);
export const unneutralise = (v: string) => (v.startsWith("'") && (FORMULA_START.test(v.slice(1)) || v.startsWith("''")) ? v.slice(1) : v);

export function decodeUtf8(bytes: Buffer): string {
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes).replace(/^\uFEFF/, "");
  } catch {
    throw new AppError("invalid_input", "file: the CSV is not UTF-8 text; save it from your spreadsheet as \"CSV UTF-8\"", {
      field: "file",
      rows: [{ line: 1, column: null, message: "not UTF-8 text" }],
    });
  }
}

export function refuse(errors: RowError[]): never {
  const first = errors[0];
  const where = `line ${first.line}${first.column ? `, column ${first.column}` : ""}`;
  throw new AppError("invalid_input", `file: ${where}: ${first.message}${errors.length > 1 ? ` (and ${errors.length - 1} more)` : ""}; nothing was imported`, {
    field: "file",
    rows: errors.slice(0, 200),
  });
}

/**
 * The 1-based line on which each of the first `count` records starts, skipping blank lines as
 * papaparse's "greedy" mode does (lines of only spaces and delimiters). Quotes follow RFC 4180: a
 * quote opens a quoted field only at the start of a field, and "" inside one is a literal quote.
 * `text` has LF line ends only.
 */
export function lineNumbers(text: string, count: number, delimiter: string): number[] {
  const out: number[] = [];
  let line = 1;
  let recordLine = 1;
  let inQuotes = false;
  let fieldStart = true;
  let blank = true;
  const endRecord = () => {
    if (!blank) out.push(recordLine);
    blank = true;
    fieldStart = true;
    recordLine = line;
  };
  for (let i = 0; i < text.length && out.length < count; i++) {
    const ch = text[i];
    if (inQuotes) {
      if (ch === '"' && text[i + 1] === '"') i++;
      else if (ch === '"') inQuotes = false;
      else if (ch === "\n") line++;
      continue;
    }
    if (ch === "\n") {
      line++;
      endRecord();
      continue;
    }
    if (ch === '"' && fieldStart) {
      inQuotes = true;
      blank = false;
      fieldStart = false;
      continue;
    }
    if (text.startsWith(delimiter, i)) {
      fieldStart = true;
      i += delimiter.length - 1;
      continue;
    }
    if (!/\s/.test(ch)) blank = false;
    fieldStart = false;
  }
  if (out.length < count) endRecord();
  return out;
}
