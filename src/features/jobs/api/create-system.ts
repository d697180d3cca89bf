import { useMutation, useQueryClient } from "@tanstack/react-query";
import { SystemRecordSchema, type CreateSystemInput } from "../../../../shared/schemas/jobs";
import { apiRequest } from "../../../lib/api-client";
import { jobQueryOptions } from "./get-job";
import { jobListsKey } from "./get-jobs";

// 201 SystemRecord. Without a document the server starts one: a bus bar and a battery at the nominal voltage.
export const createSystem = ({ jobId, input }: { jobId: string; input: CreateSystemInput }) =>
  apiRequest(`/jobs/${encodeURIComponent(jobId)}/systems`, SystemRecordSchema, { method: "POST", body: input });

export function useCreateSystem() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createSystem,
    onSuccess: (system) => {
      void queryClient.invalidateQueries({ queryKey: jobListsKey });
      void queryClient.invalidateQueries({ queryKey: jobQueryOptions(system.jobId).queryKey });
    },
  });
}
