import { useMutation } from "@tanstack/react-query";
import { z } from "zod";
import type { SystemInput } from "../../../../shared/engine/schema";
import type { SolveResult } from "../../../../shared/engine/system";
import { apiRequest } from "../../../lib/api-client";

const isRecord = (value: unknown): value is Record<string, unknown> => typeof value === "object" && value !== null;

/**
 * The engine's answer (shared/engine/system.ts). The engine is ours and typed; a light check of
 * its shape is enough to catch a wrong endpoint or a proxy's error page, without re-declaring it.
 */
export const SolveResultSchema = z.custom<SolveResult>(
  (value) =>
    isRecord(value) &&
    Array.isArray(value.cautions) &&
    (value.ok === true ? Array.isArray(value.cases) && Array.isArray(value.loads) && Array.isArray(value.findings) : value.ok === false && Array.isArray(value.errors)),
  "not a solve result",
);

export interface SolveVariables {
  systemId: string;
  document: SystemInput;
  signal?: AbortSignal;
}

/** Solves the unsaved document with the system's limit profile; nothing is saved. */
export const solveSystem = ({ systemId, document, signal }: SolveVariables) =>
  apiRequest(`/systems/${encodeURIComponent(systemId)}/solve`, SolveResultSchema, { method: "POST", body: { document }, signal });

// Every edit solves: answers not shown any more are dropped from the mutation cache at once (a large system's answer is megabytes).
export const useSolveSystem = () => useMutation({ mutationFn: solveSystem, gcTime: 0 });
