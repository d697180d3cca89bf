import { invalidParam } from "./errors.js";
import type { Metadata } from "./store.js";

// Reading form-encoded parameters as Express's extended parser gives them (`a[b][0][c]` → nested objects and
// arrays of strings). Every failure names the parameter the way the client wrote it.

export type Params = Record<string, unknown>;

export function asParams(body: unknown): Params {
  return body !== null && typeof body === "object" && !Array.isArray(body) ? (body as Params) : {};
}

/** 400 for a top-level parameter this stand-in does not know (it catches typos in the app's calls). */
export function rejectUnknown(params: Params, known: ReadonlySet<string>): void {
  for (const key of Object.keys(params)) {
    if (!known.has(key)) throw invalidParam(key, `Unknown parameter: ${key}. This stand-in does not support it.`);
  }
}

export function optionalString(value: unknown, param: string, maxLength = 5000): string | undefined {
  if (value === undefined) return undefined;
  if (typeof value !== "string") throw invalidParam(param, `${param} must be a string.`);
  if (value.length > maxLength) throw invalidParam(param, `${param} must be at most ${maxLength} characters.`);
  return value;
}

export function requiredString(value: unknown, param: string, maxLength = 5000): string {
  const text = optionalString(value, param, maxLength);
  if (text === undefined || text === "") throw invalidParam(param, `${param} is required.`);
  return text;
}

/** A whole number above zero, from a form string or a JSON number. */
export function optionalPositiveInteger(value: unknown, param: string): number | undefined {
  if (value === undefined) return undefined;
  const number = typeof value === "number" ? value : typeof value === "string" && /^\d+$/.test(value) ? Number(value) : NaN;
  if (!Number.isSafeInteger(number) || number <= 0) throw invalidParam(param, `${param} must be a positive integer.`);
  return number;
}

export function requiredPositiveInteger(value: unknown, param: string): number {
  if (value === undefined || value === "") throw invalidParam(param, `${param} is required.`);
  return optionalPositiveInteger(value, param) as number;
}

/** Three letters, answered lower-case. */
export function currencyCode(value: unknown, param: string): string {
  const text = requiredString(value, param);
  if (!/^[A-Za-z]{3}$/.test(text)) throw invalidParam(param, `${param} must be a three-letter ISO currency code.`);
  return text.toLowerCase();
}

export function httpUrl(value: unknown, param: string): string {
  const text = requiredString(value, param, 5000);
  let url: URL;
  try {
    url = new URL(text);
  } catch {
    throw invalidParam(param, `${param} is not a valid URL.`, "url_invalid");
  }
  if (url.protocol !== "http:" && url.protocol !== "https:") {
    throw invalidParam(param, `${param} must be an http or https URL.`, "url_invalid");
  }
  return text;
}

export function optionalEmail(value: unknown, param: string): string | undefined {
  const text = optionalString(value, param, 800);
  if (text === undefined || text === "") return undefined;
  if (!/^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(text)) throw invalidParam(param, `${param} is not a valid email address.`, "email_invalid");
  return text;
}

/** Key → string value; at most 50 keys of up to 40 characters, values up to 500. An empty value leaves the key out. */
export function readMetadata(value: unknown, param: string): Metadata {
  if (value === undefined || value === "") return {};
  if (value === null || typeof value !== "object" || Array.isArray(value)) {
    throw invalidParam(param, `${param} must be a set of key-value pairs.`);
  }
  const metadata: Metadata = {};
  const entries = Object.entries(value as Record<string, unknown>);
  if (entries.length > 50) throw invalidParam(param, `${param} can have at most 50 keys.`);
  for (const [key, item] of entries) {
    const itemParam = `${param}[${key}]`;
    if (key.length > 40) throw invalidParam(itemParam, `${param} keys must be at most 40 characters.`);
    if (typeof item !== "string" && typeof item !== "number") throw invalidParam(itemParam, `${itemParam} must be a string.`);
    const text = String(item);
    if (text.length > 500) throw invalidParam(itemParam, `${itemParam} must be at most 500 characters.`);
    if (text !== "") metadata[key] = text;
  }
  return metadata;
}

/**
 * The items of an indexed list with the index each was sent with. The parser gives an array, or (past 20
 * items) an object keyed by index.
 */
export function readList(value: unknown, param: string): { index: string; item: unknown }[] {
  if (Array.isArray(value)) return value.map((item, index) => ({ index: String(index), item }));
  if (value !== null && typeof value === "object") {
    const keys = Object.keys(value);
    if (keys.every((key) => /^\d+$/.test(key))) {
      return keys
        .sort((a, b) => Number(a) - Number(b))
        .map((index) => ({ index, item: (value as Record<string, unknown>)[index] }));
    }
  }
  throw invalidParam(param, `${param} must be a list, e.g. ${param}[0][quantity]=1.`);
}
