import { useMutation, useQueryClient } from "@tanstack/react-query";
import { PriceItemSchema, type PriceItemValues } from "../../../../shared/schemas/estimates";
import { apiRequest } from "../../../lib/api-client";
import { priceListQueryOptions } from "./get-price-list";

// 201 PriceItem; 400 invalid_input with details.fields (prices:write).
export const createPriceItem = (input: PriceItemValues) => apiRequest("/price-list", PriceItemSchema, { method: "POST", body: input });

export function useCreatePriceItem() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createPriceItem,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: priceListQueryOptions().queryKey }),
  });
}
