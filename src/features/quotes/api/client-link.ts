import { useMutation, useQueryClient } from "@tanstack/react-query";
import { QuoteLinkSchema } from "../../../../shared/schemas/estimates";
import { apiRequest, NoContent } from "../../../lib/api-client";
import { quotesKey } from "./get-quote";

/** A fresh client link; the one before it stops working. */
export const createClientLink = (quoteId: string) => apiRequest(`/quotes/${encodeURIComponent(quoteId)}/link`, QuoteLinkSchema, { method: "POST" });

/** 204: the client link stops working. */
export const stopClientLink = (quoteId: string) => apiRequest(`/quotes/${encodeURIComponent(quoteId)}/link`, NoContent, { method: "DELETE" });

export function useCreateClientLink() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createClientLink, onSuccess: () => void queryClient.invalidateQueries({ queryKey: quotesKey }) });
}

export function useStopClientLink() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: stopClientLink, onSuccess: () => queryClient.invalidateQueries({ queryKey: quotesKey }) });
}
