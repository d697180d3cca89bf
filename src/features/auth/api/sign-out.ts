import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useNavigate } from "react-router-dom";
import { paths } from "../../../config/paths";
import { apiRequest, NoContent } from "../../../lib/api-client";
import { sessionQueryOptions } from "./get-session";

export const signOut = () => apiRequest("/auth/sign-out", NoContent, { method: "POST" });

/** Signs out, forgets every cached answer (they belong to the account), and goes to the sign-in page. */
export function useSignOut() {
  const queryClient = useQueryClient();
  const navigate = useNavigate();
  return useMutation({
    mutationFn: signOut,
    onSuccess: () => {
      queryClient.clear();
      // The server has just said so: no need to ask again on the sign-in page.
      queryClient.setQueryData(sessionQueryOptions().queryKey, { signedIn: false });
      navigate(paths.signIn.getHref(), { replace: true });
    },
  });
}
