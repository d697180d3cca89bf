import { useMutation, useQueryClient } from "@tanstack/react-query";
import { apiRequest, NoContent } from "../../../lib/api-client";
import { jobQueryOptions } from "../../jobs/api/get-job";

export const deleteAttachment = (attachmentId: string) => apiRequest(`/attachments/${encodeURIComponent(attachmentId)}`, NoContent, { method: "DELETE" });

export function useDeleteAttachment(jobId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteAttachment,
    onSuccess: (_nothing, attachmentId) => {
      // Gone from the page at once; the refetch confirms it.
      queryClient.setQueryData(jobQueryOptions(jobId).queryKey, (job) => (job ? { ...job, attachments: job.attachments.filter((a) => a.id !== attachmentId) } : job));
      return queryClient.invalidateQueries({ queryKey: jobQueryOptions(jobId).queryKey });
    },
  });
}
