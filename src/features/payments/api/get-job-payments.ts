import { queryOptions, useQuery } from "@tanstack/react-query";
import { PaymentListSchema } from "../../../../shared/schemas/payments";
import { apiRequest } from "../../../lib/api-client";

// Every payment of the job's quotes (deposits, and money flagged for a check), with their refunds.
export const getJobPayments = (jobId: string, signal?: AbortSignal) => apiRequest(`/jobs/${encodeURIComponent(jobId)}/payments`, PaymentListSchema, { signal });

/** The prefix of every payment list's key. */
export const paymentsKey = ["payments"] as const;

export const jobPaymentsQueryOptions = (jobId: string) =>
  queryOptions({ queryKey: [...paymentsKey, "job", jobId], queryFn: ({ signal }) => getJobPayments(jobId, signal) });

export const useJobPayments = (jobId: string) => useQuery(jobPaymentsQueryOptions(jobId));
