import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import { QuoteDetailSchema, type SendQuoteInput } from "../../../../shared/schemas/estimates";
import { ApiError, apiRequest } from "../../../lib/api-client";
import { dashboardKey } from "../../dashboard/api/get-dashboard";
import { jobQuotesQueryOptions } from "./get-job-quotes";
import { quoteQueryOptions } from "./get-quote";

// Idempotent: a sent quote is not sent again. 202: the mail server did not take it and the server
// keeps trying (`sendPendingSince`). 502 mail_failed (a server without a job queue): the quote stays
// a draft with `sendError`.
export const sendQuote = ({ quoteId, input }: { quoteId: string; input: z.input<typeof SendQuoteInput> }) =>
  apiRequest(`/quotes/${encodeURIComponent(quoteId)}/send`, QuoteDetailSchema, { method: "POST", body: input });

export const isMailFailure = (error: unknown) => error instanceof ApiError && (error.code === "mail_failed" || error.status === 502);

export function useSendQuote() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: sendQuote,
    onSuccess: (quote) => {
      queryClient.setQueryData(quoteQueryOptions(quote.id).queryKey, quote);
      void queryClient.invalidateQueries({ queryKey: jobQuotesQueryOptions(quote.jobId).queryKey });
      void queryClient.invalidateQueries({ queryKey: dashboardKey });
    },
    // A failed mail is recorded on the quote (sendError, an event): read it again.
    onError: (error, { quoteId }) => {
      if (isMailFailure(error)) void queryClient.invalidateQueries({ queryKey: quoteQueryOptions(quoteId).queryKey });
    },
  });
}
