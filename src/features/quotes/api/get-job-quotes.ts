import { queryOptions, useQuery } from "@tanstack/react-query";
import { QuoteListSchema } from "../../../../shared/schemas/estimates";
import { apiRequest } from "../../../lib/api-client";
import { quotesKey } from "./get-quote";

// Newest first.
export const getJobQuotes = (jobId: string, signal?: AbortSignal) => apiRequest(`/jobs/${encodeURIComponent(jobId)}/quotes`, QuoteListSchema, { signal });

export const jobQuotesQueryOptions = (jobId: string) =>
  queryOptions({ queryKey: [...quotesKey, "job", jobId], queryFn: ({ signal }) => getJobQuotes(jobId, signal) });

export const useJobQuotes = (jobId: string) => useQuery(jobQuotesQueryOptions(jobId));
