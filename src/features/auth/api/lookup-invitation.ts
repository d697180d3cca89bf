import { queryOptions, useQuery } from "@tanstack/react-query";
import { InvitationPreviewSchema } from "../../../../shared/schemas/team";
import { apiRequest } from "../../../lib/api-client";

// A POST so the token travels in the body, never in a URL the server logs. 404 / 410 carry a message.
export const lookupInvitation = (token: string) => apiRequest("/invitations/lookup", InvitationPreviewSchema, { method: "POST", body: { token } });

export const invitationPreviewQueryOptions = (token: string) =>
  queryOptions({ queryKey: ["invitation-preview", token], queryFn: () => lookupInvitation(token), staleTime: Infinity, gcTime: 0 });

export const useInvitationPreview = (token: string | null) => useQuery({ ...invitationPreviewQueryOptions(token ?? ""), enabled: token !== null });
