import { queryOptions, useQuery } from "@tanstack/react-query";
import { InvitationListSchema } from "../../../../shared/schemas/team";
import { apiRequest } from "../../../lib/api-client";

// Owners only: pending invitations (not accepted, withdrawn or expired), newest first.
export const getInvitations = () => apiRequest("/invitations", InvitationListSchema);

export const invitationsQueryOptions = () => queryOptions({ queryKey: ["invitations"], queryFn: getInvitations });

export const useInvitations = () => useQuery(invitationsQueryOptions());
