import { queryOptions, useQuery } from "@tanstack/react-query";
import { QuoteListSchema } from "../../../../shared/schemas/estimates";
import { apiRequest } from "../../../lib/api-client";
import { quotesKey } from "./get-quote";

// Newest first.
export const getJobQuotes = (jobId: string, signal?: AbortSignal) => apiRequest(`/jobs/${encodeURIComponent(jobId)}/quotes`, QuoteListSchema, { signal });

export const jobQuotesQueryOptions = (jobId: string) =>
  // staleTime 0: the client answers and pays from their own browser; fetch again each time the job opens.
  queryOptions({ queryKey: [...quotesKey, "job", jobId], queryFn: ({ signal }) => getJobQuotes(jobId, signal), staleTime: 0 });

export const useJobQuotes = (jobId: string) => useQuery(jobQuotesQueryOptions(jobId));
