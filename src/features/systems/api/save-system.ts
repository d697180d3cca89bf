import { useMutation, useQueryClient } from "@tanstack/react-query";
import { SystemConflictDetails, SystemRecordSchema } from "../../../../shared/schemas/jobs";
import type { SystemInput } from "../../../../shared/engine/schema";
import { ApiError, apiRequest } from "../../../lib/api-client";
import { systemQueryOptions } from "./get-system";

export interface SaveSystemVariables {
  systemId: string;
  /** The version this edit started from; a save by someone else in between answers 409. */
  version: number;
  name: string;
  limitProfileId: string | null;
  document: SystemInput;
}

export const saveSystem = ({ systemId, version, name, limitProfileId, document }: SaveSystemVariables) =>
  apiRequest(`/systems/${encodeURIComponent(systemId)}`, SystemRecordSchema, { method: "PUT", body: { version, name, limitProfileId, document } });

export function useSaveSystem() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: saveSystem,
    onSuccess: (record) => queryClient.setQueryData(systemQueryOptions(record.id).queryKey, record),
  });
}

/** The 409 of a stale save (or CSV import): who saved in between, when, and their version. */
export function conflictDetails(error: unknown) {
  if (!(error instanceof ApiError) || error.status !== 409) return null;
  const parsed = SystemConflictDetails.safeParse(error.details);
  return parsed.success ? parsed.data : null;
}

/**
 * A 400's field errors for the entry tables: the server names document fields "document.runs[2].size",
 * the tables know them as "runs[2].size". Fields outside the document (name, version) keep their names.
 */
export function documentFieldErrors(fields: Record<string, string>): { document: Record<string, string>; other: Record<string, string> } {
  const document: Record<string, string> = {};
  const other: Record<string, string> = {};
  for (const [path, message] of Object.entries(fields)) {
    if (path.startsWith("document.")) document[path.slice("document.".length)] = message;
    else other[path] = message;
  }
  return { document, other };
}
