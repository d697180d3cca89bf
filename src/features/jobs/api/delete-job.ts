import { useMutation, useQueryClient } from "@tanstack/react-query";
import { apiRequest, NoContent } from "../../../lib/api-client";
import { clientListsKey } from "../../clients/api/get-clients";
import { jobQueryOptions } from "./get-job";
import { jobListsKey } from "./get-jobs";

// 204; the job's systems and attachments go with it.
export const deleteJob = (jobId: string) => apiRequest(`/jobs/${encodeURIComponent(jobId)}`, NoContent, { method: "DELETE" });

export function useDeleteJob() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteJob,
    onSuccess: (_nothing, jobId) => {
      queryClient.removeQueries({ queryKey: jobQueryOptions(jobId).queryKey });
      void queryClient.invalidateQueries({ queryKey: clientListsKey });
      void queryClient.invalidateQueries({ queryKey: jobListsKey });
    },
  });
}
