import { Navigate, Outlet, useLocation } from "react-router-dom";
import { useSession } from "../api/get-session";
import { nextPath } from "../utils/next-path";

/** Layout route for sign-in and sign-up: someone already signed in goes on to the app. */
export function RedirectIfSignedIn() {
  const { data, isPending } = useSession();
  const { search } = useLocation();
  if (isPending) return <p className="text-sm text-ink-500">Loading…</p>;
  if (data?.signedIn) return <Navigate to={nextPath(search)} replace />;
  // Signed out, or the check failed: the form itself will report an unreachable server.
  return <Outlet />;
}
