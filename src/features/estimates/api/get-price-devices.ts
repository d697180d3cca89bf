import { queryOptions, useQuery } from "@tanstack/react-query";
import { PriceItemList, type PriceItem } from "../../../../shared/schemas/estimates";
import { apiRequest } from "../../../lib/api-client";

export const getPriceList = (signal?: AbortSignal) => apiRequest("/price-list", PriceItemList, { signal });

/** The devices a supplied load can be priced from: price-list items of category device or other. */
export const selectDevices = (list: { items: PriceItem[] }) =>
  list.items.filter((item) => item.category === "device" || item.category === "other").sort((a, b) => a.description.localeCompare(b.description));

// Under the "price-list" prefix, so whatever refreshes the price list refreshes this too.
export const priceDevicesQueryOptions = () =>
  queryOptions({ queryKey: ["price-list", "devices"], queryFn: ({ signal }) => getPriceList(signal), select: selectDevices });

export const usePriceDevices = (enabled = true) => useQuery({ ...priceDevicesQueryOptions(), enabled });
