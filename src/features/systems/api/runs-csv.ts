import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { CSRF_HEADER } from "../../../../shared/http";
import { ApiErrorBody } from "../../../../shared/schemas/error";
import { SystemRecordSchema } from "../../../../shared/schemas/jobs";
import { ApiError } from "../../../lib/api-client";
import { systemQueryOptions } from "./get-system";

/** The saved runs as CSV (a plain download link: the browser sends the session cookie). */
export const runsCsvHref = (systemId: string) => `/api/systems/${encodeURIComponent(systemId)}/runs.csv`;

const RowError = z.object({ line: z.number(), column: z.string().nullable().optional(), message: z.string() });
export type CsvRowError = z.infer<typeof RowError>;

/** The bad rows of a refused CSV (400 invalid_input, `details.rows`). */
export function csvRowErrors(error: unknown): CsvRowError[] {
  if (!(error instanceof ApiError)) return [];
  const parsed = z.array(RowError).safeParse(error.details?.rows);
  return parsed.success ? parsed.data : [];
}

/** "Line 4, column size: unknown size". */
export const formatCsvRowError = (row: CsvRowError) => `Line ${row.line}${row.column ? `, column ${row.column}` : ""}: ${row.message}`;

/**
 * Replaces the saved runs with the CSV's (the server saves: version + 1). Multipart, so not through
 * apiRequest (which sends JSON); the CSRF header goes on it all the same.
 */
export async function importRunsCsv({ systemId, file, version }: { systemId: string; file: File; version: number }) {
  const form = new FormData();
  form.append("file", file);
  form.append("version", String(version));
  let response: Response;
  try {
    response = await fetch(runsCsvHref(systemId), { method: "POST", credentials: "include", headers: { Accept: "application/json", [CSRF_HEADER]: "1" }, body: form });
  } catch {
    throw new ApiError(0, "network_error", "The server could not be reached. Check the connection and try again.");
  }
  const payload: unknown = await response.json().catch(() => undefined);
  if (!response.ok) {
    const parsed = ApiErrorBody.safeParse(payload);
    if (parsed.success) throw new ApiError(response.status, parsed.data.error.code, parsed.data.error.message, parsed.data.error.details);
    throw new ApiError(response.status, "unexpected_response", `The server answered ${response.status}.`);
  }
  const record = SystemRecordSchema.safeParse(payload);
  if (!record.success) throw new ApiError(response.status, "unexpected_response", "The server's answer was not understood.");
  return record.data;
}

export function useImportRunsCsv() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: importRunsCsv,
    onSuccess: (record) => queryClient.setQueryData(systemQueryOptions(record.id).queryKey, record),
  });
}
