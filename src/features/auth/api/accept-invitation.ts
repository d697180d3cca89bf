import { useMutation } from "@tanstack/react-query";
import { SessionSchema, type AcceptInvitationInput } from "../../../../shared/schemas/auth";
import { apiRequest } from "../../../lib/api-client";

// 201 with the session: signed in, working in the company that invited.
export const acceptInvitation = (input: AcceptInvitationInput) => apiRequest("/invitations/accept", SessionSchema, { method: "POST", body: input });

export const useAcceptInvitation = () => useMutation({ mutationFn: acceptInvitation });
