import type { FieldValues, Path, UseFormSetError } from "react-hook-form";
import { ApiError, apiFieldErrors } from "./api-client";

/**
 * Puts a failed request's field errors beside the form's own fields and returns
 * what is left for the form's alert box (null when every error found its field).
 * `rename` maps an API field to the form field that edits it (labourRateMinor → labourRate).
 */
export function applyServerError<T extends FieldValues>(
  error: unknown,
  setError: UseFormSetError<T>,
  fieldNames: ReadonlyArray<Path<T>>,
  rename: Partial<Record<string, Path<T>>> = {},
): string | null {
  if (!(error instanceof ApiError)) return error instanceof Error ? error.message : "Something went wrong. Try again.";
  const fields = apiFieldErrors(error);
  const known = new Set<string>(fieldNames);
  const unplaced: string[] = [];
  let placed = 0;
  let focused = false;
  for (const [apiName, message] of Object.entries(fields)) {
    const name = rename[apiName] ?? apiName;
    if (known.has(name)) {
      setError(name as Path<T>, { type: "server", message }, { shouldFocus: !focused });
      focused = true;
      placed += 1;
    } else {
      unplaced.push(message);
    }
  }
  if (placed === 0) return error.message;
  return unplaced.length > 0 ? unplaced.join(" ") : null;
}
