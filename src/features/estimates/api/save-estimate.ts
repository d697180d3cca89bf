import { useMutation, useQueryClient } from "@tanstack/react-query";
import { EstimateSchema, type SaveEstimateInput } from "../../../../shared/schemas/estimates";
import { apiRequest } from "../../../lib/api-client";
import { estimateQueryOptions } from "./get-estimate";

// 409 conflict when `version` is not the stored one (someone saved in between).
export const saveEstimate = ({ jobId, body }: { jobId: string; body: SaveEstimateInput }) =>
  apiRequest(`/jobs/${encodeURIComponent(jobId)}/estimate`, EstimateSchema, { method: "PUT", body });

export function useSaveEstimate() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: saveEstimate,
    onSuccess: (estimate, { jobId }) => queryClient.setQueryData(estimateQueryOptions(jobId).queryKey, estimate),
  });
}
