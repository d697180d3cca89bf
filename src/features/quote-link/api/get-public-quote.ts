import { queryOptions, useQuery } from "@tanstack/react-query";
import type { z } from "zod";
import { ClosedLinkDetails, PublicQuoteSchema } from "../../../../shared/schemas/estimates";
import { ApiError, apiRequest } from "../../../lib/api-client";

export type ClosedLink = z.infer<typeof ClosedLinkDetails>;

/** The token goes into the path as one segment, whatever the address bar held. */
export const quoteLinkPath = (token: string) => `/quote-links/${encodeURIComponent(token)}`;

/** The PDF of the quote behind a link (same token, no session). */
export const quoteLinkPdfHref = (token: string) => `/api${quoteLinkPath(token)}/pdf`;

/** The deposit's receipt behind a link, once paid: opened in the browser, or downloaded. */
export const quoteLinkReceiptHref = (token: string, download = false) => `/api${quoteLinkPath(token)}/receipt.pdf${download ? "?download=1" : ""}`;

// No session: the token is the key. A link that no longer works answers 410 (404 when unknown)
// with ClosedLinkDetails, read by closedLinkOf().
export const getPublicQuote = (token: string) => apiRequest(quoteLinkPath(token), PublicQuoteSchema);

export const publicQuoteQueryOptions = (token: string) =>
  queryOptions({ queryKey: ["quote-link", token], queryFn: () => getPublicQuote(token), staleTime: 5 * 60_000 });

export const usePublicQuote = (token: string) => useQuery(publicQuoteQueryOptions(token));

/**
 * Why a link does not open its quote: the 410/404 details, or "unknown" with no contact for a 404
 * that carries none. null for any other failure (network, 500), which the page offers to retry.
 */
export function closedLinkOf(error: unknown): ClosedLink | null {
  if (!(error instanceof ApiError) || (error.status !== 410 && error.status !== 404)) return null;
  const parsed = ClosedLinkDetails.safeParse(error.details);
  if (parsed.success) return parsed.data;
  return error.status === 404 ? { reason: "unknown", companyName: null, contactEmail: null, phone: null } : null;
}
