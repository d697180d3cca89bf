import { useMutation, useQueryClient } from "@tanstack/react-query";
import { JobDetailSchema, type CreateJobInput } from "../../../../shared/schemas/jobs";
import { apiRequest } from "../../../lib/api-client";
import { clientListsKey } from "../../clients/api/get-clients";
import { jobQueryOptions } from "./get-job";
import { jobListsKey } from "./get-jobs";

// 201 JobDetail; 400 invalid_input with details.fields; 404 when the client is unknown.
export const createJob = (input: CreateJobInput) => apiRequest("/jobs", JobDetailSchema, { method: "POST", body: input });

export function useCreateJob() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createJob,
    onSuccess: (job) => {
      queryClient.setQueryData(jobQueryOptions(job.id).queryKey, job);
      // The client's job count changes too.
      void queryClient.invalidateQueries({ queryKey: clientListsKey });
      void queryClient.invalidateQueries({ queryKey: jobListsKey });
    },
  });
}
