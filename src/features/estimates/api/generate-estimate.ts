import { useMutation, useQueryClient } from "@tanstack/react-query";
import { EstimateSchema } from "../../../../shared/schemas/estimates";
import { apiRequest } from "../../../lib/api-client";
import { estimateQueryOptions } from "./get-estimate";

// Builds the estimate from the job's saved systems, or rebuilds its generated lines keeping manual
// lines, overrides and supplied loads; `lastChanges` says what the rebuild changed.
export const generateEstimate = (jobId: string) =>
  apiRequest(`/jobs/${encodeURIComponent(jobId)}/estimate/generate`, EstimateSchema, { method: "POST" });

export function useGenerateEstimate() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: generateEstimate,
    onSuccess: (estimate, jobId) => queryClient.setQueryData(estimateQueryOptions(jobId).queryKey, estimate),
  });
}
