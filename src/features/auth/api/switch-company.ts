import { useMutation, useQueryClient } from "@tanstack/react-query";
import { SessionSchema } from "../../../../shared/schemas/auth";
import { apiRequest } from "../../../lib/api-client";
import { sessionQueryOptions } from "./get-session";

export const switchCompany = (companyId: string) => apiRequest("/auth/switch-company", SessionSchema, { method: "POST", body: { companyId } });

/**
 * Works in another of the user's companies. Every other cached answer belonged to the
 * previous company, so it is reset (not just marked stale): no screen shows the old
 * company's data while the new one loads.
 */
export function useSwitchCompany() {
  const queryClient = useQueryClient();
  const sessionKey = sessionQueryOptions().queryKey;
  return useMutation({
    mutationFn: switchCompany,
    onSuccess: async (session) => {
      queryClient.setQueryData(sessionKey, session);
      await queryClient.resetQueries({ predicate: (query) => query.queryKey[0] !== sessionKey[0] });
    },
  });
}
