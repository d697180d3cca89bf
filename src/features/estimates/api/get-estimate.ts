import { queryOptions, useQuery } from "@tanstack/react-query";
import { EstimateSchema } from "../../../../shared/schemas/estimates";
import { apiRequest } from "../../../lib/api-client";

// 404 not_found until the estimate is first built from the layout.
export const getEstimate = (jobId: string, signal?: AbortSignal) => apiRequest(`/jobs/${encodeURIComponent(jobId)}/estimate`, EstimateSchema, { signal });

export const estimateQueryOptions = (jobId: string) =>
  queryOptions({ queryKey: ["estimates", jobId], queryFn: ({ signal }) => getEstimate(jobId, signal) });

export const useEstimate = (jobId: string) => useQuery(estimateQueryOptions(jobId));
