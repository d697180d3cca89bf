import { useMutation, useQueryClient } from "@tanstack/react-query";
import { LimitProfileSchema, type CreateLimitProfileInput } from "../../../../shared/schemas/jobs";
import { apiRequest } from "../../../lib/api-client";
import { limitProfileListsKey } from "./get-limit-profiles";

// Owner only. 201; 400 invalid_input with details.fields.
export const createLimitProfile = (input: CreateLimitProfileInput) => apiRequest("/limit-profiles", LimitProfileSchema, { method: "POST", body: input });

export function useCreateLimitProfile() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createLimitProfile,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: limitProfileListsKey }),
  });
}
