import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import { LimitProfileSchema, type UpdateLimitProfileInput } from "../../../../shared/schemas/jobs";
import { apiRequest } from "../../../lib/api-client";
import { limitProfileListsKey } from "./get-limit-profiles";

// Owner only. 409 conflict for a built-in profile ("duplicate it to change it").
export const updateLimitProfile = ({ profileId, patch }: { profileId: string; patch: z.input<typeof UpdateLimitProfileInput> }) =>
  apiRequest(`/limit-profiles/${encodeURIComponent(profileId)}`, LimitProfileSchema, { method: "PATCH", body: patch });

export function useUpdateLimitProfile() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateLimitProfile,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: limitProfileListsKey }),
  });
}
