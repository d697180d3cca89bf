import { useMutation, useQueryClient } from "@tanstack/react-query";
import { apiRequest, NoContent } from "../../../lib/api-client";
import { limitProfileListsKey } from "./get-limit-profiles";

// Owner only. 204; 409 conflict for a built-in profile or one that systems still use.
export const deleteLimitProfile = (profileId: string) => apiRequest(`/limit-profiles/${encodeURIComponent(profileId)}`, NoContent, { method: "DELETE" });

export function useDeleteLimitProfile() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteLimitProfile,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: limitProfileListsKey }),
  });
}
