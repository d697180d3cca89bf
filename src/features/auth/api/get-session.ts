import { queryOptions, useQuery, type QueryClient } from "@tanstack/react-query";
import { SessionSchema, type Session } from "../../../../shared/schemas/auth";
import { apiRequest } from "../../../lib/api-client";

// Signed out is an answer ({ signedIn: false }), never a 401.
export const getSession = () => apiRequest("/auth/session", SessionSchema);

export const sessionQueryOptions = () => queryOptions({ queryKey: ["session"], queryFn: getSession, staleTime: 5 * 60_000 });

export const useSession = () => useQuery(sessionQueryOptions());

/**
 * Keeps the session the server just answered with (sign-in, sign-up, reset, accept, switch),
 * and drops cached data no screen is showing, which may belong to the previous account.
 */
export function storeSession(queryClient: QueryClient, session: Session): void {
  queryClient.removeQueries({ type: "inactive" });
  queryClient.setQueryData(sessionQueryOptions().queryKey, session);
}
