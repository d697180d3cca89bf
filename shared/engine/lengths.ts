// Lengths typed with a unit ("130 ft", "40 m", "12.5 yd") converted to the system's units with
// mathjs's unit support. mathjs takes about 0.6 s to load, so it is imported only when a
// document actually has a text length.
import { SYSTEM_LIMITS, type SystemInput } from "./schema.js";

export interface LengthError { path: string; message: string }

/** Converts one length to metres (units "metric") or feet ("imperial"). A bare number is already
 *  in the system's units. Returns an error message for text mathjs cannot read as a length. */
export async function convertLength(value: number | string, units: "metric" | "imperial"): Promise<number | { error: string }> {
  if (typeof value === "number") return value;
  const text = value.trim();
  if (/^[+-]?\d+(\.\d+)?$/.test(text)) return Number(text);
  const { unit } = await import("mathjs");
  try {
    const u = unit(text);
    if (!u.equalBase(unit("1 m"))) return { error: `"${value}" is not a length` };
    // A unit alone ("m", "ft") is a unit of 1 to mathjs; a length needs its number.
    if (u.value === null) return { error: `"${value}" has no number (try "40 m" or "130 ft")` };
    const n = u.toNumber(units === "metric" ? "m" : "ft");
    if (!Number.isFinite(n)) return { error: `"${value}" is not a finite length` };
    return n;
  } catch {
    return { error: `"${value}" is not a length mathjs can read (try "40 m" or "130 ft")` };
  }
}

/** Returns a copy of the document with every run's text length converted to a number, or the
 *  errors naming each run whose length cannot be read. Leaves anything else untouched (the
 *  schema reports it). */
export async function resolveLengths(input: unknown): Promise<{ ok: true; value: unknown } | { ok: false; errors: LengthError[] }> {
  if (!input || typeof input !== "object") return { ok: true, value: input };
  const doc = input as Partial<SystemInput> & Record<string, unknown>;
  // Over the size limit: left as it is for the schema to refuse (TOO_LARGE) without converting
  // tens of thousands of lengths first.
  if (!Array.isArray(doc.runs) || doc.runs.length > SYSTEM_LIMITS.runs || !doc.runs.some((r) => r && typeof r === "object" && typeof (r as { length?: unknown }).length === "string")) {
    return { ok: true, value: input };
  }
  const units = doc.units === "imperial" ? "imperial" : "metric";
  const errors: LengthError[] = [];
  const runs = await Promise.all(doc.runs.map(async (r, i) => {
    if (!r || typeof r !== "object" || typeof r.length !== "string") return r;
    const n = await convertLength(r.length, units);
    if (typeof n === "number") return { ...r, length: n };
    errors.push({ path: `runs[${i}].length`, message: `runs[${i}].length: ${n.error}` });
    return r;
  }));
  if (errors.length > 0) return { ok: false, errors };
  return { ok: true, value: { ...doc, runs } };
}
