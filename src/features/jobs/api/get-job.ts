import { queryOptions, useQuery } from "@tanstack/react-query";
import { JobDetailSchema } from "../../../../shared/schemas/jobs";
import { apiRequest } from "../../../lib/api-client";

// 404 not_found for an unknown id (or another company's).
export const getJob = (jobId: string, signal?: AbortSignal) => apiRequest(`/jobs/${encodeURIComponent(jobId)}`, JobDetailSchema, { signal });

/** The prefix of every job page's key. */
export const jobDetailsKey = ["jobs", "detail"] as const;

export const jobQueryOptions = (jobId: string) =>
  queryOptions({ queryKey: [...jobDetailsKey, jobId], queryFn: ({ signal }) => getJob(jobId, signal) });

export const useJob = (jobId: string) => useQuery(jobQueryOptions(jobId));
