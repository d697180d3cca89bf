import { useMutation } from "@tanstack/react-query";
import { SessionSchema, type ResetPasswordInput } from "../../../../shared/schemas/auth";
import { apiRequest } from "../../../lib/api-client";

// 200 with the session (signed in); 404 / 410 for an unknown, used or expired link.
export const resetPassword = (input: ResetPasswordInput) => apiRequest("/auth/reset-password", SessionSchema, { method: "POST", body: input });

export const useResetPassword = () => useMutation({ mutationFn: resetPassword });
