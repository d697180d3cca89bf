import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import { PaymentSchema, type RefundInput } from "../../../../shared/schemas/payments";
import { apiRequest } from "../../../lib/api-client";
import { dashboardKey } from "../../dashboard/api/get-dashboard";
import { quotesKey } from "../../quotes/api/get-quote";
import { paymentsKey } from "./get-job-payments";

export type RefundBody = z.output<typeof RefundInput>;

// 201 the payment with its new refund; 400 invalid_input with details.fields.amountMinor (more than is left);
// 409 when nothing is left or Stripe refused (its reason in the message); 502 payment_failed when Stripe was unreachable.
export const refundPayment = ({ paymentId, body }: { paymentId: string; body: RefundBody }) =>
  apiRequest(`/payments/${encodeURIComponent(paymentId)}/refunds`, PaymentSchema, { method: "POST", body });

/** Sends money back through Stripe; the quotes, the job's payments and the dashboard are read again. */
export function useRefundPayment() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: refundPayment,
    onSuccess: () => {
      // The quote's status and history change with its payments: its page and its job's list are read again.
      void queryClient.invalidateQueries({ queryKey: quotesKey });
      void queryClient.invalidateQueries({ queryKey: paymentsKey });
      void queryClient.invalidateQueries({ queryKey: dashboardKey });
    },
  });
}
