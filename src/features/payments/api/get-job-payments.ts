import { queryOptions, useQuery } from "@tanstack/react-query";
import { PaymentListSchema } from "../../../../shared/schemas/payments";
import { apiRequest } from "../../../lib/api-client";

// Every payment of the job's quotes (deposits, and money flagged for a check), with their refunds.
export const getJobPayments = (jobId: string, signal?: AbortSignal) => apiRequest(`/jobs/${encodeURIComponent(jobId)}/payments`, PaymentListSchema, { signal });

/** The prefix of every payment list's key. */
export const paymentsKey = ["payments"] as const;

export const jobPaymentsQueryOptions = (jobId: string) =>
  // staleTime 0: deposits arrive from the client's browser (through the webhook); fetch again each time the job opens.
  queryOptions({ queryKey: [...paymentsKey, "job", jobId], queryFn: ({ signal }) => getJobPayments(jobId, signal), staleTime: 0 });

export const useJobPayments = (jobId: string) => useQuery(jobPaymentsQueryOptions(jobId));
