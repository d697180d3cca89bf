import { useMutation } from "@tanstack/react-query";
import { SessionSchema, type SignInInput } from "../../../../shared/schemas/auth";
import { apiRequest } from "../../../lib/api-client";

// 401 "unauthenticated" for a wrong e-mail or password, 429 "rate_limited" after too many tries.
export const signIn = (input: SignInInput) => apiRequest("/auth/sign-in", SessionSchema, { method: "POST", body: input });

export const useSignIn = () => useMutation({ mutationFn: signIn });
