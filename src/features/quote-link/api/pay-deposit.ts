import { useMutation, useQueryClient } from "@tanstack/react-query";
import { DepositCheckoutSchema } from "../../../../shared/schemas/payments";
import { ApiError, apiRequest } from "../../../lib/api-client";
import { publicQuoteQueryOptions, quoteLinkPath } from "./get-public-quote";

// 200 { url } of the payment page (another origin). 409 conflict: already paid, not accepted, or
// details.state "processing" (paid, being confirmed); 503 online payment not set up; 502 payment
// service unreachable (nothing charged); 429 rate limited. Every message is written for the client.
export const startDepositPayment = (token: string) => apiRequest(`${quoteLinkPath(token)}/deposit`, DepositCheckoutSchema, { method: "POST" });

/** A 409 whose payment went through and is waiting for the payment service's confirmation. */
export const isPaymentProcessing = (error: unknown) => error instanceof ApiError && error.status === 409 && error.details?.state === "processing";

/** Only a web address is followed: anything else (a javascript: URL, say) is refused, not opened. */
export function paymentPageUrl(url: string): string {
  let protocol: string | null = null;
  try {
    protocol = new URL(url).protocol;
  } catch {
    // Not an absolute address: refused below.
  }
  if (protocol !== "https:" && protocol !== "http:") throw new ApiError(200, "unexpected_response", "The payment page's address was not understood. Please try again.");
  return url;
}

/**
 * "Pay deposit": asks the server for the payment page and goes there. A conflict means the page is
 * behind (paid meanwhile, or being confirmed), so the quote is read again.
 */
export function usePayDeposit(token: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async () => paymentPageUrl((await startDepositPayment(token)).url),
    onSuccess: (url) => window.location.assign(url),
    onError: (error) => {
      if (error instanceof ApiError && error.status === 409) void queryClient.invalidateQueries({ queryKey: publicQuoteQueryOptions(token).queryKey });
    },
  });
}
