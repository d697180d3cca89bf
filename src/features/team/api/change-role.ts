import { useMutation, useQueryClient } from "@tanstack/react-query";
import { MemberSchema, type Role } from "../../../../shared/schemas/team";
import { apiRequest } from "../../../lib/api-client";
import { membersQueryOptions } from "./get-members";

// 409 "conflict" when the change would leave the company without an Owner.
export const changeRole = ({ userId, role }: { userId: string; role: Role }) =>
  apiRequest(`/members/${encodeURIComponent(userId)}`, MemberSchema, { method: "PATCH", body: { role } });

export function useChangeRole() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: changeRole,
    onSuccess: (member) => {
      queryClient.setQueryData(membersQueryOptions().queryKey, (list) =>
        list ? { members: list.members.map((m) => (m.userId === member.userId ? member : m)) } : list,
      );
    },
  });
}
