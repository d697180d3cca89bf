import { useQueryClient } from "@tanstack/react-query";
import { useLocation, useNavigate } from "react-router-dom";
import type { Session } from "../../../../shared/schemas/auth";
import { storeSession } from "../api/get-session";
import { nextPath } from "../utils/next-path";

/**
 * After a sign-in, sign-up, password reset or accepted invitation: keep the session and go
 * to `to`, or by default where the user was heading (the `next` query parameter) or the dashboard.
 */
export function useCompleteSignIn(to?: string): (session: Session) => void {
  const queryClient = useQueryClient();
  const navigate = useNavigate();
  const { search } = useLocation();
  return (session) => {
    storeSession(queryClient, session);
    navigate(to ?? nextPath(search), { replace: true });
  };
}
