import { useMutation } from "@tanstack/react-query";
import { z } from "zod";
import type { AutosizeResult, AutosizeSuccess } from "../../../../shared/engine/autosize";
import type { SystemInput } from "../../../../shared/engine/schema";
import { apiRequest } from "../../../lib/api-client";

/** The server adds where the prices came from to the engine's answer. */
export type AutosizeProposal = AutosizeSuccess & { costSource?: "price-list" | "default-prices"; costNote?: string };
export type AutosizeAnswer = AutosizeProposal | Extract<AutosizeResult, { ok: false }>;

const isRecord = (value: unknown): value is Record<string, unknown> => typeof value === "object" && value !== null;

export const AutosizeAnswerSchema = z.custom<AutosizeAnswer>(
  (value) =>
    isRecord(value) &&
    (value.ok === true ? Array.isArray(value.runs) && Array.isArray(value.loads) && isRecord(value.system) : value.ok === false && Array.isArray(value.errors)),
  "not an auto-size answer",
);

/** A proposal only: the cheapest passing sizes for the document as it is in the editor. Nothing is saved. */
export const autosizeSystem = ({ systemId, document }: { systemId: string; document: SystemInput }) =>
  apiRequest(`/systems/${encodeURIComponent(systemId)}/autosize`, AutosizeAnswerSchema, { method: "POST", body: { document } });

export const useAutosizeSystem = () => useMutation({ mutationFn: autosizeSystem });
