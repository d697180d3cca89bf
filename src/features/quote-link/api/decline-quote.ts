import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import { PublicQuoteSchema, type DeclineQuoteInput } from "../../../../shared/schemas/estimates";
import { apiRequest } from "../../../lib/api-client";
import { publicQuoteQueryOptions, quoteLinkPath } from "./get-public-quote";

export type DeclineQuoteBody = z.output<typeof DeclineQuoteInput>;

// Answers the quote in its new state ("declined"); the reason is optional.
export const declineQuote = (token: string, body: DeclineQuoteBody) =>
  apiRequest(`${quoteLinkPath(token)}/decline`, PublicQuoteSchema, { method: "POST", body });

/** Declines the quote and shows the server's answer in place of the page's copy. */
export function useDeclineQuote(token: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: DeclineQuoteBody) => declineQuote(token, body),
    onSuccess: (quote) => queryClient.setQueryData(publicQuoteQueryOptions(token).queryKey, quote),
  });
}
