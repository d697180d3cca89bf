import { queryOptions, useQuery } from "@tanstack/react-query";
import { QuoteDetailSchema } from "../../../../shared/schemas/estimates";
import { apiRequest } from "../../../lib/api-client";

export const getQuote = (quoteId: string, signal?: AbortSignal) => apiRequest(`/quotes/${encodeURIComponent(quoteId)}`, QuoteDetailSchema, { signal });

/** The prefix of every quote key (one quote, a job's list). */
export const quotesKey = ["quotes"] as const;

export const quoteQueryOptions = (quoteId: string) =>
  queryOptions({ queryKey: [...quotesKey, "detail", quoteId], queryFn: ({ signal }) => getQuote(quoteId, signal) });

export const useQuote = (quoteId: string) => useQuery(quoteQueryOptions(quoteId));
