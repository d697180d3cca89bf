import { queryOptions, useQuery } from "@tanstack/react-query";
import { MemberListSchema } from "../../../../shared/schemas/team";
import { apiRequest } from "../../../lib/api-client";

export const getMembers = () => apiRequest("/members", MemberListSchema);

export const membersQueryOptions = () => queryOptions({ queryKey: ["members"], queryFn: getMembers });

export const useMembers = () => useQuery(membersQueryOptions());
