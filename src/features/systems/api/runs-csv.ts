import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { SystemRecordSchema } from "../../../../shared/schemas/jobs";
import { ApiError, apiUpload } from "../../../lib/api-client";
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
  return apiUpload(runsCsvHref(systemId).replace(/^\/api/, ""), form, SystemRecordSchema);
}

export function useImportRunsCsv() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: importRunsCsv,
    onSuccess: (record) => queryClient.setQueryData(systemQueryOptions(record.id).queryKey, record),
  });
}
