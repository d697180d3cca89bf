import { useMutation, useQueryClient } from "@tanstack/react-query";
import { apiRequest, NoContent } from "../../../lib/api-client";
import { invitationsQueryOptions } from "./get-invitations";

export const withdrawInvitation = (id: string) => apiRequest(`/invitations/${encodeURIComponent(id)}`, NoContent, { method: "DELETE" });

export function useWithdrawInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: withdrawInvitation,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: invitationsQueryOptions().queryKey }),
  });
}
