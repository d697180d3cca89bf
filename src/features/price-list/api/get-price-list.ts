import { queryOptions, useQuery } from "@tanstack/react-query";
import { PriceItemList } from "../../../../shared/schemas/estimates";
import { apiRequest } from "../../../lib/api-client";

/** The whole list (at most EstimateLimits.priceItemsMax items) with the company's currency; search and sort happen on screen. */
export const getPriceList = (signal?: AbortSignal) => apiRequest("/price-list", PriceItemList, { signal });

export const priceListQueryOptions = () => queryOptions({ queryKey: ["price-list"], queryFn: ({ signal }) => getPriceList(signal) });

export const usePriceList = () => useQuery(priceListQueryOptions());
