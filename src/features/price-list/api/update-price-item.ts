import { useMutation, useQueryClient } from "@tanstack/react-query";
import { PriceItemSchema, type PriceItemValues } from "../../../../shared/schemas/estimates";
import { apiRequest } from "../../../lib/api-client";
import { priceListQueryOptions } from "./get-price-list";

// Any subset of the item's fields; the answer is the whole item (prices:write).
export const updatePriceItem = ({ itemId, patch }: { itemId: string; patch: Partial<PriceItemValues> }) =>
  apiRequest(`/price-list/${encodeURIComponent(itemId)}`, PriceItemSchema, { method: "PATCH", body: patch });

export function useUpdatePriceItem() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updatePriceItem,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: priceListQueryOptions().queryKey }),
  });
}
