import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import { QuoteDetailSchema, type CreateQuoteInput } from "../../../../shared/schemas/estimates";
import { apiRequest } from "../../../lib/api-client";
import { dashboardKey } from "../../dashboard/api/get-dashboard";
import { jobQuotesQueryOptions } from "./get-job-quotes";
import { quoteQueryOptions } from "./get-quote";

// 201 a draft revision frozen from the estimate; 422 unprocessable while prices are missing or there is no estimate.
export const createQuote = ({ jobId, input = {} }: { jobId: string; input?: z.input<typeof CreateQuoteInput> }) =>
  apiRequest(`/jobs/${encodeURIComponent(jobId)}/quotes`, QuoteDetailSchema, { method: "POST", body: input });

export function useCreateQuote() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createQuote,
    onSuccess: (quote) => {
      queryClient.setQueryData(quoteQueryOptions(quote.id).queryKey, quote);
      void queryClient.invalidateQueries({ queryKey: jobQuotesQueryOptions(quote.jobId).queryKey });
      void queryClient.invalidateQueries({ queryKey: dashboardKey });
    },
  });
}
