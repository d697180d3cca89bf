import { useMutation, useQueryClient } from "@tanstack/react-query";
import { InvitationSchema, type InviteInput } from "../../../../shared/schemas/team";
import { apiRequest } from "../../../lib/api-client";
import { invitationsQueryOptions } from "./get-invitations";

// 201; 409 with details.field "email" when the person is already a member; 503 when the e-mail could not be sent.
export const createInvitation = (input: InviteInput) => apiRequest("/invitations", InvitationSchema, { method: "POST", body: input });

export function useCreateInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createInvitation,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: invitationsQueryOptions().queryKey }),
  });
}
