import { useMutation, useQueryClient } from "@tanstack/react-query";
import { apiRequest, NoContent } from "../../../lib/api-client";
import { clientListsKey } from "./get-clients";

// 204; 409 conflict while the client still has jobs.
export const deleteClient = (clientId: string) => apiRequest(`/clients/${encodeURIComponent(clientId)}`, NoContent, { method: "DELETE" });

export function useDeleteClient() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteClient,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: clientListsKey }),
  });
}
