import { useMutation, useQueryClient } from "@tanstack/react-query";
import { JobDetailSchema, type UpdateJobInput } from "../../../../shared/schemas/jobs";
import { apiRequest } from "../../../lib/api-client";
import { clientListsKey } from "../../clients/api/get-clients";
import { jobQueryOptions } from "./get-job";
import { jobListsKey } from "./get-jobs";

export const updateJob = ({ jobId, patch }: { jobId: string; patch: UpdateJobInput }) =>
  apiRequest(`/jobs/${encodeURIComponent(jobId)}`, JobDetailSchema, { method: "PATCH", body: patch });

export function useUpdateJob() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateJob,
    onSuccess: (job, { patch }) => {
      queryClient.setQueryData(jobQueryOptions(job.id).queryKey, job);
      if (patch.clientId !== undefined) void queryClient.invalidateQueries({ queryKey: clientListsKey });
      return queryClient.invalidateQueries({ queryKey: jobListsKey });
    },
  });
}
