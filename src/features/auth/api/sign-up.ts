import { useMutation } from "@tanstack/react-query";
import { SessionSchema, type SignUpInput } from "../../../../shared/schemas/auth";
import { apiRequest } from "../../../lib/api-client";

// 201 with the new session; 409 with details.field "email" when the e-mail already has an account.
export const signUp = (input: SignUpInput) => apiRequest("/auth/sign-up", SessionSchema, { method: "POST", body: input });

export const useSignUp = () => useMutation({ mutationFn: signUp });
