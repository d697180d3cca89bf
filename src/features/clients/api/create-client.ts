import { useMutation, useQueryClient } from "@tanstack/react-query";
import { ClientSchema, type CreateClientInput } from "../../../../shared/schemas/jobs";
import { apiRequest } from "../../../lib/api-client";
import { clientListsKey } from "./get-clients";

// 201 Client; 400 invalid_input with details.fields.
export const createClient = (input: CreateClientInput) => apiRequest("/clients", ClientSchema, { method: "POST", body: input });

export function useCreateClient() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createClient,
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: clientListsKey }),
  });
}
