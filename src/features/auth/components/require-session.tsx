import { useQueryClient } from "@tanstack/react-query";
import { useEffect } from "react";
import { Navigate, Outlet, useLocation } from "react-router-dom";
import { paths } from "../../../config/paths";
import { ApiError } from "../../../lib/api-client";
import { sessionQueryOptions, useSession } from "../api/get-session";
import { SessionContext } from "../hooks/session-context";

const isUnauthenticated = (error: unknown) => error instanceof ApiError && error.status === 401;

/**
 * When any other call answers 401 the session has ended on the server (expired, signed out
 * in another tab): ask for the session again, which sends the user to the sign-in page.
 */
function useRecheckSessionOn401() {
  const queryClient = useQueryClient();
  useEffect(() => {
    const sessionKey = sessionQueryOptions().queryKey;
    const recheck = () => void queryClient.invalidateQueries({ queryKey: sessionKey });
    const stopQueries = queryClient.getQueryCache().subscribe((event) => {
      if (event.type === "updated" && event.action.type === "error" && event.query.queryKey[0] !== sessionKey[0] && isUnauthenticated(event.action.error)) recheck();
    });
    const stopMutations = queryClient.getMutationCache().subscribe((event) => {
      if (event.type === "updated" && event.action.type === "error" && isUnauthenticated(event.action.error)) recheck();
    });
    return () => {
      stopQueries();
      stopMutations();
    };
  }, [queryClient]);
}

/** Layout route: its screens need a signed-in user; anyone else goes to the sign-in page and comes back after. */
export function RequireSession() {
  const { data, error, refetch, isFetching } = useSession();
  const { pathname, search } = useLocation();
  useRecheckSessionOn401();

  if (data?.signedIn) {
    return (
      <SessionContext value={data}>
        <Outlet />
      </SessionContext>
    );
  }
  if (data) return <Navigate to={paths.signIn.getHref(pathname + search)} replace />;
  if (error) {
    return (
      <div role="alert" className="mx-auto mt-24 max-w-md rounded-lg border border-over-100 bg-white p-6 text-center">
        <h1 className="text-lg font-semibold text-ink-900">Your sign-in could not be checked</h1>
        <p className="mt-2 text-sm text-ink-600">{error.message}</p>
        <button
          type="button"
          disabled={isFetching}
          className="mt-4 rounded-md bg-ink-900 px-4 py-2 text-sm font-medium text-white disabled:bg-ink-400"
          onClick={() => void refetch()}
        >
          {isFetching ? "Trying again…" : "Try again"}
        </button>
      </div>
    );
  }
  return <p className="p-8 text-sm text-ink-500">Loading…</p>;
}
