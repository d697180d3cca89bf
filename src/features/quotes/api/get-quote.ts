import { queryOptions, useQuery } from "@tanstack/react-query";
import { QuoteDetailSchema } from "../../../../shared/schemas/estimates";
import { apiRequest } from "../../../lib/api-client";

export const getQuote = (quoteId: string, signal?: AbortSignal) => apiRequest(`/quotes/${encodeURIComponent(quoteId)}`, QuoteDetailSchema, { signal });

/** The prefix of every quote key (one quote, a job's list). */
export const quotesKey = ["quotes"] as const;

export const quoteQueryOptions = (quoteId: string) =>
  queryOptions({
    queryKey: [...quotesKey, "detail", quoteId],
    queryFn: ({ signal }) => getQuote(quoteId, signal),
    // The client changes the quote from their own browser (opens, accepts, pays): never show a copy
    // cached before that as current, fetch again each time the screen opens.
    staleTime: 0,
    // While the e-mail waits for the mail server, look again every 5 s to show when it went.
    refetchInterval: (query) => (query.state.data?.sendPendingSince ? SEND_PENDING_POLL_MS : false),
  });

export const SEND_PENDING_POLL_MS = 5000;

export const useQuote = (quoteId: string) => useQuery(quoteQueryOptions(quoteId));
