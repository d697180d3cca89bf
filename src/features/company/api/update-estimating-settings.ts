import { useMutation, useQueryClient } from "@tanstack/react-query";
import { EstimatingSettingsSchema, type UpdateEstimatingSettingsInput } from "../../../../shared/schemas/estimates";
import { apiRequest } from "../../../lib/api-client";
import { estimatingSettingsQueryOptions } from "./get-estimating-settings";

// Owner only (company:write). Any subset of the settings; the answer is the whole record.
export const updateEstimatingSettings = (patch: UpdateEstimatingSettingsInput) =>
  apiRequest("/company/estimating", EstimatingSettingsSchema, { method: "PATCH", body: patch });

export function useUpdateEstimatingSettings() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateEstimatingSettings,
    onSuccess: (settings) => queryClient.setQueryData(estimatingSettingsQueryOptions().queryKey, settings),
  });
}
