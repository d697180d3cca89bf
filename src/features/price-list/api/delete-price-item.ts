import { useMutation, useQueryClient } from "@tanstack/react-query";
import { apiRequest, NoContent } from "../../../lib/api-client";
import { priceListQueryOptions } from "./get-price-list";

// 204 (prices:write). Estimates keep the lines already priced from the item.
export const deletePriceItem = (itemId: string) => apiRequest(`/price-list/${encodeURIComponent(itemId)}`, NoContent, { method: "DELETE" });

export function useDeletePriceItem() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deletePriceItem,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: priceListQueryOptions().queryKey }),
  });
}
