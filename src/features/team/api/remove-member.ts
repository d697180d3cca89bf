import { useMutation, useQueryClient } from "@tanstack/react-query";
import { apiRequest, NoContent } from "../../../lib/api-client";
import { membersQueryOptions } from "./get-members";

// 409 "conflict" when it would remove the company's last Owner.
export const removeMember = (userId: string) => apiRequest(`/members/${encodeURIComponent(userId)}`, NoContent, { method: "DELETE" });

export function useRemoveMember() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: removeMember,
    onSuccess: (_nothing, userId) => {
      queryClient.setQueryData(membersQueryOptions().queryKey, (list) => (list ? { members: list.members.filter((m) => m.userId !== userId) } : list));
      return queryClient.invalidateQueries({ queryKey: membersQueryOptions().queryKey });
    },
  });
}
