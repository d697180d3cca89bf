import { useMutation } from "@tanstack/react-query";
import { MessageSchema, type ForgotPasswordInput } from "../../../../shared/schemas/auth";
import { apiRequest } from "../../../lib/api-client";

// 202 with the same message whether or not the e-mail has an account.
export const requestPasswordReset = (input: ForgotPasswordInput) =>
  apiRequest("/auth/forgot-password", MessageSchema, { method: "POST", body: input });

export const useRequestPasswordReset = () => useMutation({ mutationFn: requestPasswordReset });
