import { queryOptions, useQuery } from "@tanstack/react-query";
import { z } from "zod";
import { EstimateSchema, type Estimate } from "../../../../shared/schemas/estimates";
import { apiRequest, NoContent } from "../../../lib/api-client";

// 204 (null here) until the estimate is first built from the layout; 404 only for an unknown job.
export const getEstimate = async (jobId: string, signal?: AbortSignal): Promise<Estimate | null> =>
  (await apiRequest(`/jobs/${encodeURIComponent(jobId)}/estimate`, z.union([EstimateSchema, NoContent]), { signal })) ?? null;

export const estimateQueryOptions = (jobId: string) =>
  queryOptions({ queryKey: ["estimates", jobId], queryFn: ({ signal }) => getEstimate(jobId, signal) });

export const useEstimate = (jobId: string) => useQuery(estimateQueryOptions(jobId));
