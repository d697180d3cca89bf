import { useMutation, useQueryClient } from "@tanstack/react-query";
import { ClientSchema, type UpdateClientInput } from "../../../../shared/schemas/jobs";
import { apiRequest } from "../../../lib/api-client";
import { jobDetailsKey } from "../../jobs/api/get-job";
import { jobListsKey } from "../../jobs/api/get-jobs";
import { clientListsKey } from "./get-clients";

export const updateClient = ({ clientId, patch }: { clientId: string; patch: UpdateClientInput }) =>
  apiRequest(`/clients/${encodeURIComponent(clientId)}`, ClientSchema, { method: "PATCH", body: patch });

export function useUpdateClient() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateClient,
    onSuccess: () => {
      // Job lists and pages show the client's name.
      void queryClient.invalidateQueries({ queryKey: jobDetailsKey });
      void queryClient.invalidateQueries({ queryKey: jobListsKey });
      return queryClient.invalidateQueries({ queryKey: clientListsKey });
    },
  });
}
