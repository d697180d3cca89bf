import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import { PublicQuoteSchema, type AcceptQuoteInput } from "../../../../shared/schemas/estimates";
import { apiRequest } from "../../../lib/api-client";
import { publicQuoteQueryOptions, quoteLinkPath } from "./get-public-quote";

export type AcceptQuoteBody = z.output<typeof AcceptQuoteInput>;

// Answers the quote in its new state ("accepted"); 400 invalid_input names the field; 410 when the link closed meanwhile.
export const acceptQuote = (token: string, body: AcceptQuoteBody) =>
  apiRequest(`${quoteLinkPath(token)}/accept`, PublicQuoteSchema, { method: "POST", body });

/** Accepts the quote and shows the server's answer in place of the page's copy. */
export function useAcceptQuote(token: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: AcceptQuoteBody) => acceptQuote(token, body),
    onSuccess: (quote) => queryClient.setQueryData(publicQuoteQueryOptions(token).queryKey, quote),
  });
}
