// CSV helpers shared by every import and export: UTF-8 only, formula cells neutralised on export,
// errors as {line, column, message} with RFC 4180 line counting.
import { AppError } from "../errors.js";

export interface RowError {
  line: number;
  column: string | null;
  message: string;
}

// A cell a spreadsheet would run as a formula is written with a leading apostrophe (OWASP "CSV
// injection"); import takes the apostrophe off again. A cell starting with LF is marked too: import
// reads every line end as LF, so a CR start comes back as LF and must still lose its apostrophe.
const FORMULA_START = /^[=+\-@\t\r\n]/;
// A text that itself starts with an apostrophe gets one more, so import gives back exactly what was exported.
export const neutralise = (v: string) => (FORMULA_START.test(v) || v.startsWith("'") ? `'${v}` : v);
export const unneutralise = (v: string) => (v.startsWith("'") && (FORMULA_START.test(v.slice(1)) || v.startsWith("''")) ? v.slice(1) : v);

// Byte-order marks of the other Unicode encodings spreadsheets save ("Unicode text" is UTF-16 LE).
// UTF-32 first: its little-endian mark starts like UTF-16's.
const OTHER_ENCODINGS: Array<[number[], string]> = [
  [[0xff, 0xfe, 0x00, 0x00], "UTF-32"],
  [[0x00, 0x00, 0xfe, 0xff], "UTF-32"],
  [[0xff, 0xfe], "UTF-16"],
  [[0xfe, 0xff], "UTF-16"],
];

const notUtf8 = (what: string, line = 1) =>
  new AppError("invalid_input", `file: line ${line}: the CSV is not UTF-8 text (${what}); save it from your spreadsheet as "CSV UTF-8"`, {
    field: "file",
    rows: [{ line, column: null, message: `not UTF-8 text (${what})` }],
  });

/**
 * The file's text: UTF-8 only (a leading byte-order mark is dropped). UTF-16 and UTF-32 are named
 * by their byte-order marks; a NUL byte (UTF-16 without a mark, or a binary file) is refused with
 * its line: no spreadsheet writes one in a CSV and PostgreSQL cannot store it.
 */
export function decodeUtf8(bytes: Buffer): string {
  const other = OTHER_ENCODINGS.find(([mark]) => mark.every((b, i) => bytes[i] === b));
  if (other) throw notUtf8(`it is ${other[1]} text`);
  const nul = bytes.indexOf(0);
  if (nul >= 0) {
    const line = lineAt(bytes, nul);
    throw new AppError("invalid_input", `file: line ${line}: the CSV holds a NUL character, which text does not (is it UTF-16 or not a CSV at all?); save it from your spreadsheet as "CSV UTF-8"`, {
      field: "file",
      rows: [{ line, column: null, message: "holds a NUL character" }],
    });
  }
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes).replace(/^\uFEFF/, "");
  } catch {
    const { index, hex } = firstInvalidUtf8(bytes);
    throw notUtf8(`byte ${hex} is not UTF-8; the file may be Latin-1 or Windows-1252`, lineAt(bytes, index));
  }
}

/** The 1-based line of a byte offset, counting LF, CR and CRLF line ends. */
function lineAt(bytes: Buffer, index: number): number {
  let line = 1;
  for (let i = 0; i < index; i++) if (bytes[i] === 0x0a || (bytes[i] === 0x0d && bytes[i + 1] !== 0x0a)) line++;
  return line;
}

/** The offset and value of the first byte that is not part of valid UTF-8. */
function firstInvalidUtf8(bytes: Buffer): { index: number; hex: string } {
  const decoder = new TextDecoder("utf-8", { fatal: true, ignoreBOM: true });
  for (let i = 0; i < bytes.length; ) {
    const b = bytes[i];
    // The sequence's length from its lead byte (RFC 3629, 4); the decoder judges the rest.
    const length = b < 0x80 ? 1 : b >= 0xc2 && b <= 0xdf ? 2 : b >= 0xe0 && b <= 0xef ? 3 : b >= 0xf0 && b <= 0xf4 ? 4 : 0;
    let valid = length === 1;
    if (length > 1 && i + length <= bytes.length) {
      try {
        decoder.decode(bytes.subarray(i, i + length));
        valid = true;
      } catch {
        valid = false;
      }
    }
    if (!valid) return { index: i, hex: `0x${b.toString(16).toUpperCase().padStart(2, "0")}` };
    i += length;
  }
  return { index: bytes.length, hex: "?" };
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
