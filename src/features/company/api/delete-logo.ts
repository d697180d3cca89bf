import { useMutation, useQueryClient } from "@tanstack/react-query";
import { apiRequest, NoContent } from "../../../lib/api-client";
import { estimatingSettingsQueryOptions } from "./get-estimating-settings";

// 204 (Owner only). Quotes already made keep the logo they were made with.
export const deleteLogo = () => apiRequest("/company/logo", NoContent, { method: "DELETE" });

export function useDeleteLogo() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteLogo,
    onSuccess: () =>
      queryClient.setQueryData(estimatingSettingsQueryOptions().queryKey, (settings) => (settings ? { ...settings, hasLogo: false } : settings)),
  });
}
